package main

import (
	"context"
	"flag"
	"fmt"
	"log/slog"
	"os"
	"path/filepath"

	"plumbline/jobs"
)

func init() { register(&demoCmd{}) }

type demoCmd struct {
	dir   string
	weeks int
	json  bool
	fs    *flag.FlagSet
}

func (c *demoCmd) Name() string     { return "demo" }
func (c *demoCmd) Synopsis() string { return "run the whole job end to end on a fictional firm" }

func (c *demoCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.fs.StringVar(&c.dir, "dir", "demo", "write everything under `DIR`")
		c.fs.IntVar(&c.weeks, "weeks", 30, "weekly runs per portfolio (at least 26)")
		c.fs.BoolVar(&c.json, "json", false, "print the outcome as JSON")
	}
	return c.fs
}

func (c *demoCmd) Usage() string {
	return usageText("demo [--dir DIR] [--weeks N]", `
Runs Plumbline end to end on an invented boutique manager: generates six years
of fictional end-of-day files (three portfolios, about fifty invented companies,
prices with a crash, dividends, splits, a yield curve, cash flows, weekly
holdings), ingests them through the same validation as real files, builds
weekly packs for each portfolio so drift and history have substance, renders
the latest PDFs, writes the mails it would send as .eml files, and verifies the
latest runs. Everything goes under DIR: inputs/, plumbline.db,
packs/ and outbox/. All names and figures are fictional.`, c.flags())
}

func (c *demoCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(), args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usageError("unexpected argument %q", pos[0])
	}
	dir, err := filepath.Abs(c.dir)
	if err != nil {
		return err
	}
	if _, err := os.Stat(filepath.Join(dir, "plumbline.db")); err == nil {
		return fmt.Errorf("%s already holds a demo database; remove the folder or pass --dir", dir)
	}
	// The demo reports its steps itself; the pipeline's logs are shown
	// only when asked for with PLUMBLINE_LOG.
	logger := env.Logger
	if env.Getenv == nil || env.Getenv("PLUMBLINE_LOG") == "" {
		logger = slog.New(slog.NewTextHandler(env.Stderr, &slog.HandlerOptions{Level: slog.LevelWarn}))
	}
	res, err := jobs.RunDemo(ctx, jobs.DemoOptions{Dir: dir, Weeks: c.weeks, Version: version(), Logger: logger,
		Progress: func(s string) { fmt.Fprintln(env.Stderr, "demo:", s) }})
	if err != nil {
		return err
	}
	if c.json {
		return writeJSON(env.Stdout, res)
	}
	w := env.Stdout
	fmt.Fprintf(w, "Fictional firm: %s (%s), data %s to %s\n", res.Summary.Firm, res.Summary.BaseCurrency,
		res.Summary.Start.Format("2006-01-02"), res.Summary.End.Format("2006-01-02"))
	fmt.Fprintf(w, "Database: %s (%d files ingested, %d runs stored)\n", res.Database, len(res.Ingested), res.Runs)
	fmt.Fprintln(w, "Latest packs:")
	for _, p := range res.Latest {
		status := "verified identical"
		if v := res.Checks[p.Portfolio]; v != nil && !v.Identical() {
			status = "VERIFY FOUND DIFFERENCES"
		}
		fmt.Fprintf(w, "  %-8s run %-4d %s  (%s)\n", p.Portfolio, p.RunID, p.PDF, status)
	}
	fmt.Fprintln(w, "Mail written (delivery = folder):")
	for _, m := range res.Mail {
		fmt.Fprintf(w, "  %s\n", m)
	}
	fmt.Fprintf(w, "\nNext, from the source folder:\n")
	fmt.Fprintf(w, "  go run ./cmd/plumbline runs --db %s\n", res.Database)
	fmt.Fprintf(w, "  go run ./cmd/plumbline history --db %s --metric duration_modified --portfolio %s\n", res.Database, res.Latest[0].Portfolio)
	fmt.Fprintf(w, "  go run ./cmd/plumbline verify --db %s %d\n", res.Database, res.Latest[0].RunID)
	fmt.Fprintln(w, "Figures are model estimates on invented data, not investment advice.")
	return nil
}
