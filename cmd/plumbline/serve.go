package main

import (
	"context"
	"flag"
	"time"

	"plumbline/jobs"
	"plumbline/jobs/config"
	"plumbline/store"
)

func init() { register(&serveCmd{}) }

// serveCmd runs the daemon.
type serveCmd struct{}

func (*serveCmd) Name() string { return "serve" }
func (*serveCmd) Synopsis() string {
	return "run the daemon: scheduled ingestion, weekly packs, mail delivery"
}

func (c *serveCmd) flags(env *Env, cm *common) *flag.FlagSet {
	fs := newFlags(c)
	cm.register(fs)
	return fs
}

func (c *serveCmd) Usage() string {
	return usageText("serve [--config FILE] [--db PATH]", `
Serve runs until it receives SIGINT or SIGTERM. On the schedule of the
configuration's [schedule] section, in its time zone, it fetches the HTTP
sources into the drop folder and ingests the folder's complete files
(weekdays after the close, by default), builds the weekly pack of every
portfolio (Friday evening) and delivers the outbox's mail (every minute).
On start it builds the packs missed while no daemon ran, up to
catch_up_max. A job never overlaps itself; each execution is recorded in
the database. On a signal it starts no new job, lets a running one finish
within shutdown_grace, then exits. /healthz and /status answer on
[status] listen (127.0.0.1:8479 by default). Logs go to standard error.
Several serve processes may share one database: each message is mailed
once per successful lease, and each pack time is built once.`, c.flags(&Env{}, &common{}))
}

func (c *serveCmd) Run(ctx context.Context, env *Env, args []string) error {
	var cm common
	fs := c.flags(env, &cm)
	pos, err := parseArgs(c, env, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usageError("serve takes no arguments (see 'plumbline serve --help')")
	}
	cfg, db, err := cm.open(ctx)
	if err != nil {
		return err
	}
	defer db.Close()
	d, err := jobs.NewDaemon(jobs.DaemonOptions{
		Config: cfg,
		DB:     db,
		Pack:   packFunc(cfg, db, env),
		Logger: env.Logger,
		Getenv: env.Getenv,
	})
	if err != nil {
		return err
	}
	return d.Run(ctx)
}

// packFunc is the pack job's work: build, store, render and queue for
// mail every portfolio's pack as of a date. A date already packed (by
// hand, say) gets a new revision with the reason below.
func packFunc(cfg *config.Config, db *store.DB, env *Env) jobs.PackFunc {
	return func(ctx context.Context, asOf time.Time) error {
		_, err := jobs.BuildPacks(ctx, db, cfg, jobs.PackOptions{
			AsOf: asOf, Render: true, Queue: true,
			Reason:  "scheduled pack of " + asOf.Format(time.DateOnly),
			Version: version(), Logger: env.Logger,
		})
		return err
	}
}
