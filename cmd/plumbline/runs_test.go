package main

import (
	"encoding/json"
	"path/filepath"
	"testing"

	"plumbline/store"
)

// Golden output of `plumbline runs` on the shared fixture: every run,
// superseded ones included, as a table and as JSON; and the current runs
// of one portfolio. The expected files were checked by hand against the
// fixture's construction (fixture_test.go): nine weekly runs, the first
// portfolio's latest with a PDF, and one re-run superseding an earlier run
// after a holdings correction.
func TestRunsGolden(t *testing.T) {
	f := sharedFixture(t)
	cases := []struct {
		name string
		args []string
		pdf  bool // lists the rendered run
	}{
		{"table", []string{"runs"}, true},
		{"json", []string{"runs", "--json"}, true},
		{"current_portfolio", []string{"runs", "--current", "--portfolio", f.portfolios[1]}, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			stdout, stderr, code := runCmd(t, append(tc.args, "--db", f.db)...)
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			if tc.pdf {
				stdout = maskPDFHash(t, f, stdout)
			}
			checkGolden(t, filepath.Join("testdata", "runs", tc.name, "want.txt"), stdout)
		})
	}
}

// The JSON form says the same as the fixture's construction, independently
// of the golden file: the re-run supersedes the earlier run with its reason,
// and --current leaves the superseded run out.
func TestRunsSupersession(t *testing.T) {
	f := sharedFixture(t)
	decode := func(args ...string) []store.Run {
		t.Helper()
		stdout, stderr, code := runCmd(t, append(args, "--json", "--db", f.db)...)
		if code != exitOK {
			t.Fatalf("%v: exit %d: %s", args, code, stderr)
		}
		var runs []store.Run
		if err := json.Unmarshal([]byte(stdout), &runs); err != nil {
			t.Fatalf("%v: %v", args, err)
		}
		return runs
	}
	all := decode("runs")
	if want := 3*len(f.portfolios) + 1; len(all) != want {
		t.Fatalf("%d runs, want %d", len(all), want)
	}
	byID := map[int64]store.Run{}
	for _, r := range all {
		byID[r.ID] = r
	}
	old, re := byID[f.superseded], byID[f.rerun]
	if old.SupersededBy != f.rerun || re.Supersedes != f.superseded || re.Revision != 2 || re.Reason != rerunReason ||
		!re.AsOf.Equal(old.AsOf) {
		t.Errorf("superseded %+v, re-run %+v", old, re)
	}
	// The re-run saw the corrected holdings file, the run it supersedes did not.
	if re.LedgerMark != old.LedgerMark+1 || re.InputHash == old.InputHash {
		t.Errorf("re-run ledger mark %d, input hash %s; superseded %d, %s", re.LedgerMark, re.InputHash, old.LedgerMark, old.InputHash)
	}
	if got := byID[f.rendered].PDFSHA256; got != f.pdfSHA256 {
		t.Errorf("run %d PDF hash %q, want the sha256 of its stored bytes %s", f.rendered, got, f.pdfSHA256)
	}
	for _, r := range decode("runs", "--current", "--portfolio", f.portfolios[1]) {
		if r.ID == f.superseded || r.PortfolioID != f.portfolios[1] {
			t.Errorf("--current --portfolio %s lists run %d of %s", f.portfolios[1], r.ID, r.PortfolioID)
		}
	}
}
