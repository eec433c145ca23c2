package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"

	"plumbline/jobs"
	"plumbline/report"
	"plumbline/risk/pack"
)

func init() { register(&statsCmd{}) }

type statsCmd struct {
	common
	asOf       string
	portfolios listFlag
	security   string
	json       bool
	fs         *flag.FlagSet
}

func (c *statsCmd) Name() string { return "stats" }
func (c *statsCmd) Synopsis() string {
	return "print return, volatility, drawdown and VaR statistics without storing a run"
}

func (c *statsCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.asOf, "as-of", "", "as-of `DATE` (YYYY-MM-DD; default: the latest date with complete data, or for --security its last price)")
		c.fs.Var(&c.portfolios, "portfolio", "portfolio `ID` (repeatable; default: all)")
		c.fs.StringVar(&c.security, "security", "", "the statistics of security `ID` instead of a portfolio")
		c.fs.BoolVar(&c.json, "json", false, "print the statistics as JSON")
	}
	return c.fs
}

func (c *statsCmd) Usage() string {
	return usageText("stats [--as-of DATE] [--portfolio ID ...] [--security ID] [--json]", `
Prints the return and risk statistics a pack of the date would hold, computed
from the same inputs and configuration without storing anything: for each
portfolio the time-weighted returns (week, month, quarter and year to date,
since inception, annualised), volatility over each rolling window and EWMA
volatility, drawdowns, VaR and expected shortfall by method, the VaR backtest,
and tracking error and beta against the benchmark. With --security it prints
one security's total-return statistics from its prices instead: total and
latest returns (discrete and log), arithmetic and geometric mean returns,
volatility per window and drawdowns. Returns include dividends reinvested on
the ex-date; volatilities are annualised over 252 trading days.`, c.flags())
}

// statsDoc is the --json form for one portfolio: the parts of the results
// document that the table shows.
type statsDoc struct {
	Portfolio       pack.PortfolioInfo `json:"portfolio"`
	AsOf            string             `json:"as_of"`
	BaseCurrency    string             `json:"base_currency"`
	Value           float64            `json:"value"`
	Returns         pack.Returns       `json:"returns"`
	Volatility      []pack.WindowVol   `json:"volatility"`
	EWMAVolatility  *float64           `json:"ewma_volatility,omitempty"`
	EWMALambda      float64            `json:"ewma_lambda"`
	MaxDrawdown     *float64           `json:"max_drawdown,omitempty"`
	CurrentDrawdown *float64           `json:"current_drawdown,omitempty"`
	VaR             []pack.VaRFigure   `json:"var"`
	Backtest        *pack.Backtest     `json:"backtest,omitempty"`
	TrackingError   *float64           `json:"tracking_error,omitempty"`
	BenchmarkBeta   *float64           `json:"benchmark_beta,omitempty"`
}

func (c *statsCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(), args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usageError("unexpected argument %q", pos[0])
	}
	if c.security != "" && len(c.portfolios) > 0 {
		return usageError("--security and --portfolio exclude each other")
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
	if c.security != "" {
		st, err := jobs.SecurityStatsOf(ctx, db, cfg, c.security, asOf)
		if err != nil {
			return err
		}
		if c.json {
			return writeJSON(env.Stdout, st)
		}
		return printSecurityStats(env.Stdout, st, cfg.Risk.EWMALambda)
	}
	docs, err := jobs.Previews(ctx, db, cfg, c.portfolios, asOf)
	if len(docs) == 0 {
		return err
	}
	out := make([]statsDoc, len(docs))
	for i, d := range docs {
		s := d.Summary
		out[i] = statsDoc{Portfolio: d.Portfolio, AsOf: d.AsOf, BaseCurrency: d.BaseCurrency, Value: s.Value,
			Returns: s.Returns, Volatility: s.Volatility, EWMAVolatility: s.EWMAVolatility, EWMALambda: cfg.Risk.EWMALambda,
			MaxDrawdown: s.MaxDrawdown, CurrentDrawdown: s.CurrentDrawdown, VaR: d.VaR, Backtest: d.Backtest,
			TrackingError: s.TrackingError, BenchmarkBeta: s.BenchmarkBeta}
	}
	if c.json {
		if jerr := writeJSON(env.Stdout, out); jerr != nil {
			return jerr
		}
		return err
	}
	for i := range out {
		if i > 0 {
			fmt.Fprintln(env.Stdout)
		}
		if perr := printPortfolioStats(env.Stdout, &out[i]); perr != nil {
			return perr
		}
	}
	return err
}

func pctOpt(p *float64) string { return report.Opt(p, report.Pct) }

func printPortfolioStats(w io.Writer, d *statsDoc) error {
	fmt.Fprintf(w, "%s (%s), as of %s, %s; computed now, not stored\n", d.Portfolio.Name, d.Portfolio.ID, d.AsOf, d.BaseCurrency)
	fmt.Fprintf(w, "Value %s\n", report.Money(d.Value, d.BaseCurrency))

	r := d.Returns
	fmt.Fprintln(w, "\nTime-weighted returns")
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	row := func(k, v string) { fmt.Fprintf(tw, "  %s\t%s\n", k, v) }
	row("Week", pctOpt(r.Week))
	row("Month to date", pctOpt(r.MonthToDate))
	row("Quarter to date", pctOpt(r.QuarterToDate))
	row("Year to date", pctOpt(r.YearToDate))
	row("Since inception ("+r.InceptionDate+")", pctOpt(r.SinceInception))
	row("Since inception, annualised", pctOpt(r.SinceInceptionAnn))
	row("Benchmark, week", pctOpt(r.BenchmarkWeek))
	row("Benchmark, year to date", pctOpt(r.BenchmarkYearToDate))
	if err := tw.Flush(); err != nil {
		return err
	}

	fmt.Fprintln(w, "\nVolatility of daily returns (annualised)")
	tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "WINDOW\tDISCRETE\tLOG\tDAILY, AMOUNT\t")
	for _, v := range d.Volatility {
		fmt.Fprintf(tw, "%d days\t%s\t%s\t%s\t\n", v.WindowDays, pctOpt(v.Discrete), pctOpt(v.Log),
			report.Opt(v.Dollar, func(x float64) string { return report.Money(x, d.BaseCurrency) }))
	}
	fmt.Fprintf(tw, "EWMA, lambda %s\t%s\t\n", report.Num(d.EWMALambda, 2), pctOpt(d.EWMAVolatility))
	if err := tw.Flush(); err != nil {
		return err
	}

	fmt.Fprintln(w, "\nDrawdown")
	tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	row("Maximum", pctOpt(d.MaxDrawdown))
	row("Current", pctOpt(d.CurrentDrawdown))
	if err := tw.Flush(); err != nil {
		return err
	}

	if len(d.VaR) > 0 {
		fmt.Fprintln(w, "\nValue at risk and expected shortfall (losses)")
		tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "METHOD\tCONFIDENCE\tHORIZON\tVAR\tES\tVAR, AMOUNT\tES, AMOUNT\t")
		for _, v := range d.VaR {
			fmt.Fprintf(tw, "%s\t%s%%\t%d d\t%s\t%s\t%s\t%s\t\n", v.Method, report.Num(v.Confidence*100, 1), v.HorizonDays,
				report.Pct(v.VaR), report.Pct(v.ES), report.Money(v.VaRAmount, d.BaseCurrency), report.Money(v.ESAmount, d.BaseCurrency))
		}
		if err := tw.Flush(); err != nil {
			return err
		}
	}

	if b := d.Backtest; b != nil {
		fmt.Fprintf(w, "\nBacktest of the one-day %s%% VaR\n", report.Num(b.Confidence*100, 1))
		tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
		row("Days", fmt.Sprint(b.Days))
		row("Exceptions", fmt.Sprintf("%d (expected %s)", b.Exceptions, report.Num(b.Expected, 1)))
		row("Kupiec likelihood ratio", report.Num(b.KupiecLR, 3)+" (p-value "+report.Num(b.PValue, 3)+")")
		row("Zone", b.Zone)
		if err := tw.Flush(); err != nil {
			return err
		}
	}

	fmt.Fprintln(w, "\nAgainst the benchmark")
	tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	row("Tracking error (annualised)", pctOpt(d.TrackingError))
	row("Beta", report.Opt(d.BenchmarkBeta, func(x float64) string { return report.Num(x, 2) }))
	return tw.Flush()
}

func printSecurityStats(w io.Writer, s *jobs.SecurityStats, lambda float64) error {
	fmt.Fprintf(w, "%s (%s, %s), %s to %s: %d prices, %d daily total returns\n", s.SecurityID, s.Name, s.Sector,
		s.From, s.To, s.Prices, s.Returns)

	fmt.Fprintln(w, "\nTotal returns (dividends reinvested)")
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	row := func(k, v string) { fmt.Fprintf(tw, "  %s\t%s\n", k, v) }
	row("Whole period, discrete", report.Pct(s.TotalReturn))
	row("Whole period, log", report.Pct(s.TotalLogReturn))
	row("Last day, discrete", report.Pct(s.LastReturn))
	row("Last day, log", report.Pct(s.LastLogReturn))
	row("Mean daily, arithmetic", report.BP(s.MeanDaily))
	row("Mean daily, geometric", report.BP(s.MeanDailyGeometric))
	row("Mean annualised, arithmetic", report.Pct(s.MeanAnnualised))
	row("Mean annualised, geometric", report.Pct(s.MeanAnnualisedGeometric))
	if err := tw.Flush(); err != nil {
		return err
	}

	fmt.Fprintln(w, "\nVolatility of daily returns (annualised)")
	tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "WINDOW\tDISCRETE\tLOG\t")
	for i, v := range s.Volatility {
		label := fmt.Sprintf("%d days", v.WindowDays)
		if i == len(s.Volatility)-1 {
			label += ", whole period"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t\n", label, pctOpt(v.Discrete), pctOpt(v.Log))
	}
	fmt.Fprintf(tw, "EWMA, lambda %s\t%s\t\n", report.Num(lambda, 2), pctOpt(s.EWMAVolatility))
	if err := tw.Flush(); err != nil {
		return err
	}

	fmt.Fprintln(w, "\nDrawdown of the total-return index")
	tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	max := report.Pct(s.MaxDrawdown)
	if s.DrawdownPeak != "" {
		max += fmt.Sprintf(" (peak %s, trough %s, ", s.DrawdownPeak, s.DrawdownTrough)
		if s.DrawdownRecover != "" {
			max += "recovered " + s.DrawdownRecover + ")"
		} else {
			max += "not recovered)"
		}
	}
	row("Maximum", max)
	row("Current", report.Pct(s.CurrentDrawdown))
	return tw.Flush()
}
