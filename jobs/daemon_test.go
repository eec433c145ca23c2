package jobs

import (
	"context"
	"errors"
	"strings"
	"testing"
	"time"

	"github.com/jonboulle/clockwork"

	"plumbline/jobs/config"
	"plumbline/store"
)

// slowPack is a PackFunc that signals when it starts and returns when
// released or when its context ends.
type slowPack struct {
	started  chan time.Time
	release  chan struct{}
	finished chan error
}

func newSlowPack() *slowPack {
	return &slowPack{started: make(chan time.Time, 1), release: make(chan struct{}), finished: make(chan error, 1)}
}

func (p *slowPack) run(ctx context.Context, asOf time.Time) error {
	p.started <- asOf
	var err error
	select {
	case <-p.release:
	case <-ctx.Done():
		err = context.Cause(ctx)
	}
	p.finished <- err
	return err
}

// startSlowPack runs a daemon whose catch-up starts a slow pack (the last
// pack served is a week before the one due) and waits until it runs.
func startSlowPack(t *testing.T, grace time.Duration) (*Daemon, *store.DB, *slowPack, *clockwork.FakeClock, func() error) {
	t.Helper()
	dir := t.TempDir()
	cfg := testConfig(dir)
	cfg.Sources.DropDir = ""
	cfg.Schedule.ShutdownGrace = config.Every(grace)
	db := openDB(t, cfg.Database)
	ny := mustZone(t, "America/New_York")
	served := time.Date(2026, 2, 27, 19, 0, 0, 0, ny)
	id, _, _, err := db.StartJobOnce(context.Background(), JobPack, served, "earlier", served, served)
	if err != nil {
		t.Fatal(err)
	}
	db.FinishJob(context.Background(), id, served, store.JobOK, "")
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 9, 9, 0, 0, 0, ny))
	p := newSlowPack()
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock, Pack: p.run})
	stop := runDaemon(t, d)
	select {
	case <-p.started:
	case <-time.After(10 * time.Second):
		t.Fatal("catch-up pack did not start")
	}
	return d, db, p, clock, stop
}

// TestShutdownLetsRunningJobFinish: the context given to Run is cancelled
// (what SIGTERM does in serve) while a pack runs; Run waits for it within
// the grace period, the pack completes normally and is recorded ok.
func TestShutdownLetsRunningJobFinish(t *testing.T) {
	d, db, p, _, stop := startSlowPack(t, time.Minute)
	stopped := make(chan error, 1)
	go func() { stopped <- stop() }()
	select {
	case err := <-stopped:
		t.Fatalf("Run returned (%v) while the pack was still running", err)
	case <-time.After(100 * time.Millisecond):
	}
	// No new job starts while draining.
	if outcome, err := d.RunOutbox(context.Background()); outcome != "" || err == nil {
		t.Fatalf("RunOutbox while stopping = %q, %v; want refused", outcome, err)
	}
	close(p.release)
	if err := <-stopped; err != nil {
		t.Fatalf("Run = %v", err)
	}
	if err := <-p.finished; err != nil {
		t.Fatalf("pack ended with %v, want a normal finish", err)
	}
	recs, _ := db.JobRuns(context.Background(), JobPack, 1)
	if len(recs) != 1 || recs[0].Outcome != store.JobOK || recs[0].EndedAt.IsZero() {
		t.Fatalf("pack record = %+v", recs)
	}
}

// TestShutdownGraceRunsOut: a pack still running when the grace period
// ends is cancelled; it is recorded as an error and Run returns.
func TestShutdownGraceRunsOut(t *testing.T) {
	_, db, p, clock, stop := startSlowPack(t, 30*time.Second)
	stopped := make(chan error, 1)
	go func() { stopped <- stop() }()
	deadline := time.After(10 * time.Second)
	var err error
wait:
	for {
		select {
		case err = <-stopped:
			break wait
		case <-deadline:
			t.Fatal("Run did not return after the grace period")
		case <-time.After(10 * time.Millisecond):
			clock.Advance(5 * time.Second) // the grace period passes on the daemon's clock
		}
	}
	if err != nil {
		t.Fatalf("Run = %v", err)
	}
	if perr := <-p.finished; !errors.Is(perr, context.Canceled) {
		t.Fatalf("pack ended with %v, want cancellation", perr)
	}
	recs, _ := db.JobRuns(context.Background(), JobPack, 1)
	if len(recs) != 1 || recs[0].Outcome != store.JobError || !strings.Contains(recs[0].Error, "canceled") {
		t.Fatalf("pack record = %+v", recs)
	}
}

// TestJobTimeout: a job running longer than job_timeout is cancelled and
// recorded as an error naming the timeout.
func TestJobTimeout(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	db := openDB(t, cfg.Database)
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 6, 19, 0, 0, 0, time.UTC))
	p := newSlowPack()
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock, Pack: p.run})
	done := make(chan string, 1)
	go func() {
		outcome, _ := d.RunPack(context.Background(), clock.Now())
		done <- outcome
	}()
	<-p.started
	clock.Advance(cfg.Schedule.JobTimeout.D())
	if outcome := <-done; outcome != store.JobError {
		t.Fatalf("outcome = %s", outcome)
	}
	if err := <-p.finished; !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("pack ended with %v, want the job timeout", err)
	}
	recs, _ := db.JobRuns(context.Background(), JobPack, 1)
	if len(recs) != 1 || !strings.Contains(recs[0].Error, "job timeout") {
		t.Fatalf("record = %+v", recs)
	}
}

// TestPackSlotServedOnce: two daemons on one database asked to build the
// same schedule time build it once; the other records a skip.
func TestPackSlotServedOnce(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	db1 := openDB(t, cfg.Database)
	db2 := openDB(t, cfg.Database)
	calls := make(chan packCall, 4)
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 6, 19, 0, 0, 0, time.UTC))
	d1 := newDaemon(t, DaemonOptions{Config: cfg, DB: db1, Clock: clock, Pack: fakePack(clock, calls), Holder: "one"})
	d2 := newDaemon(t, DaemonOptions{Config: cfg, DB: db2, Clock: clock, Pack: fakePack(clock, calls), Holder: "two"})
	slot := clock.Now()
	o1, _ := d1.RunPack(context.Background(), slot)
	o2, _ := d2.RunPack(context.Background(), slot)
	if o1 != store.JobOK || o2 != store.JobSkipped || len(calls) != 1 {
		t.Fatalf("outcomes %s, %s; %d builds", o1, o2, len(calls))
	}
}

func TestPackErrorAndPanicAreRecorded(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	db := openDB(t, cfg.Database)
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 6, 19, 0, 0, 0, time.UTC))
	for _, tc := range []struct {
		name string
		pack PackFunc
		want string
	}{
		{"error", func(context.Context, time.Time) error { return errors.New("no prices for 2026-03-06") }, "no prices for 2026-03-06"},
		{"panic", func(context.Context, time.Time) error { panic("index out of range") }, "panic: index out of range"},
	} {
		d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock, Pack: tc.pack})
		outcome, err := d.RunPack(context.Background(), clock.Now())
		if outcome != store.JobError || err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Fatalf("%s: RunPack = %s, %v", tc.name, outcome, err)
		}
		recs, _ := db.JobRuns(context.Background(), JobPack, 1)
		if !strings.Contains(recs[0].Error, tc.want) {
			t.Fatalf("%s: record %+v", tc.name, recs[0])
		}
	}
}
