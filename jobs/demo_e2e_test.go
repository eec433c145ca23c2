package jobs

import (
	"context"
	"os"
	"path/filepath"
	"testing"
	"time"

	"plumbline/report"
	"plumbline/store"
	"plumbline/store/storetest"
)

// The whole job end to end on the fictional scenario: ingest, 26 weekly
// runs per portfolio, rendered and mailed latest packs, verify identical;
// then a tampered input row is caught by verify.
func TestDemoEndToEnd(t *testing.T) {
	if testing.Short() {
		t.Skip("end-to-end demo takes about half a minute; run without -short")
	}
	ctx := context.Background()
	dir := t.TempDir()
	fixed := time.Date(2026, 11, 27, 21, 0, 0, 0, time.UTC)
	res, err := RunDemo(ctx, DemoOptions{Dir: dir, Weeks: 26, Version: "test", Now: func() time.Time { return fixed }})
	if err != nil {
		t.Fatal(err)
	}
	if res.Runs != 3*26 {
		t.Fatalf("runs = %d, want 78", res.Runs)
	}
	if len(res.Latest) != 3 || len(res.Mail) != 3 {
		t.Fatalf("latest %d packs, %d mails", len(res.Latest), len(res.Mail))
	}
	for _, p := range res.Latest {
		pdf, err := os.ReadFile(p.PDF)
		if err != nil {
			t.Fatal(err)
		}
		if n, err := report.PageCount(pdf); err != nil || n < 10 {
			t.Errorf("%s: %d pages, %v", p.PDF, n, err)
		}
		if v := res.Checks[p.Portfolio]; v == nil || !v.Identical() {
			t.Errorf("%s: verify %+v", p.Portfolio, v)
		}
		if len(p.Document.Limits) == 0 || len(p.Document.Drift) == 0 || len(p.Document.History) < 26 {
			t.Errorf("%s: limits %d drift %d history %d", p.Portfolio, len(p.Document.Limits), len(p.Document.Drift), len(p.Document.History))
		}
	}
	// Tamper with one input row the latest GROWTH run used.
	db, err := store.Open(ctx, filepath.Join(dir, "plumbline.db"))
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	run := res.Latest[0]
	h := run.Document.Holdings[0]
	storetest.TamperPrice(t, db, h.ID, run.AsOf, h.Price*1.5)
	v, err := Verify(ctx, db, run.RunID)
	if err != nil {
		t.Fatal(err)
	}
	if v.Identical() || v.InputsMatch || len(v.Differences) == 0 {
		t.Fatalf("tampered %s close on %s not detected: %+v", h.ID, run.AsOf, v)
	}
	// Exporting a run writes a manifest of its files.
	ex, err := Export(ctx, db, res.Latest[1].RunID, filepath.Join(dir, "export"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(ex.Dir, "MANIFEST.sha256")); err != nil {
		t.Fatal(err)
	}
}
