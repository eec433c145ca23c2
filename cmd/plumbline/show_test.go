package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// Golden output of `plumbline show` on the shared fixture: the rendered
// run (with its PDF hash) and the re-run (with what it supersedes and why).
func TestShowGolden(t *testing.T) {
	f := sharedFixture(t)
	cases := []struct {
		name string
		run  int64
		want string // a line the case exists for
	}{
		{"rendered", f.rendered, "PDF sha256  " + f.pdfSHA256 + "\n"},
		{"rerun", f.rerun, "Supersedes run " + runArg(f.superseded) + ": " + rerunReason + "\n"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			stdout, stderr, code := runCmd(t, "show", runArg(tc.run), "--db", f.db)
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			if !strings.Contains(stdout, tc.want) {
				t.Errorf("output lacks %q", tc.want)
			}
			if tc.run == f.rendered {
				stdout = maskPDFHash(t, f, stdout)
			}
			checkGolden(t, filepath.Join("testdata", "show", tc.name, "want.txt"), stdout)
		})
	}
}

// A run that does not exist is a failure (exit 1); a bad id a usage error.
func TestShowErrors(t *testing.T) {
	f := sharedFixture(t)
	if _, stderr, code := runCmd(t, "show", "999", "--db", f.db); code != exitFailure || !strings.Contains(stderr, "not found") {
		t.Errorf("missing run: exit %d, %q", code, stderr)
	}
	if _, _, code := runCmd(t, "show", "x", "--db", f.db); code != exitUsage {
		t.Errorf("bad id: exit %d, want %d", code, exitUsage)
	}
}
