package store

import (
	"context"
	"reflect"
	"testing"
	"time"
)

func fixtureDB(t *testing.T) *DB {
	t.Helper()
	db := openTestDB(t)
	res := ingest(t, db, IngestOptions{}, writeFiles(t, "portfolios.csv", portfoliosCSV, "securities.csv", securitiesCSV,
		"prices.csv", pricesCSV, "holdings.csv", holdingsCSV, "assumptions.csv", assumptionsCSV, "yields.csv", yieldsCSV,
		"premiums.csv", premiumsCSV, "flows.csv", flowsCSV,
		"assumptions-2026-03.csv", hdrAssumptions+"QLMB,2026-03-01,1.70,4,0.03,,0.08,\n",
		"holdings-2026-02-27.csv", hdrHoldings+"2026-02-27,PF-GROWTH,QLMB,900,40.10\n2026-02-27,PF-INCOME,CASH,5000,1\n")...)
	for _, r := range res {
		if r.Outcome != Accepted {
			t.Fatalf("%s: %v", r.Name, r.Err())
		}
	}
	return db
}

func ptr(v float64) *float64 { return &v }

// The read API returns what the fixture files say, as UTC-midnight dates.
func TestQueries(t *testing.T) {
	ctx := context.Background()
	db := fixtureDB(t)

	ps, err := db.Portfolios(ctx)
	if err != nil {
		t.Fatal(err)
	}
	wantP := []Portfolio{
		{"PF-GROWTH", "Harbour Growth", "Dividend growth", day("2020-01-02"), "value"},
		{"PF-INCOME", "Harbour Income", "Equity income", day("2021-06-01"), "equal"},
	}
	if !reflect.DeepEqual(ps, wantP) {
		t.Errorf("Portfolios = %+v", ps)
	}
	if ps[0].Inception.Location() != time.UTC {
		t.Errorf("dates are not UTC: %v", ps[0].Inception)
	}

	ss, err := db.Securities(ctx)
	if err != nil || len(ss) != 3 || ss[0] != (Security{"OSPX", "Ospreyfield Power", "Utilities", "USD", 300000000}) {
		t.Errorf("Securities = %+v, %v", ss, err)
	}

	// Before 2026-03-01 QLMB has its January assumption with two stages;
	// from then on the March one, without stages.
	a, err := db.AssumptionsAsOf(ctx, day("2026-02-15"))
	if err != nil {
		t.Fatal(err)
	}
	wantQ := Assumption{SecurityID: "QLMB", Effective: day("2026-01-01"), AnnualDividend: 1.60, Frequency: 4, Growth: 0.03,
		Beta: ptr(0.8), Stages: []Stage{{3, 0.09, nil}, {2, 0.06, ptr(0.095)}}}
	if len(a) != 2 || !reflect.DeepEqual(a["QLMB"], wantQ) || a["OSPX"].Beta != nil || *a["OSPX"].DiscountRate != 0.07 {
		t.Errorf("AssumptionsAsOf(2026-02-15) = %+v", a)
	}
	a, _ = db.AssumptionsAsOf(ctx, day("2026-03-01"))
	if q := a["QLMB"]; !q.Effective.Equal(day("2026-03-01")) || q.AnnualDividend != 1.70 || q.Stages != nil || *q.DiscountRate != 0.08 {
		t.Errorf("AssumptionsAsOf(2026-03-01)[QLMB] = %+v", q)
	}
	if a, _ := db.AssumptionsAsOf(ctx, day("2025-12-31")); len(a) != 0 {
		t.Errorf("assumptions before any: %+v", a)
	}

	h, err := db.Holdings(ctx, "PF-GROWTH", day("2026-03-05"))
	if err != nil || !h.AsOf.Equal(day("2026-02-27")) || h.Revision != 1 || len(h.Lines) != 1 {
		t.Errorf("Holdings(PF-GROWTH, 2026-03-05) = %+v, %v", h, err)
	}
	snaps, err := db.HoldingsSnapshots(ctx, "PF-GROWTH", time.Time{}, time.Time{})
	if err != nil || len(snaps) != 2 || !snaps[0].AsOf.Equal(day("2026-02-27")) || !snaps[1].AsOf.Equal(day("2026-03-06")) {
		t.Errorf("HoldingsSnapshots = %+v, %v", snaps, err)
	}
	snaps, _ = db.HoldingsSnapshots(ctx, "PF-GROWTH", day("2026-03-01"), day("2026-03-06"))
	if len(snaps) != 1 || len(snaps[0].Lines) != 3 || snaps[0].Lines[0].SecurityID != "CASH" {
		t.Errorf("HoldingsSnapshots in March = %+v", snaps)
	}

	pr, err := db.Prices(ctx, day("2026-03-03"), day("2026-03-03"))
	wantPr := []Price{{day("2026-03-03"), "QLMB", 41.55, 0, 1}, {day("2026-03-03"), "VNTR.A", 9.10, 0, 2}}
	if err != nil || !reflect.DeepEqual(pr, wantPr) {
		t.Errorf("Prices = %+v, %v", pr, err)
	}
	if all, _ := db.Prices(ctx, time.Time{}, time.Time{}); len(all) != 4 || all[1].Dividend != 0.12 {
		t.Errorf("all prices = %+v", all)
	}
	ys, err := db.Yields(ctx, time.Time{}, day("2026-03-06"))
	if err != nil || !reflect.DeepEqual(ys, []Yield{{day("2026-03-06"), 12, 0.041}, {day("2026-03-06"), 120, 0.043}}) {
		t.Errorf("Yields = %+v, %v", ys, err)
	}
	pm, err := db.Premiums(ctx, day("2026-03-06"), time.Time{})
	if err != nil || !reflect.DeepEqual(pm, []Premium{{day("2026-03-06"), 0.05}}) {
		t.Errorf("Premiums = %+v, %v", pm, err)
	}
	fl, err := db.Flows(ctx, "PF-INCOME", time.Time{}, time.Time{})
	if err != nil || !reflect.DeepEqual(fl, []Flow{{day("2026-03-05"), "PF-INCOME", -12000.5}}) {
		t.Errorf("Flows = %+v, %v", fl, err)
	}
	if fl, _ := db.Flows(ctx, "PF-GROWTH", day("2026-03-05"), time.Time{}); len(fl) != 0 {
		t.Errorf("flows after the last = %+v", fl)
	}

	ld, err := db.LatestDates(ctx)
	if err != nil || !ld.Prices.Equal(day("2026-03-03")) || !ld.Holdings["PF-GROWTH"].Equal(day("2026-03-06")) ||
		!ld.Holdings["PF-INCOME"].Equal(day("2026-02-27")) {
		t.Errorf("LatestDates = %+v, %v", ld, err)
	}

	led, err := db.Ledger(ctx)
	if err != nil || len(led) != 10 {
		t.Fatalf("Ledger = %d entries, %v", len(led), err)
	}
	if e := led[0]; e.ID != 1 || e.Kind != KindPortfolios || e.Rows != 2 || e.Outcome != Accepted || e.Error != "" ||
		len(e.SHA256) != 64 || e.IngestedAt.IsZero() || time.Since(e.IngestedAt) > time.Hour {
		t.Errorf("first ledger entry %+v", e)
	}
}

// An empty database answers with empty results and zero dates.
func TestQueriesEmpty(t *testing.T) {
	ctx := context.Background()
	db := openTestDB(t)
	ld, err := db.LatestDates(ctx)
	if err != nil || !ld.Prices.IsZero() || len(ld.Holdings) != 0 {
		t.Errorf("LatestDates = %+v, %v", ld, err)
	}
	if p, err := db.Prices(ctx, time.Time{}, time.Time{}); err != nil || len(p) != 0 {
		t.Errorf("Prices = %v, %v", p, err)
	}
	if a, err := db.AssumptionsAsOf(ctx, day("2026-01-01")); err != nil || len(a) != 0 {
		t.Errorf("AssumptionsAsOf = %v, %v", a, err)
	}
}
