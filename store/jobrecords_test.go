package store_test

import (
	"context"
	"errors"
	"testing"
	"time"

	"plumbline/store"
)

func TestStartJobOnce(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	slot := time.Date(2026, 3, 6, 19, 0, 0, 0, time.UTC)
	stale := 2 * time.Hour

	if _, ok, err := db.LastServed(ctx, "pack"); err != nil || ok {
		t.Fatalf("LastServed on an empty log = %v, %v", ok, err)
	}
	if _, ok, err := db.FirstJobStart(ctx); err != nil || ok {
		t.Fatalf("FirstJobStart on an empty log = %v, %v", ok, err)
	}

	now := slot
	id1, started, _, err := db.StartJobOnce(ctx, "pack", slot, "A", now, now.Add(-stale))
	if err != nil || !started {
		t.Fatalf("first start = %v, %v", started, err)
	}
	// A second daemon at the same time finds the slot taken.
	id2, started, by, err := db.StartJobOnce(ctx, "pack", slot, "B", now.Add(time.Second), now.Add(time.Second-stale))
	if err != nil || started || by == nil || by.ID != id1 {
		t.Fatalf("second start = %v, by %+v, %v; want skipped by %d", started, by, err, id1)
	}
	// The skip is itself recorded.
	recs, err := db.JobRuns(ctx, "pack", 10)
	if err != nil || len(recs) != 2 || recs[0].ID != id2 || recs[0].Outcome != store.JobSkipped || recs[0].Holder != "B" {
		t.Fatalf("job log = %+v, %v", recs, err)
	}
	// An open record older than the job timeout is from a dead process:
	// the slot may be served again.
	later := now.Add(stale + time.Minute)
	id3, started, _, err := db.StartJobOnce(ctx, "pack", slot, "C", later, later.Add(-stale))
	if err != nil || !started {
		t.Fatalf("start after a stale record = %v, %v", started, err)
	}
	if err := db.FinishJob(ctx, id3, later.Add(time.Minute), store.JobOK, ""); err != nil {
		t.Fatal(err)
	}
	if err := db.FinishJob(ctx, id3, later.Add(time.Minute), store.JobOK, ""); !errors.Is(err, store.ErrNoJobRecord) {
		t.Fatalf("second FinishJob = %v, want ErrNoJobRecord", err)
	}
	if err := db.FinishJob(ctx, id1, later, "fine", ""); err == nil {
		t.Fatal("FinishJob accepted an unknown outcome")
	}
	// Once served successfully, the slot is never started again.
	much := later.Add(30 * 24 * time.Hour)
	if _, started, _, _ := db.StartJobOnce(ctx, "pack", slot, "D", much, much.Add(-stale)); started {
		t.Fatal("a served slot was started again")
	}
	got, ok, err := db.LastServed(ctx, "pack")
	if err != nil || !ok || !got.Equal(slot) {
		t.Fatalf("LastServed = %v, %v, %v; want %v", got, ok, err, slot)
	}
	first, ok, err := db.FirstJobStart(ctx)
	if err != nil || !ok || !first.Equal(now) {
		t.Fatalf("FirstJobStart = %v, %v, %v; want %v", first, ok, err, now)
	}
}

func TestFetchLog(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	if f, err := db.LastFetch(ctx, "prices"); err != nil || f != nil {
		t.Fatalf("LastFetch on an empty log = %+v, %v", f, err)
	}
	for i, sum := range []string{"aa", "bb"} {
		err := db.RecordFetch(ctx, store.Fetch{Source: "prices", URL: "http://127.0.0.1/x", FetchedAt: t0.Add(time.Duration(i) * time.Hour), File: "f.csv", Bytes: 3, SHA256: sum})
		if err != nil {
			t.Fatal(err)
		}
	}
	f, err := db.LastFetch(ctx, "prices")
	if err != nil || f == nil || f.SHA256 != "bb" || !f.FetchedAt.Equal(t0.Add(time.Hour)) {
		t.Fatalf("LastFetch = %+v, %v", f, err)
	}
}

func TestPruneIdleJobRuns(t *testing.T) {
	db := openTestDB(t)
	ctx := context.Background()
	old := t0.Add(-10 * 24 * time.Hour)
	add := func(job string, at time.Time, outcome, text string) {
		id, err := db.StartJob(ctx, job, time.Time{}, "A", at)
		if err != nil {
			t.Fatal(err)
		}
		if err := db.FinishJob(ctx, id, at, outcome, text); err != nil {
			t.Fatal(err)
		}
	}
	add("outbox", old, store.JobSkipped, "")  // idle, old: pruned
	add("outbox", old, store.JobOK, "")       // work done: kept
	add("outbox", old, store.JobError, "421") // failure: kept
	add("outbox", t0, store.JobSkipped, "")   // idle, recent: kept
	add("pack", old, store.JobSkipped, "")    // other job: kept
	n, err := db.PruneIdleJobRuns(ctx, "outbox", t0.Add(-7*24*time.Hour))
	if err != nil || n != 1 {
		t.Fatalf("PruneIdleJobRuns = %d, %v; want 1", n, err)
	}
	recs, _ := db.JobRuns(ctx, "", 10)
	if len(recs) != 4 {
		t.Fatalf("%d records left, want 4", len(recs))
	}
}
