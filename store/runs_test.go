package store

import (
	"context"
	"errors"
	"strings"
	"testing"
	"time"
)

func runFixture(t *testing.T) *DB {
	t.Helper()
	db := openTestDB(t)
	ingest(t, db, IngestOptions{BaseCurrency: "USD"}, writeFiles(t, "portfolios.csv", portfoliosCSV)...)
	return db
}

func newRun(asOf string, reason string) NewRun {
	d, _ := time.Parse("2006-01-02", asOf)
	return NewRun{
		PortfolioID: "PF-GROWTH", AsOf: d, CreatedAt: d.Add(19 * time.Hour), Reason: reason,
		ProgramVersion: "test", ConfigJSON: []byte(`{"a":1}`), ConfigHash: strings.Repeat("a", 64),
		InputHash: strings.Repeat("b", 64), ResultsSchema: "plumbline.pack/1", ResultsJSON: []byte(`{"x":2}`),
		Metrics:  []MetricRow{{Scope: "portfolio", Metric: "duration_modified", Value: 21.5}},
		Headline: map[string]float64{"duration_modified": 21.5},
	}
}

// Runs, their metrics and PDFs refuse UPDATE and DELETE even through raw
// SQL: the history an auditor reads cannot be rewritten (append-only).
func TestRunsAppendOnly(t *testing.T) {
	db := runFixture(t)
	ctx := context.Background()
	r, err := db.SaveRun(ctx, newRun("2026-03-06", ""), func(r *Run) (*Completion, error) {
		return &Completion{PDF: []byte("%PDF-1.4 test"), Pages: 1}, nil
	})
	if err != nil {
		t.Fatal(err)
	}
	for _, q := range []string{
		`UPDATE runs SET results_json = '{}' WHERE id = ?`,
		`UPDATE runs SET reason = 'x' WHERE id = ?`,
		`DELETE FROM runs WHERE id = ?`,
		`UPDATE run_metrics SET value = 0 WHERE run_id = ?`,
		`DELETE FROM run_metrics WHERE run_id = ?`,
		`UPDATE run_pdfs SET pdf = x'00' WHERE run_id = ?`,
		`DELETE FROM run_pdfs WHERE run_id = ?`,
		`UPDATE run_headlines SET value = 0 WHERE run_id = ?`,
		`DELETE FROM run_headlines WHERE run_id = ?`,
	} {
		if _, err := db.sql.Exec(q, r.ID); err == nil || !strings.Contains(err.Error(), "append-only") {
			t.Errorf("%s: got %v, want an append-only refusal", q, err)
		}
	}
	got, err := db.GetRun(ctx, r.ID)
	if err != nil {
		t.Fatal(err)
	}
	if string(got.ResultsJSON) != `{"x":2}` || got.PDFSHA256 == "" {
		t.Fatalf("run changed: %+v", got)
	}
}

// A re-run of a date needs a reason, becomes revision 2, supersedes the
// first, and both stay.
func TestRunsSupersede(t *testing.T) {
	db := runFixture(t)
	ctx := context.Background()
	r1, err := db.SaveRun(ctx, newRun("2026-03-06", ""), nil)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.SaveRun(ctx, newRun("2026-03-06", ""), nil); !errors.Is(err, ErrReasonRequired) {
		t.Fatalf("re-run without reason: %v", err)
	}
	r2, err := db.SaveRun(ctx, newRun("2026-03-06", "corrected holdings"), nil)
	if err != nil {
		t.Fatal(err)
	}
	if r2.Revision != 2 || r2.Supersedes != r1.ID {
		t.Fatalf("r2 = %+v", r2)
	}
	all, err := db.Runs(ctx, RunFilter{})
	if err != nil {
		t.Fatal(err)
	}
	if len(all) != 2 || all[0].SupersededBy != r2.ID {
		t.Fatalf("runs = %+v", all)
	}
	cur, _ := db.Runs(ctx, RunFilter{CurrentOnly: true})
	if len(cur) != 1 || cur[0].ID != r2.ID {
		t.Fatalf("current = %+v", cur)
	}
	// History of a metric reads current runs only.
	h, err := db.MetricHistory(ctx, "duration_modified", "", "", "", time.Time{}, time.Time{})
	if err != nil || len(h) != 1 || h[0].RunID != r2.ID {
		t.Fatalf("history = %+v, %v", h, err)
	}
	// The history as r2 saw it excludes r2 itself and later runs.
	d, _ := time.Parse("2006-01-02", "2026-03-13")
	r3, err := db.SaveRun(ctx, newRun("2026-03-13", ""), nil)
	if err != nil {
		t.Fatal(err)
	}
	prior, err := db.PriorHeadlines(ctx, "PF-GROWTH", d, r3.ID)
	if err != nil || len(prior) != 1 || prior[0].RunID != r2.ID || prior[0].Metrics["duration_modified"] != 21.5 {
		t.Fatalf("prior = %v, %v", prior, err)
	}
	// Before r2 existed, r1 was the current run of its date.
	prior, _ = db.PriorHeadlines(ctx, "PF-GROWTH", d, r2.ID)
	if len(prior) != 1 || prior[0].RunID != r1.ID {
		t.Fatalf("prior before r2 = %v", prior)
	}
}

// A failure while completing a run (rendering, queueing) leaves nothing:
// one transaction per run.
func TestRunsAtomic(t *testing.T) {
	db := runFixture(t)
	ctx := context.Background()
	_, err := db.SaveRun(ctx, newRun("2026-03-06", ""), func(r *Run) (*Completion, error) {
		return nil, errors.New("renderer failed")
	})
	if err == nil {
		t.Fatal("want error")
	}
	for _, table := range []string{"runs", "run_metrics", "run_pdfs"} {
		if n := count(t, db, table); n != 0 {
			t.Errorf("%s has %d rows after a failed run", table, n)
		}
	}
}
