package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// Golden output of `plumbline history --metric duration_modified` on the
// shared fixture in the three formats: one line per current run (the
// superseded run is left out), by portfolio and as-of date.
func TestHistoryGolden(t *testing.T) {
	f := sharedFixture(t)
	cases := []struct {
		name string
		args []string
	}{
		{"table", []string{"history", "--metric", "duration_modified"}},
		{"csv", []string{"history", "--metric", "duration_modified", "--format", "csv"}},
		{"json", []string{"history", "--metric", "duration_modified", "--format", "json"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			stdout, stderr, code := runCmd(t, append(tc.args, "--db", f.db)...)
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			checkGolden(t, filepath.Join("testdata", "history", tc.name, "want.txt"), stdout)
			// Nine current runs: three weeks of three portfolios, each
			// with one portfolio-scope value (fixture_test.go).
			if n := strings.Count(stdout, f.portfolios[0]); tc.name != "json" && n != 3 {
				t.Errorf("%d lines of %s, want 3", n, f.portfolios[0])
			}
		})
	}
}

// An unknown metric is a usage error (exit 2) that lists the known names.
func TestHistoryUnknownMetric(t *testing.T) {
	f := sharedFixture(t)
	stdout, stderr, code := runCmd(t, "history", "--metric", "duration_nonsense", "--db", f.db)
	if code != exitUsage {
		t.Fatalf("exit %d, want %d; stdout %q stderr %q", code, exitUsage, stdout, stderr)
	}
	for _, want := range []string{`"duration_nonsense"`, "known:", "duration_modified", "convexity"} {
		if !strings.Contains(stderr, want) {
			t.Errorf("stderr lacks %q: %s", want, stderr)
		}
	}
	if stdout != "" {
		t.Errorf("stdout %q, want nothing", stdout)
	}
}
