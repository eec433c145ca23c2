package jobs

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"log/slog"
	"net"
	"net/http"
	"os"
	"sync"
	"time"

	"github.com/go-co-op/gocron/v2"
	"github.com/jonboulle/clockwork"

	"plumbline/jobs/config"
	"plumbline/store"
)

// PackFunc builds, stores and enqueues the packs of every portfolio as of
// a date (UTC midnight of the schedule time's local date).
type PackFunc func(ctx context.Context, asOf time.Time) error

// Names of the daemon's jobs, as recorded in job_runs.
const (
	JobIngest = "ingest"
	JobPack   = "pack"
	JobOutbox = "outbox"
)

// DaemonOptions are what a Daemon needs. Config, DB and Pack are required.
type DaemonOptions struct {
	Config *config.Config
	DB     *store.DB
	Pack   PackFunc
	// Clock drives the schedules, job records and waits; nil is the real
	// clock.
	Clock clockwork.Clock
	// Logger receives the daemon's and gocron's logs; nil discards them.
	Logger *slog.Logger
	// Getenv reads the SMTP password variable; nil is os.Getenv.
	Getenv func(string) string
	// Sender delivers mail; nil builds one from Config.Mail.
	Sender Sender
	// HTTPClient fetches the HTTP sources; nil is a client with no
	// overall timeout (each source sets its own).
	HTTPClient *http.Client
	// Ingest loads files into the database; nil is Ingest of this
	// package with the drop folder's rejected/ as quarantine.
	Ingest func(ctx context.Context, paths []string) ([]store.FileResult, error)
	// Holder names this daemon instance in job records and outbox leases;
	// "" is host:pid:random.
	Holder string
}

// Daemon runs the scheduled jobs of `plumbline serve`: ingestion, the
// weekly packs and mail delivery, and serves the status endpoint. It
// keeps no global state; several can share one database.
type Daemon struct {
	cfg     *config.Config
	db      *store.DB
	pack    PackFunc
	ingest  func(ctx context.Context, paths []string) ([]store.FileResult, error)
	clock   clockwork.Clock
	log     *slog.Logger
	sender  Sender
	http    *http.Client
	holder  string
	loc     *time.Location
	ingestW Weekly
	packW   Weekly

	// jobCtx is the parent of every job's context. It is cancelled only
	// when the shutdown grace period has run out, so a job running at
	// SIGTERM may finish.
	jobCtx     context.Context
	cancelJobs context.CancelFunc

	mu        sync.Mutex
	draining  bool
	running   sync.WaitGroup
	locks     map[string]*sync.Mutex
	sched     gocron.Scheduler
	gjobs     map[string]gocron.Job
	ready     chan struct{}
	status    net.Listener
	statusSrv *http.Server
}

// NewDaemon checks opts and prepares a Daemon; Run starts it.
func NewDaemon(opts DaemonOptions) (*Daemon, error) {
	if opts.Config == nil || opts.DB == nil || opts.Pack == nil {
		return nil, errors.New("daemon: Config, DB and Pack are required")
	}
	cfg := opts.Config
	loc, err := time.LoadLocation(cfg.Schedule.TimeZone)
	if err != nil {
		return nil, fmt.Errorf("daemon: schedule.time_zone: %w", err)
	}
	d := &Daemon{
		cfg: cfg, db: opts.DB, pack: opts.Pack, clock: opts.Clock, log: opts.Logger,
		ingest: opts.Ingest, sender: opts.Sender, http: opts.HTTPClient, holder: opts.Holder, loc: loc,
		locks: map[string]*sync.Mutex{JobIngest: {}, JobPack: {}, JobOutbox: {}},
		gjobs: map[string]gocron.Job{},
	}
	if d.clock == nil {
		d.clock = clockwork.NewRealClock()
	}
	if d.log == nil {
		d.log = slog.New(slog.DiscardHandler)
	}
	if d.http == nil {
		d.http = &http.Client{}
	}
	if d.holder == "" {
		d.holder = newHolder()
	}
	if d.ingestW, err = weeklyFromConfig(cfg.Schedule.IngestDays, cfg.Schedule.IngestAt, loc); err != nil {
		return nil, fmt.Errorf("daemon: ingest schedule: %w", err)
	}
	if d.packW, err = weeklyFromConfig(cfg.Schedule.PackDays, cfg.Schedule.PackAt, loc); err != nil {
		return nil, fmt.Errorf("daemon: pack schedule: %w", err)
	}
	if d.sender == nil {
		getenv := opts.Getenv
		if getenv == nil {
			getenv = os.Getenv
		}
		if d.sender, err = NewSender(cfg.Mail, getenv, d.log); err != nil {
			return nil, fmt.Errorf("daemon: %w", err)
		}
	}
	d.jobCtx, d.cancelJobs = context.WithCancel(context.Background())
	d.ready = make(chan struct{})
	return d, nil
}

// Ready is closed once Run has started the scheduler and the status
// endpoint.
func (d *Daemon) Ready() <-chan struct{} { return d.ready }

// ingestFiles ingests paths with the configured ingest function.
func (d *Daemon) ingestFiles(ctx context.Context, paths []string) ([]store.FileResult, error) {
	if d.ingest != nil {
		return d.ingest(ctx, paths)
	}
	return Ingest(ctx, d.db, paths, IngestOptions{
		IngestOptions: store.IngestOptions{BaseCurrency: d.cfg.BaseCurrency},
		QuarantineDir: d.rejectedDir(),
	})
}

func newHolder() string {
	host, _ := os.Hostname()
	b := make([]byte, 4)
	rand.Read(b)
	return fmt.Sprintf("%s:%d:%s", host, os.Getpid(), hex.EncodeToString(b))
}

// Holder names this instance in job records and outbox leases.
func (d *Daemon) Holder() string { return d.holder }

// Run schedules the jobs, catches up missed packs, serves the status
// endpoint and blocks until ctx is done. Then it starts no new job, lets
// a running one finish within the configured shutdown grace, cancels it
// after that, and returns.
func (d *Daemon) Run(ctx context.Context) error {
	if err := d.start(); err != nil {
		d.stopScheduler()
		return err
	}
	close(d.ready)
	d.log.Info("daemon started", "holder", d.holder, "time_zone", d.loc.String(),
		"ingest", d.ingestW.String(), "pack", d.packW.String(), "outbox_every", d.cfg.Schedule.OutboxEvery.D().String())
	d.goJob(func() { d.catchUp(d.jobCtx) })

	<-ctx.Done()
	d.log.Info("daemon stopping: waiting for running jobs", "grace", d.cfg.Schedule.ShutdownGrace.D().String())
	d.mu.Lock()
	d.draining = true
	d.mu.Unlock()
	d.stopScheduler()
	err := d.drain()
	d.stopStatus()
	d.log.Info("daemon stopped")
	return err
}

func (d *Daemon) start() error {
	s, err := gocron.NewScheduler(
		gocron.WithClock(d.clock),
		gocron.WithLocation(d.loc),
		gocron.WithLogger(d.log.With("component", "gocron")),
		// The daemon waits for its jobs itself (drain); gocron only has
		// to stop its timers.
		gocron.WithStopTimeout(time.Second),
	)
	if err != nil {
		return fmt.Errorf("daemon: scheduler: %w", err)
	}
	d.sched = s
	add := func(name string, def gocron.JobDefinition, task func(), extra ...gocron.JobOption) error {
		opts := append([]gocron.JobOption{
			gocron.WithName(name),
			// A run still going when the next one is due makes gocron
			// skip that one: no job overlaps itself.
			gocron.WithSingletonMode(gocron.LimitModeReschedule),
		}, extra...)
		j, err := s.NewJob(def, gocron.NewTask(task), opts...)
		if err != nil {
			return fmt.Errorf("daemon: job %s: %w", name, err)
		}
		d.gjobs[name] = j
		return nil
	}
	if d.cfg.Sources.DropDir != "" {
		if err := add(JobIngest, d.ingestW.definition(), func() { d.RunIngest(d.jobCtx) }); err != nil {
			return err
		}
	}
	if err := add(JobPack, d.packW.definition(), func() {
		d.RunPack(d.jobCtx, d.packW.Prev(d.clock.Now()))
	}); err != nil {
		return err
	}
	if err := add(JobOutbox, gocron.DurationJob(d.cfg.Schedule.OutboxEvery.D()), func() { d.RunOutbox(d.jobCtx) },
		gocron.WithStartAt(gocron.WithStartImmediately())); err != nil {
		return err
	}
	if err := d.startStatus(); err != nil {
		return err
	}
	s.Start()
	return nil
}

func (d *Daemon) stopScheduler() {
	if d.sched == nil {
		return
	}
	if err := d.sched.Shutdown(); err != nil {
		d.log.Warn("scheduler shutdown", "err", err)
	}
}

// drain waits for running jobs for the shutdown grace, then cancels them
// and waits a little more for them to record their end.
func (d *Daemon) drain() error {
	done := make(chan struct{})
	go func() { d.running.Wait(); close(done) }()
	grace := d.cfg.Schedule.ShutdownGrace.D()
	select {
	case <-done:
		d.cancelJobs()
		return nil
	case <-d.clock.After(grace):
	}
	d.log.Warn("shutdown grace over: cancelling running jobs", "grace", grace.String())
	d.cancelJobs()
	select {
	case <-done:
		return nil
	case <-time.After(10 * time.Second):
		return errors.New("daemon: jobs still running 10s after cancellation")
	}
}

// goJob runs f as a tracked job unless the daemon is draining; it reports
// whether f was started.
func (d *Daemon) goJob(f func()) bool {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.draining {
		return false
	}
	d.running.Add(1)
	go func() {
		defer d.running.Done()
		f()
	}()
	return true
}

// execute runs one job execution: it takes the job's lock (so catch-up
// and scheduled runs never overlap), records the start, runs fn with the
// job timeout, and records the end. For a job serving a schedule time
// (scheduledFor not zero) the start is refused, and recorded as skipped,
// when that time is already served. fn returns skip = true when it had
// nothing to do. It returns the recorded outcome.
func (d *Daemon) execute(ctx context.Context, job string, scheduledFor time.Time, fn func(ctx context.Context) (skip bool, err error)) (string, error) {
	d.mu.Lock()
	if d.draining {
		d.mu.Unlock()
		return "", errors.New("daemon is stopping")
	}
	d.running.Add(1)
	d.mu.Unlock()
	defer d.running.Done()

	lock := d.locks[job]
	lock.Lock()
	defer lock.Unlock()

	rec := context.WithoutCancel(ctx)
	start := d.clock.Now()
	log := d.log.With("job", job)
	if !scheduledFor.IsZero() {
		log = log.With("scheduled_for", scheduledFor.In(d.loc).Format(time.RFC3339))
	}
	var id int64
	var err error
	if scheduledFor.IsZero() {
		id, err = d.db.StartJob(rec, job, time.Time{}, d.holder, start)
	} else {
		var started bool
		var by *store.JobRecord
		stale := start.Add(-d.cfg.Schedule.JobTimeout.D())
		id, started, by, err = d.db.StartJobOnce(rec, job, scheduledFor, d.holder, start, stale)
		if err == nil && !started {
			log.Info("job skipped: schedule time already served", "by_record", by.ID, "by_holder", by.Holder)
			return store.JobSkipped, nil
		}
	}
	if err != nil {
		log.Error("job not started: cannot record it", "err", err)
		return "", err
	}
	log.Debug("job started", "record", id)

	// The job timeout runs on the daemon's clock. (clockwork.WithTimeout
	// is not used: with a fake clock its Err blocks until the deadline.)
	jctx, cancel := context.WithCancelCause(ctx)
	timer := d.clock.AfterFunc(d.cfg.Schedule.JobTimeout.D(), func() {
		cancel(fmt.Errorf("job timeout %v: %w", d.cfg.Schedule.JobTimeout.D(), context.DeadlineExceeded))
	})
	skip, runErr := d.protect(jctx, fn)
	timer.Stop()
	cancel(nil)

	outcome, text := store.JobOK, ""
	switch {
	case runErr != nil:
		outcome, text = store.JobError, runErr.Error()
	case skip:
		outcome = store.JobSkipped
	}
	end := d.clock.Now()
	if err := d.db.FinishJob(rec, id, end, outcome, text); err != nil {
		log.Error("cannot record job end", "record", id, "err", err)
	}
	switch outcome {
	case store.JobError:
		log.Error("job failed", "record", id, "duration", end.Sub(start).String(), "err", runErr)
	case store.JobOK:
		log.Info("job done", "record", id, "duration", end.Sub(start).String())
	default:
		log.Debug("job had nothing to do", "record", id)
	}
	return outcome, runErr
}

// protect runs fn and turns a panic into an error, so a failing job is
// recorded and the daemon keeps running.
func (d *Daemon) protect(ctx context.Context, fn func(context.Context) (bool, error)) (skip bool, err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("panic: %v", r)
		}
	}()
	return fn(ctx)
}

// RunPack builds the packs for schedule time scheduledFor and then
// triggers mail delivery. It is what the pack job and catch-up run.
func (d *Daemon) RunPack(ctx context.Context, scheduledFor time.Time) (string, error) {
	asOf := packDate(scheduledFor, d.loc)
	outcome, err := d.execute(ctx, JobPack, scheduledFor, func(ctx context.Context) (bool, error) {
		if err := d.pack(ctx, asOf); err != nil {
			return false, fmt.Errorf("packs as of %s: %w", asOf.Format(time.DateOnly), err)
		}
		return false, nil
	})
	if outcome == store.JobOK {
		// Deliver the new mail now rather than at the next tick.
		if j, ok := d.gjobs[JobOutbox]; ok {
			if err := j.RunNow(); err != nil {
				d.log.Debug("outbox run after pack", "err", err)
			}
		}
	}
	return outcome, err
}
