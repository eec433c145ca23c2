package jobs

import (
	"context"
	"os"
	"path/filepath"
	"testing"

	"plumbline/store"
)

// Rejected files go to the quarantine folder without overwriting an
// earlier one of the same name; accepted files stay where they are.
func TestIngestQuarantine(t *testing.T) {
	ctx := context.Background()
	db, err := store.Open(ctx, filepath.Join(t.TempDir(), "q.db"))
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	in, q := t.TempDir(), filepath.Join(t.TempDir(), "quarantine")
	write := func(name, content string) string {
		p := filepath.Join(in, name)
		if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	good := write("premiums.csv", "date,equity_risk_premium\n2026-03-06,0.05\n")
	bad := write("bad.csv", "date,equity_risk_premium\n2026-03-06,5\n")
	opt := IngestOptions{QuarantineDir: q}
	res, err := Ingest(ctx, db, []string{good, bad}, opt)
	if err != nil {
		t.Fatal(err)
	}
	if res[0].Outcome != store.Accepted || res[0].Quarantined != "" || res[1].Outcome != store.Rejected ||
		res[1].Quarantined != filepath.Join(q, "bad.csv") {
		t.Fatalf("results %+v", res)
	}
	if _, err := os.Stat(good); err != nil {
		t.Errorf("accepted file moved: %v", err)
	}
	// A second bad file of the same name keeps the first.
	bad = write("bad.csv", "date,equity_risk_premium\n2026-03-09,-1\n")
	res, err = Ingest(ctx, db, []string{bad}, opt)
	if err != nil || res[0].Quarantined != filepath.Join(q, "bad.1.csv") {
		t.Fatalf("second bad file: %+v, %v", res, err)
	}
	for _, n := range []string{"bad.csv", "bad.1.csv"} {
		if _, err := os.Stat(filepath.Join(q, n)); err != nil {
			t.Error(err)
		}
	}
}
