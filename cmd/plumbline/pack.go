package main

import (
	"context"
	"flag"
	"fmt"
	"text/tabwriter"

	"plumbline/jobs"
)

func init() { register(&packCmd{}) }

type packCmd struct {
	common
	asOf       string
	portfolios listFlag
	reason     string
	out        string
	noPDF      bool
	queue      bool
	json       bool
	fs         *flag.FlagSet
}

func (c *packCmd) Name() string     { return "pack" }
func (c *packCmd) Synopsis() string { return "compute, store and render each portfolio's risk pack" }

func (c *packCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.asOf, "as-of", "", "pack `DATE` (YYYY-MM-DD; default: the latest date with complete data)")
		c.fs.Var(&c.portfolios, "portfolio", "portfolio `ID` (repeatable; default: all)")
		c.fs.StringVar(&c.reason, "reason", "", "why a date is packed again (required to supersede an earlier run)")
		c.fs.StringVar(&c.out, "out", "", "also write the PDFs into `DIR` (default: the config's report.output_dir)")
		c.fs.BoolVar(&c.noPDF, "no-pdf", false, "store the runs without rendering PDFs")
		c.fs.BoolVar(&c.queue, "mail", false, "queue each pack for the portfolio's recipients (sent by 'serve' or 'deliver')")
		c.fs.BoolVar(&c.json, "json", false, "print the results documents as JSON")
	}
	return c.fs
}

func (c *packCmd) Usage() string {
	return usageText("pack [--as-of DATE] [--portfolio ID ...] [flags]", `
Builds the risk pack of each portfolio on one as-of date: gathers the holdings,
the valuation assumptions in effect, prices and market data up to that date;
computes sensitivities, returns, volatility, VaR, stress tests, limits and drift;
and stores the run (results, metrics, input and config hashes, PDF) in one
transaction per portfolio. Runs are append-only: packing a date again needs
--reason and creates a revision that supersedes the earlier run; both remain.`, c.flags())
}

func (c *packCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(), args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usageError("unexpected argument %q", pos[0])
	}
	asOf, err := parseDate("as-of", c.asOf)
	if err != nil {
		return err
	}
	cfg, db, err := c.open(ctx)
	if err != nil {
		return err
	}
	defer db.Close()
	out := c.out
	if out == "" && !c.noPDF {
		out = cfg.Report.OutputDir
	}
	opt := jobs.PackOptions{AsOf: asOf, Portfolios: c.portfolios, Reason: c.reason, Render: !c.noPDF,
		OutDir: out, Queue: c.queue, Version: version(), Logger: env.Logger}
	if isTerminal(env.Stderr) {
		opt.Progress = func(done, total int, id string) {
			fmt.Fprintf(env.Stderr, "\rpacked %d/%d (%s)   ", done, total, id)
			if done == total {
				fmt.Fprintln(env.Stderr)
			}
		}
	}
	res, err := jobs.BuildPacks(ctx, db, cfg, opt)
	if c.json {
		docs := make([]any, len(res))
		for i := range res {
			docs[i] = res[i].Document
		}
		if jerr := writeJSON(env.Stdout, docs); jerr != nil {
			return jerr
		}
		return err
	}
	tw := tabwriter.NewWriter(env.Stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "PORTFOLIO\tAS OF\tRUN\tREVISION\tPDF")
	for _, r := range res {
		pdf := r.PDF
		if pdf == "" {
			pdf = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%d\t%d\t%s\n", r.Portfolio, r.AsOf, r.RunID, r.Revision, pdf)
	}
	if ferr := tw.Flush(); ferr != nil {
		return ferr
	}
	return err
}
