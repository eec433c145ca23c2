package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"plumbline/store"
)

// The output of `plumbline ingest` for each case under
// testdata/ingest/<case>/: the folders runN are ingested in turn into one
// new database, and the standard output of the last run must equal
// want.txt byte for byte.
func TestIngestGolden(t *testing.T) {
	cases := []struct {
		name  string
		runs  []string // folders of the case, one per run
		codes []int    // exit code of each run
	}{
		{"good", []string{"run1"}, []int{exitOK}},
		{"bad", []string{"run1"}, []int{exitRejected}},
		{"duplicate", []string{"run1", "run1"}, []int{exitOK, exitOK}},
		{"correction", []string{"run1", "run2"}, []int{exitOK, exitOK}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			dir := filepath.Join("testdata", "ingest", tc.name)
			db := filepath.Join(t.TempDir(), "plumbline.db")
			var stdout string
			for i, r := range tc.runs {
				var stderr string
				var code int
				stdout, stderr, code = runCmd(t, "ingest", "--db", db, filepath.Join(dir, r))
				if code != tc.codes[i] {
					t.Fatalf("run %d: exit %d, want %d\nstdout:\n%s\nstderr:\n%s", i+1, code, tc.codes[i], stdout, stderr)
				}
			}
			checkGolden(t, filepath.Join(dir, "want.txt"), stdout)
		})
	}
}

// --json prints the results for programs, and --quarantine moves the
// rejected files out of the way.
func TestIngestJSONAndQuarantine(t *testing.T) {
	in := t.TempDir()
	for _, name := range []string{"portfolios.csv", "securities.csv", "prices-2026-03.csv"} {
		b, err := os.ReadFile(filepath.Join("testdata", "ingest", "bad", "run1", name))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(in, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	q := filepath.Join(t.TempDir(), "quarantine")
	stdout, stderr, code := runCmd(t, "ingest", "--json", "--quarantine", q, "--db", filepath.Join(t.TempDir(), "p.db"), in)
	if code != exitRejected || !strings.Contains(stderr, "1 of 3 files rejected") {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	var res []store.FileResult
	if err := json.Unmarshal([]byte(stdout), &res); err != nil {
		t.Fatalf("--json output: %v\n%s", err, stdout)
	}
	if len(res) != 3 || res[2].Outcome != store.Rejected || len(res[2].Errors) != 5 || res[2].Errors[0].Line != 3 ||
		res[2].Errors[0].Column != "close" {
		t.Fatalf("results %+v", res)
	}
	moved := filepath.Join(q, "prices-2026-03.csv")
	if res[2].Quarantined != moved {
		t.Errorf("quarantined to %q, want %q", res[2].Quarantined, moved)
	}
	if _, err := os.Stat(moved); err != nil {
		t.Errorf("rejected file not in quarantine: %v", err)
	}
	if _, err := os.Stat(filepath.Join(in, "prices-2026-03.csv")); !os.IsNotExist(err) {
		t.Errorf("rejected file still in place: %v", err)
	}
	if _, err := os.Stat(filepath.Join(in, "securities.csv")); err != nil {
		t.Errorf("accepted file moved: %v", err)
	}
}

// Bad command lines exit 2; a missing path is a failure (exit 1).
func TestIngestUsage(t *testing.T) {
	if _, _, code := runCmd(t, "ingest"); code != exitUsage {
		t.Errorf("no paths: exit %d, want %d", code, exitUsage)
	}
	if _, _, code := runCmd(t, "ingest", "--nope", "x"); code != exitUsage {
		t.Errorf("unknown flag: exit %d, want %d", code, exitUsage)
	}
	db := filepath.Join(t.TempDir(), "p.db")
	if _, stderr, code := runCmd(t, "ingest", "--db", db, filepath.Join(t.TempDir(), "missing.csv")); code != exitFailure || stderr == "" {
		t.Errorf("missing file: exit %d (%q), want %d", code, stderr, exitFailure)
	}
	if out, _, code := runCmd(t, "ingest", "--help"); code != exitOK || !strings.Contains(out, "--quarantine DIR") {
		t.Errorf("--help: exit %d\n%s", code, out)
	}
}
