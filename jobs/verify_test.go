package jobs

import (
	"context"
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"plumbline/jobs/config"
	"plumbline/jobs/demo"
	"plumbline/store"
)

// demoStore generates the fictional scenario (three years) in a temporary
// folder, ingests it and returns the database, the demo configuration and
// the folder of the input files.
func demoStore(t *testing.T) (*store.DB, *config.Config, *demo.Summary, string) {
	t.Helper()
	ctx := context.Background()
	dir := t.TempDir()
	inputs := filepath.Join(dir, "inputs")
	sum, err := demo.Generate(inputs, demo.Options{Years: 3})
	if err != nil {
		t.Fatal(err)
	}
	var ids []string
	for _, p := range sum.Portfolios {
		ids = append(ids, p.ID)
	}
	cfg := DemoConfig(dir, sum.Firm, ids)
	db := openDB(t, cfg.Database)
	res, err := Ingest(ctx, db, []string{inputs, filepath.Join(inputs, "holdings")},
		IngestOptions{IngestOptions: store.IngestOptions{BaseCurrency: cfg.BaseCurrency}})
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range res {
		if f.Outcome == store.Rejected {
			t.Fatalf("demo file %s rejected: %v", f.Name, f.Errors)
		}
	}
	return db, cfg, sum, inputs
}

// An auditor's rule (the ledger_mark column of migrations/0002_runs.sql):
// verifying an old run recomputes what was used then. A holdings file
// corrected after the run leaves its verification identical; a new pack of
// the date with a reason uses the correction, differs and supersedes it.
func TestVerifyReadsInputsAtTheRunsMark(t *testing.T) {
	ctx := context.Background()
	db, cfg, sum, inputs := demoStore(t)
	asOf, err := LatestCompleteDate(ctx, db)
	if err != nil {
		t.Fatal(err)
	}
	day := asOf.Format(time.DateOnly)
	pf := sum.Portfolios[0].ID
	clock := func() time.Time { return asOf.Add(21 * time.Hour) }
	first, err := BuildPacks(ctx, db, cfg, PackOptions{AsOf: asOf, Portfolios: []string{pf}, Version: "test", Now: clock})
	if err != nil || len(first) != 1 {
		t.Fatalf("first pack: %v %+v", err, first)
	}

	// The correction: the portfolio's snapshot of the as-of date with its
	// first security's quantity doubled.
	b, err := os.ReadFile(filepath.Join(inputs, "holdings", "holdings-"+day+".csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	fixed := []string{lines[0]}
	var sec string
	var oldQty float64
	for _, l := range lines[1:] {
		f := strings.Split(l, ",")
		if f[1] != pf {
			continue
		}
		if sec == "" && f[2] != "CASH" {
			sec = f[2]
			if oldQty, err = strconv.ParseFloat(f[3], 64); err != nil {
				t.Fatal(err)
			}
			f[3] = strconv.FormatFloat(2*oldQty+100, 'f', -1, 64)
		}
		fixed = append(fixed, strings.Join(f, ","))
	}
	if sec == "" {
		t.Fatalf("no security line for %s in the %s holdings file", pf, day)
	}
	fix := filepath.Join(t.TempDir(), "holdings-"+day+"-corrected.csv")
	if err := os.WriteFile(fix, []byte(strings.Join(fixed, "\n")+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	res, err := Ingest(ctx, db, []string{fix}, IngestOptions{})
	if err != nil || len(res) != 1 || res[0].Outcome != store.Accepted || len(res[0].Snapshots) != 1 ||
		res[0].Snapshots[0].Revision != 2 {
		t.Fatalf("correction: %v %+v", err, res)
	}

	v, err := Verify(ctx, db, first[0].RunID)
	if err != nil {
		t.Fatal(err)
	}
	if !v.Identical() || !v.InputsMatch {
		t.Errorf("old run after a later correction: inputs match %v, results match %v, %d of %d metrics differ; want identical",
			v.InputsMatch, v.ResultsMatch, len(v.Differences), v.Metrics)
	}
	// Its export still holds the quantity of the original file.
	ex, err := Export(ctx, db, first[0].RunID, filepath.Join(t.TempDir(), "export"))
	if err != nil {
		t.Fatal(err)
	}
	if q := exportedQuantity(t, filepath.Join(ex.Dir, "holdings.csv"), day, pf, sec); q != oldQty {
		t.Errorf("exported %s quantity %v, want the original %v", sec, q, oldQty)
	}

	second, err := BuildPacks(ctx, db, cfg, PackOptions{AsOf: asOf, Portfolios: []string{pf}, Version: "test", Now: clock,
		Reason: "corrected holdings file"})
	if err != nil || len(second) != 1 {
		t.Fatalf("second pack: %v %+v", err, second)
	}
	oldRun, err := db.GetRun(ctx, first[0].RunID)
	if err != nil {
		t.Fatal(err)
	}
	newRun, err := db.GetRun(ctx, second[0].RunID)
	if err != nil {
		t.Fatal(err)
	}
	if newRun.Revision != 2 || newRun.Supersedes != oldRun.ID || oldRun.SupersededBy != newRun.ID ||
		newRun.Reason != "corrected holdings file" || newRun.LedgerMark <= oldRun.LedgerMark {
		t.Errorf("new run %+v does not supersede %+v", newRun, oldRun)
	}
	if newRun.InputHash == oldRun.InputHash || second[0].Document.Summary.Value == first[0].Document.Summary.Value {
		t.Errorf("new run ignores the correction: input hash %s, value %v", newRun.InputHash, second[0].Document.Summary.Value)
	}
	if v, err := Verify(ctx, db, newRun.ID); err != nil || !v.Identical() {
		t.Errorf("new run: verify error %v, identical %v; want identical", err, err == nil && v.Identical())
	}
}

func exportedQuantity(t *testing.T, path, day, pf, sec string) float64 {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		if r[0] == day && r[1] == pf && r[2] == sec {
			q, err := strconv.ParseFloat(r[3], 64)
			if err != nil {
				t.Fatal(err)
			}
			return q
		}
	}
	t.Fatalf("%s: no row for %s %s %s", path, day, pf, sec)
	return 0
}
