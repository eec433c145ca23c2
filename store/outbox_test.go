package store_test

import (
	"context"
	"errors"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"plumbline/store"
	"plumbline/store/storetest"
)

func openTestDB(t *testing.T) *store.DB {
	t.Helper()
	db, err := store.Open(context.Background(), filepath.Join(t.TempDir(), "p.db"))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

var t0 = time.Date(2026, 3, 6, 19, 0, 0, 0, time.UTC)

func testMessage(runID int64, pdf []byte) store.OutboxMessage {
	return store.OutboxMessage{
		RunID: runID, Recipients: []string{"committee@example.com"},
		Subject: "Risk pack GROWTH 2026-03-06", TextBody: "text", HTMLBody: "<p>html</p>",
		AttachmentName: "GROWTH-2026-03-06.pdf", AttachmentSHA256: storetest.SHA256(pdf),
		CreatedAt: t0,
	}
}

func TestEnqueueRefusesBadMessages(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	pdf := []byte("%PDF-1.7 test")
	run := storetest.InsertRun(t, db, "GROWTH", "2026-03-06", pdf)
	good := testMessage(run, pdf)
	for _, tc := range []struct {
		name string
		edit func(*store.OutboxMessage)
	}{
		{"no recipients", func(m *store.OutboxMessage) { m.Recipients = nil }},
		{"blank recipient", func(m *store.OutboxMessage) { m.Recipients = []string{" "} }},
		// A line break in a header value would let a value inject headers
		// (RFC 5322 section 2.2: header fields end at CRLF).
		{"header injection in subject", func(m *store.OutboxMessage) { m.Subject = "x\r\nBcc: a@example.com" }},
		{"empty subject", func(m *store.OutboxMessage) { m.Subject = "" }},
		{"name without checksum", func(m *store.OutboxMessage) { m.AttachmentSHA256 = "" }},
		{"short checksum", func(m *store.OutboxMessage) { m.AttachmentSHA256 = "abcd" }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := good
			tc.edit(&m)
			if _, err := db.Enqueue(ctx, m); !errors.Is(err, store.ErrBadOutboxMessage) {
				t.Fatalf("Enqueue = %v, want ErrBadOutboxMessage", err)
			}
		})
	}
	// The foreign key to runs(id) refuses a message for no run.
	m := good
	m.RunID = run + 100
	if _, err := db.Enqueue(ctx, m); err == nil {
		t.Fatal("Enqueue for a missing run succeeded")
	}
	if _, err := db.Enqueue(ctx, good); err != nil {
		t.Fatalf("Enqueue(good) = %v", err)
	}
}

func TestClaimLeaseAndRetry(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	pdf := []byte("%PDF-1.7 lease")
	run := storetest.InsertRun(t, db, "GROWTH", "2026-03-06", pdf)
	id, err := db.Enqueue(ctx, testMessage(run, pdf))
	if err != nil {
		t.Fatal(err)
	}
	lease := 10 * time.Minute

	a, err := db.ClaimOutbox(ctx, "A", t0, lease, "<first@example.com>")
	if err != nil || a == nil || a.ID != id {
		t.Fatalf("A's claim = %+v, %v", a, err)
	}
	if a.MessageID != "<first@example.com>" || a.Attempts != 1 || a.ClaimedBy != "A" {
		t.Fatalf("claimed row = id %q attempts %d by %q", a.MessageID, a.Attempts, a.ClaimedBy)
	}
	// While A's lease runs, nobody else gets the message.
	if b, err := db.ClaimOutbox(ctx, "B", t0.Add(lease-time.Second), lease, "<other@example.com>"); err != nil || b != nil {
		t.Fatalf("B's claim inside A's lease = %+v, %v; want none", b, err)
	}
	// After it expires (A died mid-send) B takes over, with the same
	// Message-ID so that receivers can drop a duplicate.
	b, err := db.ClaimOutbox(ctx, "B", t0.Add(lease+time.Second), lease, "<other@example.com>")
	if err != nil || b == nil {
		t.Fatalf("B's claim after the lease = %+v, %v", b, err)
	}
	if b.MessageID != a.MessageID || b.Attempts != 2 {
		t.Fatalf("retaken row: message id %q attempts %d, want %q and 2", b.MessageID, b.Attempts, a.MessageID)
	}
	// A can no longer record a failure for a row it lost.
	if err := db.MarkFailed(ctx, id, "A", t0.Add(time.Hour), "boom"); !errors.Is(err, store.ErrLeaseLost) {
		t.Fatalf("A's MarkFailed = %v, want ErrLeaseLost", err)
	}
	// B fails: the row is due again only at the time B sets.
	next := t0.Add(lease + 5*time.Minute)
	if err := db.MarkFailed(ctx, id, "B", next, "connection refused"); err != nil {
		t.Fatal(err)
	}
	if c, _ := db.ClaimOutbox(ctx, "C", next.Add(-time.Second), lease, "<c@example.com>"); c != nil {
		t.Fatalf("claimed before next_attempt_at")
	}
	c, err := db.ClaimOutbox(ctx, "C", next, lease, "<c@example.com>")
	if err != nil || c == nil || c.LastError != "connection refused" || c.Attempts != 3 {
		t.Fatalf("C's claim = %+v, %v", c, err)
	}
	if already, err := db.MarkSent(ctx, id, next.Add(time.Second), "250 2.0.0 queued as X1"); err != nil || already {
		t.Fatalf("MarkSent = %v, %v", already, err)
	}
	// A sent message is never claimed again, and marking it again says so.
	if d, _ := db.ClaimOutbox(ctx, "D", next.Add(24*time.Hour), lease, "<d@example.com>"); d != nil {
		t.Fatalf("sent message claimed again")
	}
	if already, err := db.MarkSent(ctx, id, next.Add(time.Minute), "again"); err != nil || !already {
		t.Fatalf("second MarkSent = %v, %v; want already", already, err)
	}
	it, err := db.OutboxItem(ctx, id)
	if err != nil {
		t.Fatal(err)
	}
	if it.SMTPReply != "250 2.0.0 queued as X1" || !it.SentAt.Equal(next.Add(time.Second)) || it.LastError != "" {
		t.Fatalf("sent row = reply %q sent %v error %q", it.SMTPReply, it.SentAt, it.LastError)
	}
}

// TestConcurrentClaimsAreExclusive has two connections pools on one file
// (two daemons) claim the same messages at once: each message is claimed
// exactly once while the leases run.
func TestConcurrentClaimsAreExclusive(t *testing.T) {
	db1 := openTestDB(t)
	db2, err := store.Open(context.Background(), db1.Path())
	if err != nil {
		t.Fatal(err)
	}
	defer db2.Close()
	ctx := context.Background()
	pdf := []byte("%PDF-1.7 many")
	run := storetest.InsertRun(t, db1, "GROWTH", "2026-03-06", pdf)
	const n = 40
	for range n {
		if _, err := db1.Enqueue(ctx, testMessage(run, pdf)); err != nil {
			t.Fatal(err)
		}
	}
	var mu sync.Mutex
	claims := map[int64]string{}
	var wg sync.WaitGroup
	for w, db := range []*store.DB{db1, db2, db1, db2} {
		holder := string(rune('A' + w))
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				it, err := db.ClaimOutbox(ctx, holder, t0, time.Hour, "<"+holder+time.Now().String()+"@example.com>")
				if err != nil {
					t.Error(err)
					return
				}
				if it == nil {
					return
				}
				mu.Lock()
				if prev, dup := claims[it.ID]; dup {
					t.Errorf("message %d claimed by %s and %s", it.ID, prev, holder)
				}
				claims[it.ID] = holder
				mu.Unlock()
			}
		}()
	}
	wg.Wait()
	if len(claims) != n {
		t.Fatalf("%d messages claimed, want %d", len(claims), n)
	}
}

func TestRunPDFChecksums(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	pdf := []byte("%PDF-1.7 original")
	run := storetest.InsertRun(t, db, "GROWTH", "2026-03-06", pdf)
	got, err := db.RunPDF(ctx, run, storetest.SHA256(pdf))
	if err != nil || string(got) != string(pdf) {
		t.Fatalf("RunPDF = %q, %v", got, err)
	}
	// sha256 of "abc" is FIPS 180-2 appendix B.1's first example.
	const abc = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
	if storetest.SHA256([]byte("abc")) != abc {
		t.Fatalf("SHA256 helper disagrees with FIPS 180-2 B.1")
	}
	if _, err := db.RunPDF(ctx, run, abc); !errors.Is(err, store.ErrPDFMismatch) {
		t.Fatalf("RunPDF with another expected sum = %v, want ErrPDFMismatch", err)
	}
}
