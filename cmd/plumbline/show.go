package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"text/tabwriter"
	"time"

	"plumbline/report"
	"plumbline/risk/pack"
	"plumbline/store"
)

func init() { register(&showCmd{}) }

type showCmd struct {
	common
	json bool
	fs   *flag.FlagSet
}

func (c *showCmd) Name() string     { return "show" }
func (c *showCmd) Synopsis() string { return "print one stored run" }

func (c *showCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.BoolVar(&c.json, "json", false, "print the run record and its full results document as JSON")
	}
	return c.fs
}

func (c *showCmd) Usage() string {
	return usageText("show RUN [--json]", `
Prints one stored run as the committee saw it: the run record (portfolio, as-of
date, revision, hashes, program version) and its headline figures, sensitivities,
limit statuses, drift flags, exclusions and data-quality findings. Everything
comes from the stored results document; nothing is recomputed. With --json the
full results document is printed.`, c.flags())
}

func (c *showCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(), args)
	if err != nil {
		return err
	}
	id, err := oneRunID(pos)
	if err != nil {
		return err
	}
	_, db, err := c.open(ctx)
	if err != nil {
		return err
	}
	defer db.Close()
	run, err := db.GetRun(ctx, id)
	if err != nil {
		return err
	}
	var doc pack.Document
	if err := json.Unmarshal(run.ResultsJSON, &doc); err != nil {
		return fmt.Errorf("run %d: results: %w", id, err)
	}
	if c.json {
		return writeJSON(env.Stdout, struct {
			Run     *store.Run     `json:"run"`
			Results *pack.Document `json:"results"`
		}{run, &doc})
	}
	return printRun(env, run, &doc)
}

func printRun(env *Env, run *store.Run, doc *pack.Document) error {
	w := env.Stdout
	ccy := doc.BaseCurrency
	fmt.Fprintf(w, "Run %d: %s (%s), as of %s, revision %d\n", run.ID, doc.Portfolio.Name, run.PortfolioID,
		run.AsOf.Format(time.DateOnly), run.Revision)
	if run.Supersedes != 0 {
		fmt.Fprintf(w, "Supersedes run %d: %s\n", run.Supersedes, run.Reason)
	}
	if run.SupersededBy != 0 {
		fmt.Fprintf(w, "Superseded by run %d\n", run.SupersededBy)
	}
	fmt.Fprintf(w, "Computed %s by plumbline %s\n", run.CreatedAt.UTC().Format(time.RFC3339), run.ProgramVersion)
	fmt.Fprintf(w, "Input hash  %s\nConfig hash %s\n", run.InputHash, run.ConfigHash)
	if run.PDFSHA256 != "" {
		fmt.Fprintf(w, "PDF sha256  %s\n", run.PDFSHA256)
	}
	s := doc.Summary
	fmt.Fprintln(w, "\nHeadline")
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	row := func(k, v string) { fmt.Fprintf(tw, "  %s\t%s\n", k, v) }
	row("Market value", report.Money(s.Value, ccy))
	row("Cash", report.Money(s.Cash, ccy))
	row("Holdings", fmt.Sprint(s.HoldingCount))
	row("Return, week", report.Opt(s.Returns.Week, report.Pct))
	row("Return, month to date", report.Opt(s.Returns.MonthToDate, report.Pct))
	row("Return, quarter to date", report.Opt(s.Returns.QuarterToDate, report.Pct))
	row("Return, year to date", report.Opt(s.Returns.YearToDate, report.Pct))
	row("Return, since inception", report.Opt(s.Returns.SinceInception, report.Pct))
	for _, v := range s.Volatility {
		row(fmt.Sprintf("Volatility %dd (ann.)", v.WindowDays), report.Opt(v.Discrete, report.Pct))
	}
	// The historical one-day figures pack computes, in its order.
	for _, c := range []float64{0.95, 0.975, 0.99} {
		if v := pack.FindVaR(doc, "historical", c, 1); v != nil {
			row(fmt.Sprintf("VaR %g%% 1d (historical)", v.Confidence*100), report.Pct(v.VaR)+"  "+report.Money(v.VaRAmount, ccy))
			row(fmt.Sprintf("ES %g%% 1d (historical)", v.Confidence*100), report.Pct(v.ES)+"  "+report.Money(v.ESAmount, ccy))
		}
	}
	row("Modified duration (model)", report.Opt(s.ModifiedDuration, report.Years))
	if s.Empirical != nil {
		row("Empirical duration", report.Years(s.Empirical.Value))
	} else {
		row("Empirical duration", "n/a")
	}
	row("Convexity", report.Opt(s.Convexity, report.Convexity))
	row("Growth duration", report.Opt(s.GrowthDuration, report.Years))
	row("Beta", report.Opt(s.Beta, func(x float64) string { return report.Num(x, 2) }))
	tw.Flush()
	if len(doc.Limits) > 0 {
		fmt.Fprintln(w, "\nLimits")
		tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
		for _, l := range doc.Limits {
			fmt.Fprintf(tw, "  %s\t%s\t%s\theadroom %s\n", l.Name, l.Status,
				report.Opt(l.Value, func(x float64) string { return report.Num(x, 4) }),
				report.Opt(l.Headroom, func(x float64) string { return report.Num(x, 4) }))
		}
		tw.Flush()
	}
	var flagged []pack.DriftItem
	for _, d := range doc.Drift {
		if d.Flagged {
			flagged = append(flagged, d)
		}
	}
	if len(flagged) > 0 {
		fmt.Fprintln(w, "\nDrift flagged")
		for _, d := range flagged {
			fmt.Fprintf(w, "  %s: %s -> %s (z %s)\n", d.Metric, report.Opt(d.Previous, func(x float64) string { return report.Num(x, 4) }),
				report.Num(d.Value, 4), report.Opt(d.Z, func(x float64) string { return report.Num(x, 2) }))
		}
	}
	if len(doc.Excluded) > 0 {
		fmt.Fprintln(w, "\nExcluded holdings")
		for _, e := range doc.Excluded {
			fmt.Fprintf(w, "  %s (%s of value): %s\n", e.ID, report.Pct(e.ValueShare), e.Reason)
		}
	}
	if len(doc.DataQuality) > 0 {
		fmt.Fprintln(w, "\nData quality")
		for _, f := range doc.DataQuality {
			if f.ID != "" {
				fmt.Fprintf(w, "  %s %s: %s\n", f.Kind, f.ID, f.Detail)
			} else {
				fmt.Fprintf(w, "  %s: %s\n", f.Kind, f.Detail)
			}
		}
	}
	return nil
}
