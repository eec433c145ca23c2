package main

import (
	"context"
	"flag"
	"fmt"
	"text/tabwriter"
	"time"

	"plumbline/store"
)

func init() { register(&runsCmd{}) }

type runsCmd struct {
	common
	portfolio, from, to string
	current, json       bool
	fs                  *flag.FlagSet
}

func (c *runsCmd) Name() string     { return "runs" }
func (c *runsCmd) Synopsis() string { return "list stored pack runs" }

func (c *runsCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.portfolio, "portfolio", "", "only runs of portfolio `ID`")
		c.fs.StringVar(&c.from, "from", "", "only as-of dates on or after `DATE`")
		c.fs.StringVar(&c.to, "to", "", "only as-of dates on or before `DATE`")
		c.fs.BoolVar(&c.current, "current", false, "leave out superseded runs")
		c.fs.BoolVar(&c.json, "json", false, "print JSON")
	}
	return c.fs
}

func (c *runsCmd) Usage() string {
	return usageText("runs [--portfolio ID] [--from DATE] [--to DATE] [--current] [--json]", `
Lists the stored pack runs, oldest first per portfolio: run id, as-of date,
revision, when it was computed, which run it supersedes or is superseded by,
and the first characters of its input and config hashes. Superseded runs are
listed too, because the history is append-only; --current leaves them out.`, c.flags())
}

func (c *runsCmd) Run(ctx context.Context, env *Env, args []string) error {
	if _, err := parseArgs(c, env, c.flags(), args); err != nil {
		return err
	}
	from, err := parseDate("from", c.from)
	if err != nil {
		return err
	}
	to, err := parseDate("to", c.to)
	if err != nil {
		return err
	}
	_, db, err := c.open(ctx)
	if err != nil {
		return err
	}
	defer db.Close()
	runs, err := db.Runs(ctx, store.RunFilter{Portfolio: c.portfolio, From: from, To: to, CurrentOnly: c.current})
	if err != nil {
		return err
	}
	if c.json {
		if runs == nil {
			runs = []*store.Run{}
		}
		return writeJSON(env.Stdout, runs)
	}
	tw := tabwriter.NewWriter(env.Stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "RUN\tPORTFOLIO\tAS OF\tREV\tCREATED (UTC)\tSTATUS\tINPUTS\tCONFIG\tPDF")
	for _, r := range runs {
		status := "current"
		if r.SupersededBy != 0 {
			status = fmt.Sprintf("superseded by %d", r.SupersededBy)
		}
		pdf := "-"
		if r.PDFSHA256 != "" {
			pdf = r.PDFSHA256[:12]
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%d\t%s\t%s\t%s\t%s\t%s\n", r.ID, r.PortfolioID, r.AsOf.Format(time.DateOnly),
			r.Revision, r.CreatedAt.UTC().Format("2006-01-02 15:04:05"), status, r.InputHash[:12], r.ConfigHash[:12], pdf)
	}
	return tw.Flush()
}
