package main

import (
	"context"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"plumbline/store"
	"plumbline/store/storetest"
)

// Golden output of `plumbline verify` on the shared fixture's rendered run:
// inputs, metrics, results and the re-rendered PDF identical, exit 0.
func TestVerifyGolden(t *testing.T) {
	f := sharedFixture(t)
	stdout, stderr, code := runCmd(t, "verify", runArg(f.rendered), "--db", f.db)
	if code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	checkGolden(t, filepath.Join("testdata", "verify", "identical", "want.txt"), stdout)
}

// The superseded run still verifies although its holdings snapshot was
// corrected afterwards: it is recomputed from the inputs at its ledger
// mark, what it used then. The re-run, made after the correction,
// verifies as well.
func TestVerifyAfterCorrection(t *testing.T) {
	f := sharedFixture(t)
	for _, run := range []int64{f.superseded, f.rerun} {
		stdout, stderr, code := runCmd(t, "verify", runArg(run), "--db", f.db)
		if code != exitOK || !strings.HasSuffix(stdout, "\nidentical\n") {
			t.Errorf("run %d: exit %d\n%s%s", run, code, stdout, stderr)
		}
	}
}

// A price the run used, changed in place behind the program's back, makes
// verify exit 3 and list the metrics that no longer match.
func TestVerifyDetectsTampering(t *testing.T) {
	f := sharedFixture(t)
	path := copyFixture(t)
	ctx := context.Background()
	db, err := store.Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	h, err := db.Holdings(ctx, f.portfolios[0], f.weeks[2])
	if err != nil {
		t.Fatal(err)
	}
	var sec string
	var price float64
	for _, l := range h.Lines {
		if l.SecurityID != "CASH" {
			sec, price = l.SecurityID, l.Price
			break
		}
	}
	if sec == "" {
		t.Fatal("no security in the snapshot")
	}
	storetest.TamperPrice(t, db, sec, isoDate(f.weeks[2]), price*1.5)
	db.Close()

	stdout, stderr, code := runCmd(t, "verify", runArg(f.rendered), "--db", path)
	if code != exitRejected {
		t.Fatalf("exit %d, want %d\n%s%s", code, exitRejected, stdout, stderr)
	}
	if !strings.Contains(stdout, "inputs:  DIFFER") || !strings.Contains(stdout, "results: DIFFER") ||
		strings.Contains(stdout, "\nidentical\n") {
		t.Errorf("output:\n%s", stdout)
	}
	m := regexp.MustCompile(`(?m)^metrics: (\d+) of \d+ DIFFER$`).FindStringSubmatch(stdout)
	if m == nil {
		t.Fatalf("no metrics line:\n%s", stdout)
	}
	n, _ := strconv.Atoi(m[1])
	lines := regexp.MustCompile(`(?m)^  \S+ .+: stored .+, recomputed .+$`).FindAllString(stdout, -1)
	if n == 0 || len(lines) != n {
		t.Errorf("%d metrics said to differ, %d listed", n, len(lines))
	}
	// The holding's own value is among them.
	if !strings.Contains(stdout, "  holding "+sec+" value: stored ") {
		t.Errorf("value of %s not listed:\n%s", sec, stdout)
	}
}
