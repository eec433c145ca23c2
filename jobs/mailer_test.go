package jobs

import (
	"bytes"
	"context"
	"crypto/tls"
	"encoding/base64"
	"fmt"
	"io"
	"log/slog"
	"mime"
	"mime/multipart"
	"mime/quotedprintable"
	"net/mail"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/emersion/go-smtp"
	"github.com/jonboulle/clockwork"

	"plumbline/jobs/config"
	"plumbline/store"
	"plumbline/store/storetest"
)

// parsed is a received message taken apart with net/mail and
// mime/multipart (RFC 5322 message, RFC 2046 multipart bodies).
type parsed struct {
	header     mail.Header
	text, html string
	attachName string
	attachment []byte
}

func parseMessage(t *testing.T, raw []byte) parsed {
	t.Helper()
	m, err := mail.ReadMessage(bytes.NewReader(raw))
	if err != nil {
		t.Fatalf("net/mail: %v", err)
	}
	p := parsed{header: m.Header}
	var walk func(ctype string, body io.Reader, cte, disp string)
	walk = func(ctype string, body io.Reader, cte, disp string) {
		mt, params, err := mime.ParseMediaType(ctype)
		if err != nil {
			t.Fatalf("content type %q: %v", ctype, err)
		}
		if strings.HasPrefix(mt, "multipart/") {
			mr := multipart.NewReader(body, params["boundary"])
			for {
				part, err := mr.NextRawPart()
				if err == io.EOF {
					return
				}
				if err != nil {
					t.Fatal(err)
				}
				walk(part.Header.Get("Content-Type"), part, part.Header.Get("Content-Transfer-Encoding"), part.Header.Get("Content-Disposition"))
			}
		}
		var r io.Reader = body
		switch strings.ToLower(cte) {
		case "base64":
			r = base64.NewDecoder(base64.StdEncoding, body)
		case "quoted-printable":
			r = quotedprintable.NewReader(body)
		}
		b, err := io.ReadAll(r)
		if err != nil {
			t.Fatal(err)
		}
		switch {
		case strings.HasPrefix(disp, "attachment"):
			_, dp, _ := mime.ParseMediaType(disp)
			p.attachName, p.attachment = dp["filename"], b
		case mt == "text/plain":
			p.text = string(b)
		case mt == "text/html":
			p.html = string(b)
		}
	}
	walk(m.Header.Get("Content-Type"), m.Body, m.Header.Get("Content-Transfer-Encoding"), "")
	return p
}

func smtpConfig(t *testing.T, dir, addr string) *config.Config {
	cfg := testConfig(dir)
	host, port := splitPort(t, addr)
	cfg.Mail.Delivery, cfg.Mail.Host, cfg.Mail.Port = "smtp", host, port
	return cfg
}

func TestSMTPDelivery(t *testing.T) {
	dir := t.TempDir()
	srv := startSMTP(t, "127.0.0.1:0", nil, "")
	cfg := smtpConfig(t, dir, srv.addr)
	db := openDB(t, cfg.Database)
	pdf := []byte("%PDF-1.7\n% fictional pack for a test\n" + strings.Repeat("binary \x00\x01\xff ", 200))
	id := enqueueTestMessage(t, db, "GROWTH", pdf, "committee@example.com", "Chair <chair@example.org>")
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db})

	if outcome, err := d.RunOutbox(context.Background()); outcome != store.JobOK || err != nil {
		t.Fatalf("RunOutbox = %s, %v", outcome, err)
	}
	msgs := srv.messages()
	if len(msgs) != 1 {
		t.Fatalf("server received %d messages, want 1", len(msgs))
	}
	got := msgs[0]
	// Envelope (RFC 5321 MAIL FROM / RCPT TO).
	if got.from != "risk@example.com" || strings.Join(got.rcpt, ",") != "committee@example.com,chair@example.org" {
		t.Fatalf("envelope from %q to %q", got.from, got.rcpt)
	}
	p := parseMessage(t, got.data)
	to, err := p.header.AddressList("To")
	if err != nil || len(to) != 2 || to[0].Address != "committee@example.com" || to[1].Address != "chair@example.org" {
		t.Fatalf("To = %v, %v", to, err)
	}
	if s := p.header.Get("Subject"); s != "Weekly risk pack GROWTH 2026-03-06" {
		t.Fatalf("Subject = %q", s)
	}
	if !bytes.Equal(p.attachment, pdf) || p.attachName != "GROWTH-2026-03-06.pdf" {
		t.Fatalf("attachment %q: %d bytes, equal to the stored PDF: %v", p.attachName, len(p.attachment), bytes.Equal(p.attachment, pdf))
	}
	if !strings.Contains(p.text, "Plain text body for GROWTH") || !strings.Contains(p.html, "<p>HTML body for GROWTH</p>") {
		t.Fatalf("bodies: text %q html %q", p.text, p.html)
	}
	it, err := db.OutboxItem(context.Background(), id)
	if err != nil {
		t.Fatal(err)
	}
	if it.SentAt.IsZero() || it.Attempts != 1 || it.SMTPReply == "" {
		t.Fatalf("outbox row after delivery: %+v", it)
	}
	if mid := p.header.Get("Message-Id"); mid != it.MessageID || !strings.HasSuffix(mid, "@example.com>") {
		t.Fatalf("Message-ID header %q, outbox %q", mid, it.MessageID)
	}
	// Nothing left: the next run has nothing to do.
	if outcome, err := d.RunOutbox(context.Background()); outcome != store.JobSkipped || err != nil {
		t.Fatalf("second RunOutbox = %s, %v", outcome, err)
	}
}

// TestSMTPDownThenUp: the server is down at the first attempt; the message
// waits out its backoff, is sent once the server is up, and only once.
func TestSMTPDownThenUp(t *testing.T) {
	dir := t.TempDir()
	addr := freeAddr(t)
	cfg := smtpConfig(t, dir, addr)
	db := openDB(t, cfg.Database)
	pdf := []byte("%PDF-1.7 retry")
	id := enqueueTestMessage(t, db, "VALUE", pdf, "committee@example.com")
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 6, 19, 5, 0, 0, time.UTC))
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock})
	ctx := context.Background()

	if outcome, err := d.RunOutbox(ctx); outcome != store.JobError || err == nil {
		t.Fatalf("RunOutbox with the server down = %s, %v", outcome, err)
	}
	it, _ := db.OutboxItem(ctx, id)
	if it.Attempts != 1 || it.LastError == "" || !it.NextAttemptAt.Equal(clock.Now().Add(time.Minute)) {
		t.Fatalf("after a failure: attempts %d, error %q, next %v", it.Attempts, it.LastError, it.NextAttemptAt)
	}
	srv := startSMTP(t, addr, nil, "")
	// Not due yet: nothing is attempted.
	if outcome, _ := d.RunOutbox(ctx); outcome != store.JobSkipped {
		t.Fatalf("RunOutbox before the backoff = %s", outcome)
	}
	clock.Advance(time.Minute)
	if outcome, err := d.RunOutbox(ctx); outcome != store.JobOK || err != nil {
		t.Fatalf("RunOutbox with the server up = %s, %v", outcome, err)
	}
	clock.Advance(time.Hour)
	d.RunOutbox(ctx)
	if n := len(srv.messages()); n != 1 {
		t.Fatalf("server received %d copies, want 1", n)
	}
	it, _ = db.OutboxItem(ctx, id)
	if it.Attempts != 2 || it.SentAt.IsZero() || it.LastError != "" {
		t.Fatalf("after delivery: %+v", it)
	}
}

func TestBackoff(t *testing.T) {
	// Exponential backoff with a cap, common practice: base*2^(n-1) <= max.
	for _, tc := range []struct {
		attempt int
		want    time.Duration
	}{{1, time.Minute}, {2, 2 * time.Minute}, {3, 4 * time.Minute}, {6, 32 * time.Minute}, {7, time.Hour}, {500, time.Hour}} {
		if got := backoff(tc.attempt, time.Minute, time.Hour); got != tc.want {
			t.Errorf("backoff(%d) = %v, want %v", tc.attempt, got, tc.want)
		}
	}
}

// TestTwoDaemonsDeliverOnce runs two daemons, each with its own
// connection to one database file, delivering the same outbox at once.
func TestTwoDaemonsDeliverOnce(t *testing.T) {
	dir := t.TempDir()
	srv := startSMTP(t, "127.0.0.1:0", nil, "")
	cfg := smtpConfig(t, dir, srv.addr)
	db1 := openDB(t, cfg.Database)
	db2 := openDB(t, cfg.Database)
	const n = 12
	for i := range n {
		enqueueTestMessage(t, db1, "P"+string(rune('A'+i)), []byte("%PDF-1.7 pack "+string(rune('A'+i))), "committee@example.com")
	}
	d1 := newDaemon(t, DaemonOptions{Config: cfg, DB: db1, Holder: "one"})
	d2 := newDaemon(t, DaemonOptions{Config: cfg, DB: db2, Holder: "two"})
	var wg sync.WaitGroup
	for _, d := range []*Daemon{d1, d2, d1, d2} {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range 3 {
				if _, err := d.RunOutbox(context.Background()); err != nil {
					t.Error(err)
				}
			}
		}()
	}
	wg.Wait()
	seen := map[string]int{}
	for _, m := range srv.messages() {
		p := parseMessage(t, m.data)
		seen[p.header.Get("Message-Id")]++
	}
	if len(seen) != n {
		t.Fatalf("%d distinct messages delivered, want %d", len(seen), n)
	}
	for id, c := range seen {
		if c != 1 {
			t.Errorf("message %s delivered %d times", id, c)
		}
	}
}

func TestFolderDelivery(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	db := openDB(t, cfg.Database)
	pdf := []byte("%PDF-1.7 folder")
	id := enqueueTestMessage(t, db, "GROWTH", pdf, "committee@example.com")
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db})
	if outcome, err := d.RunOutbox(context.Background()); outcome != store.JobOK || err != nil {
		t.Fatalf("RunOutbox = %s, %v", outcome, err)
	}
	files, _ := filepath.Glob(filepath.Join(cfg.Mail.Folder, "*.eml"))
	if len(files) != 1 {
		t.Fatalf(".eml files: %v", files)
	}
	raw, _ := os.ReadFile(files[0])
	p := parseMessage(t, raw)
	it, _ := db.OutboxItem(context.Background(), id)
	if !bytes.Equal(p.attachment, pdf) || p.header.Get("Message-Id") != it.MessageID || it.SentAt.IsZero() {
		t.Fatalf("eml: attachment %q, Message-ID %q (outbox %q)", p.attachment, p.header.Get("Message-Id"), it.MessageID)
	}
}

// TestMismatchedPDFIsNotSent: a PDF whose bytes do not match the checksum
// the outbox recorded is never attached; the message stays in the outbox
// with the reason.
func TestMismatchedPDFIsNotSent(t *testing.T) {
	dir := t.TempDir()
	srv := startSMTP(t, "127.0.0.1:0", nil, "")
	cfg := smtpConfig(t, dir, srv.addr)
	db := openDB(t, cfg.Database)
	run := storetest.InsertRun(t, db, "GROWTH", "2026-03-06", []byte("%PDF-1.7 stored"))
	id, err := db.Enqueue(context.Background(), store.OutboxMessage{
		RunID: run, Recipients: []string{"committee@example.com"}, Subject: "s", TextBody: "t",
		AttachmentName: "p.pdf", AttachmentSHA256: storetest.SHA256([]byte("%PDF-1.7 other")),
	})
	if err != nil {
		t.Fatal(err)
	}
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db})
	if outcome, _ := d.RunOutbox(context.Background()); outcome != store.JobError {
		t.Fatalf("RunOutbox = %s, want error", outcome)
	}
	it, _ := db.OutboxItem(context.Background(), id)
	if len(srv.messages()) != 0 || !it.SentAt.IsZero() || !strings.Contains(it.LastError, "checksum") {
		t.Fatalf("damaged PDF: %d sent, row %+v", len(srv.messages()), it)
	}
}

// TestPasswordNeverShown: with STARTTLS and AUTH PLAIN, the password read
// from the environment reaches the server but not the configuration's
// canonical JSON, the logs or the outbox's error text.
func TestPasswordNeverShown(t *testing.T) {
	const password = "s3cret-Pa55-word-for-test"
	dir := t.TempDir()
	serverTLS, clientTLS := selfSignedTLS(t)
	srv := startSMTP(t, "127.0.0.1:0", serverTLS, password)
	cfg := smtpConfig(t, dir, srv.addr)
	cfg.Mail.TLS, cfg.Mail.Auth, cfg.Mail.Username, cfg.Mail.PasswordEnv = "starttls", "plain", "plumbline", "TEST_SMTP_PASSWORD"
	db := openDB(t, cfg.Database)
	var logs syncBuffer
	logger := slog.New(slog.NewTextHandler(&logs, &slog.HandlerOptions{Level: slog.LevelDebug}))
	env := map[string]string{"TEST_SMTP_PASSWORD": password}

	build := func(env map[string]string) *Daemon {
		sender, err := NewSender(cfg.Mail, func(k string) string { return env[k] }, logger)
		if err != nil {
			t.Fatal(err)
		}
		sender.(*SMTPSender).TLSConfig = clientTLS
		// Log the sender and its secret deliberately, in every form.
		pw := sender.(*SMTPSender).password
		logger.Info("sender built", "sender", sender, "password", pw)
		logger.Debug(fmt.Sprintf("%v %+v %#v %s", sender, sender, sender, pw))
		return newDaemon(t, DaemonOptions{Config: cfg, DB: db, Sender: sender, Logger: logger})
	}

	// A wrong password first: refused, and the error text is stored.
	id := enqueueTestMessage(t, db, "GROWTH", []byte("%PDF-1.7 auth"), "committee@example.com")
	bad := build(map[string]string{"TEST_SMTP_PASSWORD": password + "-wrong"})
	if outcome, _ := bad.RunOutbox(context.Background()); outcome != store.JobError {
		t.Fatalf("RunOutbox with a wrong password = %s", outcome)
	}
	failed, _ := db.OutboxItem(context.Background(), id)
	if failed.LastError == "" {
		t.Fatal("no error recorded for a refused login")
	}
	good := build(env)
	// Make the message due again now.
	goodClock := clockwork.NewFakeClockAt(time.Now().Add(2 * time.Minute))
	good.clock = goodClock
	if outcome, err := good.RunOutbox(context.Background()); outcome != store.JobOK || err != nil {
		t.Fatalf("RunOutbox with the right password = %s, %v", outcome, err)
	}
	if len(srv.messages()) != 1 {
		t.Fatalf("server received %d messages", len(srv.messages()))
	}

	canon, err := cfg.Canonical()
	if err != nil {
		t.Fatal(err)
	}
	recs, _ := db.JobRuns(context.Background(), "", 100)
	var jobText strings.Builder
	for _, r := range recs {
		jobText.WriteString(r.Error)
	}
	for what, s := range map[string]string{
		"canonical config": string(canon),
		"logs":             logs.String(),
		"outbox error":     failed.LastError,
		"job log":          jobText.String(),
	} {
		if strings.Contains(s, password) {
			t.Errorf("%s contains the password", what)
		}
	}
	if !strings.Contains(logs.String(), "[redacted]") {
		t.Error("the deliberately logged secret did not print as [redacted]")
	}
}

func TestLoadPassword(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "smtp.pass")
	os.WriteFile(file, []byte("from-file\n"), 0o600)
	empty := filepath.Join(dir, "empty.pass")
	os.WriteFile(empty, []byte("\n"), 0o600)
	env := func(k string) string { return map[string]string{"PW": "from-env"}[k] }
	for _, tc := range []struct {
		name string
		m    config.Mail
		want string
		ok   bool
	}{
		{"env", config.Mail{Auth: "plain", PasswordEnv: "PW"}, "from-env", true},
		{"unset env", config.Mail{Auth: "plain", PasswordEnv: "NOPE"}, "", false},
		{"file, newline trimmed", config.Mail{Auth: "login", PasswordFile: file}, "from-file", true},
		{"empty file", config.Mail{Auth: "plain", PasswordFile: empty}, "", false},
		{"missing file", config.Mail{Auth: "plain", PasswordFile: filepath.Join(dir, "none")}, "", false},
		{"both", config.Mail{Auth: "plain", PasswordEnv: "PW", PasswordFile: file}, "", false},
		{"no auth", config.Mail{Auth: "none", PasswordEnv: "PW"}, "", true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, err := loadPassword(tc.m, env)
			if (err == nil) != tc.ok || string(got) != tc.want {
				t.Fatalf("loadPassword = %q, %v", string(got), err)
			}
			if err != nil && (strings.Contains(err.Error(), "from-env") || strings.Contains(err.Error(), "from-file")) {
				t.Fatalf("error shows the password: %v", err)
			}
		})
	}
}

// TestImplicitTLS: tls = "implicit" speaks TLS from the first byte
// (RFC 8314 section 3.3, submission over TLS).
func TestImplicitTLS(t *testing.T) {
	dir := t.TempDir()
	serverTLS, clientTLS := selfSignedTLS(t)
	ln, err := tls.Listen("tcp", "127.0.0.1:0", serverTLS)
	if err != nil {
		t.Fatal(err)
	}
	srv := &smtpServer{}
	srv.srv = smtp.NewServer(srv)
	srv.srv.Domain = "mx.example.com"
	go srv.srv.Serve(ln)
	defer srv.srv.Close()
	cfg := smtpConfig(t, dir, ln.Addr().String())
	cfg.Mail.TLS = "implicit"
	db := openDB(t, cfg.Database)
	pdf := []byte("%PDF-1.7 implicit")
	enqueueTestMessage(t, db, "GROWTH", pdf, "committee@example.com")
	sender, err := NewSender(cfg.Mail, func(string) string { return "" }, nil)
	if err != nil {
		t.Fatal(err)
	}
	sender.(*SMTPSender).TLSConfig = clientTLS
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Sender: sender})
	if outcome, err := d.RunOutbox(context.Background()); outcome != store.JobOK || err != nil {
		t.Fatalf("RunOutbox = %s, %v", outcome, err)
	}
	if msgs := srv.messages(); len(msgs) != 1 || !bytes.Equal(parseMessage(t, msgs[0].data).attachment, pdf) {
		t.Fatalf("received %d messages", len(msgs))
	}
}
