package jobs

import (
	"context"
	"errors"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"plumbline/jobs/config"
)

func TestFetch(t *testing.T) {
	var hits atomic.Int32
	var flaky atomic.Int32
	mux := http.NewServeMux()
	mux.HandleFunc("/eod/{date}/prices.csv", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		w.Write([]byte("abc"))
	})
	mux.HandleFunc("/slow", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		select {
		case <-r.Context().Done():
		case <-time.After(5 * time.Second):
		}
	})
	mux.HandleFunc("/big", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		w.Write([]byte(strings.Repeat("x", 2048)))
	})
	mux.HandleFunc("/big-declared", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		w.Header().Set("Content-Length", "1000000")
		w.WriteHeader(http.StatusOK)
	})
	mux.HandleFunc("/missing", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		http.NotFound(w, r)
	})
	mux.HandleFunc("/partial", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		// Promise 100 bytes, send 10, then drop the connection.
		w.Header().Set("Content-Length", "100")
		w.WriteHeader(http.StatusOK)
		w.Write([]byte("0123456789"))
		w.(http.Flusher).Flush()
		conn, _, err := http.NewResponseController(w).Hijack()
		if err == nil {
			conn.Close()
		}
	})
	mux.HandleFunc("/flaky", func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		if flaky.Add(1) == 1 {
			http.Error(w, "busy", http.StatusServiceUnavailable)
			return
		}
		w.Write([]byte("abc"))
	})
	srv := httptest.NewServer(mux)
	defer srv.Close()

	day := time.Date(2026, 3, 6, 0, 0, 0, 0, time.UTC)
	// sha256("abc") from FIPS 180-2, appendix B.1.
	const abcSHA = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
	src := func(name, path string) config.HTTPSource {
		return config.HTTPSource{Name: name, URL: srv.URL + path, Timeout: config.Every(200 * time.Millisecond),
			Retries: 2, Backoff: config.Every(10 * time.Millisecond), MaxBytes: 1024}
	}
	for _, tc := range []struct {
		name     string
		src      config.HTTPSource
		wantHits int32
		wantErr  func(error) bool
	}{
		{"success with date in URL", src("prices", "/eod/{date}/prices.csv"), 1, nil},
		{"retried after 503", src("flaky", "/flaky"), 2, nil},
		{"timeout, retried", src("slow", "/slow"), 3, func(err error) bool { return errors.Is(err, context.DeadlineExceeded) }},
		{"oversize body, not retried", src("big", "/big"), 1, func(err error) bool { return errors.Is(err, ErrTooLarge) }},
		{"oversize Content-Length, not retried", src("bigdecl", "/big-declared"), 1, func(err error) bool { return errors.Is(err, ErrTooLarge) }},
		{"404, not retried", src("missing", "/missing"), 1, func(err error) bool {
			var se *HTTPStatusError
			return errors.As(err, &se) && se.Code == http.StatusNotFound
		}},
		{"partial body, retried", src("partial", "/partial"), 3, func(err error) bool { return errors.Is(err, io.ErrUnexpectedEOF) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			cfg := testConfig(dir)
			os.MkdirAll(cfg.Sources.DropDir, 0o750)
			db := openDB(t, cfg.Database)
			d := newDaemon(t, DaemonOptions{Config: cfg, DB: db})
			hits.Store(0)
			flaky.Store(0)
			res, err := d.Fetch(context.Background(), tc.src, day)
			if got := hits.Load(); got != tc.wantHits {
				t.Errorf("server hit %d times, want %d", got, tc.wantHits)
			}
			files, _ := os.ReadDir(cfg.Sources.DropDir)
			if tc.wantErr != nil {
				if err == nil || !tc.wantErr(err) {
					t.Fatalf("Fetch = %v", err)
				}
				if len(files) != 0 {
					t.Fatalf("drop folder not empty after a failure: %v", files)
				}
				if f, _ := db.LastFetch(context.Background(), tc.src.Name); f != nil {
					t.Fatalf("failed fetch recorded: %+v", f)
				}
				return
			}
			if err != nil {
				t.Fatalf("Fetch = %v", err)
			}
			want := filepath.Join(cfg.Sources.DropDir, tc.src.Name+"-2026-03-06.csv")
			if res.Path != want || res.SHA256 != abcSHA || res.Bytes != 3 {
				t.Fatalf("result %+v", res)
			}
			if len(files) != 1 {
				t.Fatalf("drop folder holds %v, want only the file (no temporary left)", files)
			}
			if b, _ := os.ReadFile(want); string(b) != "abc" {
				t.Fatalf("saved %q", b)
			}
			f, err := db.LastFetch(context.Background(), tc.src.Name)
			if err != nil || f == nil || f.SHA256 != abcSHA || f.File != filepath.Base(want) || !strings.Contains(f.URL, "2026-03-06") && tc.src.Name == "prices" {
				t.Fatalf("fetch log %+v, %v", f, err)
			}
			// The same bytes again are not saved a second time.
			os.Remove(want)
			flaky.Store(1)
			res, err = d.Fetch(context.Background(), tc.src, day)
			if err != nil || !res.Unchanged || res.Path != "" {
				t.Fatalf("second fetch = %+v, %v", res, err)
			}
			if _, err := os.Stat(want); !errors.Is(err, os.ErrNotExist) {
				t.Fatalf("unchanged file saved again")
			}
		})
	}
}
