package jobs

import (
	"encoding/json"
	"io"
	"net/http"
	"testing"
	"time"

	"github.com/jonboulle/clockwork"
)

func TestStatusEndpoint(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	cfg.Status.Listen = "127.0.0.1:0"
	db := openDB(t, cfg.Database)
	enqueueTestMessage(t, db, "GROWTH", []byte("%PDF-1.7 status"), "committee@example.com")
	ny := mustZone(t, "America/New_York")
	// Before the message is due (it was enqueued for 2026-03-06 19:00 UTC).
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 5, 9, 0, 0, 0, ny))
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock})
	runDaemon(t, d)
	base := "http://" + d.StatusAddr()

	resp, err := http.Get(base + "/healthz")
	if err != nil {
		t.Fatal(err)
	}
	body, _ := io.ReadAll(resp.Body)
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK || string(body) != "ok\n" {
		t.Fatalf("/healthz = %d %q", resp.StatusCode, body)
	}

	// The outbox job runs at start; wait until it is recorded.
	var st Status
	waitFor(t, "the outbox job's first record", func() bool {
		resp, err := http.Get(base + "/status")
		if err != nil {
			t.Fatal(err)
		}
		defer resp.Body.Close()
		if resp.Header.Get("Content-Type") != "application/json" {
			t.Fatalf("content type %q", resp.Header.Get("Content-Type"))
		}
		st = Status{}
		if err := json.NewDecoder(resp.Body).Decode(&st); err != nil {
			t.Fatal(err)
		}
		return len(st.Jobs) == 3 && st.Jobs[2].Last != nil && st.Jobs[2].Last.Outcome != ""
	})
	names := []string{st.Jobs[0].Name, st.Jobs[1].Name, st.Jobs[2].Name}
	if names[0] != JobIngest || names[1] != JobPack || names[2] != JobOutbox {
		t.Fatalf("jobs %v", names)
	}
	if want := time.Date(2026, 3, 6, 19, 0, 0, 0, ny); !st.Jobs[1].NextRun.Equal(want) {
		t.Errorf("pack next run %v, want %v", st.Jobs[1].NextRun, want)
	}
	if want := time.Date(2026, 3, 5, 18, 30, 0, 0, ny); !st.Jobs[0].NextRun.Equal(want) {
		t.Errorf("ingest next run %v, want %v", st.Jobs[0].NextRun, want)
	}
	if st.Outbox.Pending != 1 || st.Outbox.Due != 0 {
		t.Errorf("outbox %+v, want 1 pending, 0 due", st.Outbox)
	}
	if len(st.Portfolios) != 1 || st.Portfolios[0].PortfolioID != "GROWTH" || st.Portfolios[0].AsOf != "2026-03-06" {
		t.Errorf("portfolios %+v", st.Portfolios)
	}
	if st.TimeZone != "America/New_York" || st.Holder != d.Holder() {
		t.Errorf("zone %q holder %q", st.TimeZone, st.Holder)
	}
}
