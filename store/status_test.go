package store_test

import (
	"context"
	"testing"
	"time"

	"plumbline/store"
	"plumbline/store/storetest"
)

func TestStatusQueries(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	pdf := []byte("%PDF-1.7 status")
	storetest.InsertRun(t, db, "VALUE", "2026-02-27", pdf)
	latestValue := storetest.InsertRun(t, db, "VALUE", "2026-03-06", pdf)
	growth := storetest.InsertRun(t, db, "GROWTH", "2026-03-06", pdf)
	storetest.InsertRun(t, db, "GROWTH", "2026-02-27", pdf) // late rerun of an older date

	runs, err := db.LatestRuns(ctx)
	if err != nil {
		t.Fatal(err)
	}
	want := []store.PortfolioRun{{PortfolioID: "GROWTH", RunID: growth}, {PortfolioID: "VALUE", RunID: latestValue}}
	if len(runs) != len(want) {
		t.Fatalf("LatestRuns = %+v", runs)
	}
	for i, w := range want {
		if runs[i].PortfolioID != w.PortfolioID || runs[i].RunID != w.RunID || runs[i].AsOf != "2026-03-06" || !runs[i].Current {
			t.Errorf("LatestRuns[%d] = %+v, want portfolio %s run %d as of 2026-03-06", i, runs[i], w.PortfolioID, w.RunID)
		}
	}

	st, err := db.OutboxStats(ctx, t0)
	if err != nil || st.Pending != 0 || !st.OldestPending.IsZero() {
		t.Fatalf("OutboxStats on an empty outbox = %+v, %v", st, err)
	}
	m := testMessage(growth, pdf)
	first, _ := db.Enqueue(ctx, m)
	m.CreatedAt = t0.Add(time.Hour) // not due at t0
	db.Enqueue(ctx, m)
	it, _ := db.ClaimOutbox(ctx, "A", t0, time.Minute, "<x@example.com>")
	db.MarkFailed(ctx, it.ID, "A", t0.Add(time.Minute), "421 try later")
	st, err = db.OutboxStats(ctx, t0.Add(2*time.Minute))
	if err != nil {
		t.Fatal(err)
	}
	if st.Pending != 2 || st.Due != 1 || st.Failing != 1 || !st.OldestPending.Equal(t0) || st.LastError != "421 try later" || it.ID != first {
		t.Fatalf("OutboxStats = %+v", st)
	}
}
