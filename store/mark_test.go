package store

import (
	"context"
	"testing"
)

// Expected values below are read off the fixture files (helpers_test.go
// and the literals here); the rule under test is the one stated in
// migrations/0002_runs.sql: a run's ledger_mark fixes the inputs it sees,
// so a later file does not change what is recomputed for it.

func mustMark(t *testing.T, db *DB) int64 {
	t.Helper()
	m, err := db.LedgerMark(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// A holdings correction ingested after mark M is invisible at M and
// visible after it; the snapshot it superseded reads as current at M.
func TestAtHoldingsCorrection(t *testing.T) {
	ctx := context.Background()
	db := baseDB(t)
	ingest(t, db, IngestOptions{}, writeFiles(t, "holdings-2026-03-06.csv", holdingsCSV)...)
	m1 := mustMark(t, db)
	fix := hdrHoldings + "2026-03-06,PF-GROWTH,QLMB,1200,41.90\n2026-03-06,PF-GROWTH,CASH,-9880.50,1\n" +
		"2026-03-06,PF-INCOME,OSPX,500,22.10\n"
	if r := ingest(t, db, IngestOptions{}, writeFiles(t, "holdings-2026-03-06-fix.csv", fix)...)[0]; r.Outcome != Accepted {
		t.Fatalf("correction: %v", r.Err())
	}
	m2 := mustMark(t, db)
	fix2 := hdrHoldings + "2026-03-06,PF-GROWTH,QLMB,1300,41.90\n2026-03-06,PF-GROWTH,CASH,-14070.50,1\n"
	if r := ingest(t, db, IngestOptions{}, writeFiles(t, "holdings-2026-03-06-fix2.csv", fix2)...)[0]; r.Outcome != Accepted {
		t.Fatalf("second correction: %v", r.Err())
	}

	cases := []struct {
		name      string
		view      *DB
		revision  int
		lines     int
		file      string
		income    int // PF-INCOME snapshots visible
		revisions []int
		supersede []int // SupersededBy of each revision
	}{
		{"at the first file", db.At(m1), 1, 3, "holdings-2026-03-06.csv", 0, []int{1}, []int{0}},
		{"at the first correction", db.At(m2), 2, 2, "holdings-2026-03-06-fix.csv", 1, []int{1, 2}, []int{2, 0}},
		{"no mark", db, 3, 2, "holdings-2026-03-06-fix2.csv", 1, []int{1, 2, 3}, []int{2, 3, 0}},
		{"mark 0 is no limit", db.At(0), 3, 2, "holdings-2026-03-06-fix2.csv", 1, []int{1, 2, 3}, []int{2, 3, 0}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			v := tc.view
			ss, err := v.HoldingsSnapshots(ctx, "PF-GROWTH", day("2026-03-01"), day("2026-03-31"))
			if err != nil {
				t.Fatal(err)
			}
			if len(ss) != 1 || ss[0].Revision != tc.revision || len(ss[0].Lines) != tc.lines ||
				ss[0].SourceFile != tc.file || ss[0].SupersededBy != 0 {
				t.Errorf("HoldingsSnapshots = %+v, want revision %d from %s with %d lines", ss, tc.revision, tc.file, tc.lines)
			}
			h, err := v.Holdings(ctx, "PF-GROWTH", day("2026-03-09"))
			if err != nil || h.Revision != tc.revision {
				t.Errorf("Holdings = revision %d, %v; want %d", h.Revision, err, tc.revision)
			}
			inc, err := v.HoldingsSnapshots(ctx, "PF-INCOME", day("2026-03-01"), day("2026-03-31"))
			if err != nil || len(inc) != tc.income {
				t.Errorf("PF-INCOME snapshots %d (%v), want %d", len(inc), err, tc.income)
			}
			revs, err := v.HoldingsRevisions(ctx, "PF-GROWTH", day("2026-03-06"))
			if err != nil || len(revs) != len(tc.revisions) {
				t.Fatalf("HoldingsRevisions = %+v, %v", revs, err)
			}
			for i, r := range revs {
				if r.Revision != tc.revisions[i] || r.SupersededBy != tc.supersede[i] {
					t.Errorf("revision %d superseded by %d, want %d superseded by %d", r.Revision, r.SupersededBy, tc.revisions[i], tc.supersede[i])
				}
			}
			l, err := v.LatestDates(ctx)
			if err != nil || len(l.Holdings) != 1+tc.income {
				t.Errorf("LatestDates = %+v, %v", l, err)
			}
		})
	}
}

// Rows of every input kind loaded after the mark are invisible at it.
func TestAtHidesLaterRows(t *testing.T) {
	ctx := context.Background()
	db := baseDB(t)
	ingest(t, db, IngestOptions{}, writeFiles(t, "assumptions.csv", assumptionsCSV)...)
	m := mustMark(t, db)
	res := ingest(t, db, IngestOptions{}, writeFiles(t,
		"portfolios-2.csv", hdrPortfolios+"PF-VALUE,Harbour Value,Deep value,2022-01-03,price\n",
		"securities-2.csv", hdrSecurities+"TRLK,Tarnlake Mills,Materials,USD,80000000\n",
		"prices.csv", pricesCSV, "yields.csv", yieldsCSV, "premiums.csv", premiumsCSV, "flows.csv", flowsCSV,
		"assumptions-2026-03.csv", hdrAssumptions+"QLMB,2026-03-01,1.70,4,0.03,,0.08,\n")...)
	for _, r := range res {
		if r.Outcome != Accepted {
			t.Fatalf("%s: %v", r.Name, r.Err())
		}
	}
	at := db.At(m)
	count := map[string]func(*DB) (int, error){
		"portfolios": func(v *DB) (int, error) { p, err := v.Portfolios(ctx); return len(p), err },
		"securities": func(v *DB) (int, error) { s, err := v.Securities(ctx); return len(s), err },
		"prices": func(v *DB) (int, error) {
			p, err := v.Prices(ctx, day("2026-03-01"), day("2026-03-31"))
			return len(p), err
		},
		"yields": func(v *DB) (int, error) {
			y, err := v.Yields(ctx, day("2026-03-01"), day("2026-03-31"))
			return len(y), err
		},
		"premiums": func(v *DB) (int, error) {
			p, err := v.Premiums(ctx, day("2026-03-01"), day("2026-03-31"))
			return len(p), err
		},
		"flows": func(v *DB) (int, error) {
			f, err := v.Flows(ctx, "PF-GROWTH", day("2026-03-01"), day("2026-03-31"))
			return len(f), err
		},
		"ledger": func(v *DB) (int, error) { l, err := v.Ledger(ctx); return len(l), err },
	}
	cases := []struct {
		kind          string
		before, after int
	}{
		{"portfolios", 2, 3},
		{"securities", 3, 4},
		{"prices", 0, 4},
		{"yields", 0, 2},
		{"premiums", 0, 1},
		{"flows", 0, 1},
		{"ledger", 3, 10}, // portfolios, securities, assumptions; then seven files
	}
	for _, tc := range cases {
		t.Run(tc.kind, func(t *testing.T) {
			if n, err := count[tc.kind](at); err != nil || n != tc.before {
				t.Errorf("at mark %d: %d rows (%v), want %d", m, n, err, tc.before)
			}
			if n, err := count[tc.kind](db); err != nil || n != tc.after {
				t.Errorf("without mark: %d rows (%v), want %d", n, err, tc.after)
			}
		})
	}
	// The assumption in effect on 2026-03-06 is January's (with its two
	// stages) at the mark, March's after.
	a, err := at.AssumptionsAsOf(ctx, day("2026-03-06"))
	if q := a["QLMB"]; err != nil || !q.Effective.Equal(day("2026-01-01")) || len(q.Stages) != 2 {
		t.Errorf("at mark: QLMB assumption %+v, %v", q, err)
	}
	a, err = db.AssumptionsAsOf(ctx, day("2026-03-06"))
	if q := a["QLMB"]; err != nil || !q.Effective.Equal(day("2026-03-01")) || len(q.Stages) != 0 {
		t.Errorf("without mark: QLMB assumption %+v, %v", q, err)
	}
	if got := mustMark(t, at); got != m {
		t.Errorf("LedgerMark of the view = %d, want %d", got, m)
	}
	if at.Mark() != m || db.Mark() != 0 {
		t.Errorf("Mark() = %d and %d, want %d and 0", at.Mark(), db.Mark(), m)
	}
}

// A negative mark is nonsense and panics, as documented.
func TestAtNegativeMarkPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("At(-1) did not panic")
		}
	}()
	openTestDB(t).At(-1)
}
