package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// Packing a date that already has a run needs --reason (the history is
// append-only and each revision says why it exists); with one, the new
// run is the date's second revision. Golden output of the second call.
func TestPackAgainNeedsReason(t *testing.T) {
	f := sharedFixture(t)
	db := copyFixture(t)
	pf := f.portfolios[len(f.portfolios)-1]
	args := []string{"pack", "--db", db, "--no-pdf", "--as-of", isoDate(f.weeks[2]), "--portfolio", pf}
	stdout, stderr, code := runCmd(t, args...)
	if code != exitFailure || !strings.Contains(stderr, "needs a reason") {
		t.Fatalf("without --reason: exit %d, stderr %q, want %d and a request for a reason", code, stderr, exitFailure)
	}
	if strings.Contains(stdout, pf) {
		t.Errorf("a run was reported:\n%s", stdout)
	}
	stdout, stderr, code = runCmd(t, append(args, "--reason", "limits reviewed by the committee")...)
	if code != exitOK {
		t.Fatalf("with --reason: exit %d: %s", code, stderr)
	}
	checkGolden(t, filepath.Join("testdata", "pack", "again", "want.txt"), stdout)
}
