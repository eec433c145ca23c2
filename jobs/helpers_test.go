package jobs

import (
	"bytes"
	"context"
	"crypto/ecdsa"
	"crypto/elliptic"
	"crypto/rand"
	"crypto/tls"
	"crypto/x509"
	"crypto/x509/pkix"
	"errors"
	"io"
	"log/slog"
	"math/big"
	"net"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"github.com/emersion/go-sasl"
	"github.com/emersion/go-smtp"
	"github.com/jonboulle/clockwork"

	"plumbline/jobs/config"
	"plumbline/store"
	"plumbline/store/storetest"
)

// testConfig is a daemon configuration with every daemon key set, in dir.
func testConfig(dir string) *config.Config {
	c := config.Default()
	c.Database = filepath.Join(dir, "p.db")
	c.Sources = config.Sources{DropDir: filepath.Join(dir, "drop"), StableFor: config.Every(0)}
	c.Schedule = config.Schedule{
		TimeZone:   "America/New_York",
		IngestDays: []string{"mon", "tue", "wed", "thu", "fri"}, IngestAt: "18:30",
		PackDays: []string{"fri"}, PackAt: "19:00",
		OutboxEvery: config.Every(time.Minute), CatchUpMax: 1,
		JobTimeout: config.Every(time.Hour), ShutdownGrace: config.Every(time.Minute),
	}
	c.Mail = config.Mail{
		Delivery: "folder", Folder: filepath.Join(dir, "mail"),
		From: "Risk Desk <risk@example.com>", Host: "127.0.0.1", Port: 25, TLS: "none", Auth: "none",
		Timeout: config.Every(5 * time.Second), RetryBase: config.Every(time.Minute),
		RetryMax: config.Every(time.Hour), Lease: config.Every(10 * time.Minute),
	}
	c.Status = config.Status{}
	return c
}

func openDB(t *testing.T, path string) *store.DB {
	t.Helper()
	db, err := store.Open(context.Background(), path)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

// packCall is one call of a fake PackFunc.
type packCall struct {
	asOf time.Time
	at   time.Time // the daemon clock's time at the call
}

// fakePack records its calls on a channel.
func fakePack(clock clockwork.Clock, calls chan<- packCall) PackFunc {
	return func(ctx context.Context, asOf time.Time) error {
		calls <- packCall{asOf: asOf, at: clock.Now()}
		return nil
	}
}

func newDaemon(t *testing.T, o DaemonOptions) *Daemon {
	t.Helper()
	if o.Logger == nil {
		o.Logger = slog.New(slog.NewTextHandler(io.Discard, nil))
	}
	if o.Pack == nil {
		o.Pack = func(context.Context, time.Time) error { return nil }
	}
	d, err := NewDaemon(o)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// runDaemon runs d until the test ends (or stop is called) and waits for
// it to be ready.
func runDaemon(t *testing.T, d *Daemon) (stop func() error) {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- d.Run(ctx) }()
	select {
	case <-d.Ready():
	case err := <-done:
		t.Fatalf("daemon stopped at start: %v", err)
	case <-time.After(10 * time.Second):
		t.Fatal("daemon not ready after 10s")
	}
	var once sync.Once
	var err error
	stop = func() error {
		once.Do(func() {
			cancel()
			select {
			case err = <-done:
			case <-time.After(30 * time.Second):
				err = errors.New("daemon did not stop within 30s")
			}
		})
		return err
	}
	t.Cleanup(func() { stop() })
	return stop
}

// enqueueTestMessage stores a run with pdf and one message for it.
func enqueueTestMessage(t *testing.T, db *store.DB, portfolio string, pdf []byte, rcpt ...string) int64 {
	t.Helper()
	run := storetest.InsertRun(t, db, portfolio, "2026-03-06", pdf)
	id, err := db.Enqueue(context.Background(), store.OutboxMessage{
		RunID: run, Recipients: rcpt, Subject: "Weekly risk pack " + portfolio + " 2026-03-06",
		TextBody: "Plain text body for " + portfolio, HTMLBody: "<p>HTML body for " + portfolio + "</p>",
		AttachmentName: portfolio + "-2026-03-06.pdf", AttachmentSHA256: storetest.SHA256(pdf),
		CreatedAt: time.Date(2026, 3, 6, 19, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	return id
}

// smtpServer is an SMTP server inside the test process that keeps what it
// receives.
type smtpServer struct {
	srv  *smtp.Server
	addr string
	mu   sync.Mutex
	msgs []received
	// password, when set, makes the server require AUTH PLAIN with it.
	password string
}

type received struct {
	from string
	rcpt []string
	data []byte
}

func (s *smtpServer) NewSession(*smtp.Conn) (smtp.Session, error) { return &smtpSession{srv: s}, nil }

func (s *smtpServer) messages() []received {
	s.mu.Lock()
	defer s.mu.Unlock()
	return append([]received(nil), s.msgs...)
}

type smtpSession struct {
	srv    *smtpServer
	authed bool
	cur    received
}

func (s *smtpSession) AuthMechanisms() []string { return []string{sasl.Plain} }

func (s *smtpSession) Auth(mech string) (sasl.Server, error) {
	return sasl.NewPlainServer(func(identity, username, password string) error {
		if username != "plumbline" || password != s.srv.password {
			return smtp.ErrAuthFailed
		}
		s.authed = true
		return nil
	}), nil
}

func (s *smtpSession) Mail(from string, _ *smtp.MailOptions) error {
	if s.srv.password != "" && !s.authed {
		return smtp.ErrAuthRequired
	}
	s.cur = received{from: from}
	return nil
}

func (s *smtpSession) Rcpt(to string, _ *smtp.RcptOptions) error {
	s.cur.rcpt = append(s.cur.rcpt, to)
	return nil
}

func (s *smtpSession) Data(r io.Reader) error {
	b, err := io.ReadAll(r)
	if err != nil {
		return err
	}
	s.cur.data = b
	s.srv.mu.Lock()
	s.srv.msgs = append(s.srv.msgs, s.cur)
	s.srv.mu.Unlock()
	return nil
}

func (s *smtpSession) Reset()        { s.cur = received{} }
func (s *smtpSession) Logout() error { return nil }

// startSMTP serves SMTP on addr ("127.0.0.1:0" for any port) until the
// test ends; with tlsCfg it offers STARTTLS.
func startSMTP(t *testing.T, addr string, tlsCfg *tls.Config, password string) *smtpServer {
	t.Helper()
	ln, err := net.Listen("tcp", addr)
	if err != nil {
		t.Fatal(err)
	}
	s := &smtpServer{password: password}
	s.srv = smtp.NewServer(s)
	s.srv.Domain = "mx.example.com"
	s.srv.TLSConfig = tlsCfg
	s.srv.ReadTimeout = 10 * time.Second
	s.srv.WriteTimeout = 10 * time.Second
	s.addr = ln.Addr().String()
	go s.srv.Serve(ln)
	t.Cleanup(func() { s.srv.Close() })
	return s
}

// freeAddr returns a loopback address nothing listens on right now.
func freeAddr(t *testing.T) string {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().String()
	ln.Close()
	return addr
}

func splitPort(t *testing.T, addr string) (string, int) {
	t.Helper()
	h, p, err := net.SplitHostPort(addr)
	if err != nil {
		t.Fatal(err)
	}
	port, err := net.LookupPort("tcp", p)
	if err != nil {
		t.Fatal(err)
	}
	return h, port
}

// selfSignedTLS returns a server config for 127.0.0.1 and a client config
// trusting it.
func selfSignedTLS(t *testing.T) (server, client *tls.Config) {
	t.Helper()
	key, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	tmpl := &x509.Certificate{
		SerialNumber: big.NewInt(1),
		Subject:      pkix.Name{CommonName: "127.0.0.1"},
		NotBefore:    time.Now().Add(-time.Hour),
		NotAfter:     time.Now().Add(time.Hour),
		IPAddresses:  []net.IP{net.ParseIP("127.0.0.1")},
		KeyUsage:     x509.KeyUsageDigitalSignature,
		ExtKeyUsage:  []x509.ExtKeyUsage{x509.ExtKeyUsageServerAuth},
	}
	der, err := x509.CreateCertificate(rand.Reader, tmpl, tmpl, &key.PublicKey, key)
	if err != nil {
		t.Fatal(err)
	}
	cert, err := x509.ParseCertificate(der)
	if err != nil {
		t.Fatal(err)
	}
	pool := x509.NewCertPool()
	pool.AddCert(cert)
	server = &tls.Config{Certificates: []tls.Certificate{{Certificate: [][]byte{der}, PrivateKey: key}}}
	client = &tls.Config{RootCAs: pool, ServerName: "127.0.0.1"}
	return server, client
}

// syncBuffer is a goroutine-safe log sink.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

// waitFor polls cond every 5 ms for up to 10 s.
func waitFor(t *testing.T, what string, cond func() bool) {
	t.Helper()
	deadline := time.Now().Add(10 * time.Second)
	for !cond() {
		if time.Now().After(deadline) {
			t.Fatalf("timed out waiting for %s", what)
		}
		time.Sleep(5 * time.Millisecond)
	}
}
