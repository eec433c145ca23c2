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

func init() { register(&sensitivityCmd{}) }

type sensitivityCmd struct {
	common
	asOf       string
	portfolios listFlag
	holding    string
	json       bool
	fs         *flag.FlagSet
}

func (c *sensitivityCmd) Name() string { return "sensitivity" }
func (c *sensitivityCmd) Synopsis() string {
	return "print each holding's durations, convexity and beta without storing a run"
}

func (c *sensitivityCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.asOf, "as-of", "", "as-of `DATE` (YYYY-MM-DD; default: the latest date with complete data)")
		c.fs.Var(&c.portfolios, "portfolio", "portfolio `ID` (repeatable; default: all)")
		c.fs.StringVar(&c.holding, "holding", "", "only the security `ID`")
		c.fs.BoolVar(&c.json, "json", false, "print the sensitivity parts of the results as JSON")
	}
	return c.fs
}

func (c *sensitivityCmd) Usage() string {
	return usageText("sensitivity [--as-of DATE] [--portfolio ID ...] [--holding ID] [--json]", `
Computes the figures a pack of the date would hold, from the same inputs and
configuration, and prints the rate and growth sensitivities without storing
anything: for each holding the valuation model, discount rate k and long-run
growth g, modified and Macaulay duration, convexity, growth duration, beta and
where it came from, weight, contribution to the portfolio's duration and the
empirical duration; then the cash line, the portfolio, the sectors' contributions
and the holdings left out of the model figures with the reason. Use it to check
figures before the PDF exists. --holding prints one security only.`, c.flags())
}

// sensitivityDoc is the --json form: the parts of the results document
// that the table shows, for one portfolio.
type sensitivityDoc struct {
	Portfolio    pack.PortfolioInfo `json:"portfolio"`
	AsOf         string             `json:"as_of"`
	BaseCurrency string             `json:"base_currency"`
	Summary      sensitivitySummary `json:"summary"`
	CashWeight   float64            `json:"cash_weight"`
	Holdings     []pack.Holding     `json:"holdings"`
	Sectors      []pack.Sector      `json:"sectors,omitempty"`
	Excluded     []pack.Exclusion   `json:"excluded"`
}

// sensitivitySummary is the portfolio line, with the document's field
// names and units.
type sensitivitySummary struct {
	ModifiedDuration  *float64         `json:"modified_duration,omitempty"`
	MacaulayDuration  *float64         `json:"macaulay_duration,omitempty"`
	Convexity         *float64         `json:"convexity,omitempty"`
	DollarDuration01  *float64         `json:"dollar_duration_01,omitempty"`
	GrowthDuration    *float64         `json:"growth_duration,omitempty"`
	GrowthConvexity   *float64         `json:"growth_convexity,omitempty"`
	Beta              *float64         `json:"beta,omitempty"`
	LevelDuration     *float64         `json:"level_duration,omitempty"`
	SlopeDuration     *float64         `json:"slope_duration,omitempty"`
	CurvatureDuration *float64         `json:"curvature_duration,omitempty"`
	Empirical         *pack.Regression `json:"empirical_duration,omitempty"`
}

func (c *sensitivityCmd) Run(ctx context.Context, env *Env, args []string) error {
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
	docs, err := jobs.Previews(ctx, db, cfg, c.portfolios, asOf)
	if len(docs) == 0 {
		return err
	}
	out := make([]sensitivityDoc, 0, len(docs))
	for _, d := range docs {
		sd, ok := sensitivityParts(d, c.holding)
		if ok {
			out = append(out, sd)
		}
	}
	if c.holding != "" && len(out) == 0 {
		return fmt.Errorf("no portfolio holds %s on %s", c.holding, docs[0].AsOf)
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
		if perr := printSensitivity(env.Stdout, &out[i], c.holding == ""); perr != nil {
			return perr
		}
	}
	return err
}

// sensitivityParts cuts the document down to the sensitivity figures, and
// to one holding when holding is set (false when it is not held).
func sensitivityParts(d *pack.Document, holding string) (sensitivityDoc, bool) {
	s := d.Summary
	sd := sensitivityDoc{
		Portfolio: d.Portfolio, AsOf: d.AsOf, BaseCurrency: d.BaseCurrency,
		Summary: sensitivitySummary{
			ModifiedDuration: s.ModifiedDuration, MacaulayDuration: s.MacaulayDuration, Convexity: s.Convexity,
			DollarDuration01: s.DollarDuration01, GrowthDuration: s.GrowthDuration, GrowthConvexity: s.GrowthConvexity,
			Beta: s.Beta, LevelDuration: s.LevelDuration, SlopeDuration: s.SlopeDuration,
			CurvatureDuration: s.CurvatureDuration, Empirical: s.Empirical,
		},
		CashWeight: d.Concentration.CashWeight,
		Holdings:   d.Holdings,
		Sectors:    d.Sectors,
		Excluded:   d.Excluded,
	}
	if sd.Excluded == nil {
		sd.Excluded = []pack.Exclusion{}
	}
	if holding == "" {
		return sd, true
	}
	sd.Holdings, sd.Sectors, sd.Excluded = nil, nil, []pack.Exclusion{}
	for _, h := range d.Holdings {
		if h.ID == holding {
			sd.Holdings = append(sd.Holdings, h)
		}
	}
	for _, e := range d.Excluded {
		if e.ID == holding {
			sd.Excluded = append(sd.Excluded, e)
		}
	}
	return sd, len(sd.Holdings) > 0
}

func printSensitivity(w io.Writer, d *sensitivityDoc, whole bool) error {
	fmt.Fprintf(w, "%s (%s), as of %s, %s; computed now, not stored\n\n", d.Portfolio.Name, d.Portfolio.ID, d.AsOf, d.BaseCurrency)
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "HOLDING\tMODEL\tK\tG\tMODIFIED\tMACAULAY\tCONVEXITY\tGROWTH DUR.\tBETA\tBETA FROM\tWEIGHT\tCONTRIB.\tEMPIRICAL\t")
	years := func(p *float64) string { return report.Opt(p, report.Years) }
	rate := func(p *float64) string {
		return report.Opt(p, func(x float64) string { return report.Num(x*100, 3) + "%" })
	}
	beta := func(p *float64) string { return report.Opt(p, func(x float64) string { return report.Num(x, 2) }) }
	empirical := func(r *pack.Regression) string {
		if r == nil {
			return report.NA
		}
		return report.Years(r.Value)
	}
	dash := func(s string) string {
		if s == "" {
			return "-"
		}
		return s
	}
	for _, h := range d.Holdings {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t\n", h.ID, dash(h.Model),
			rate(h.K), rate(h.G), years(h.ModDuration), years(h.MacDuration), report.Opt(h.Convexity, report.Convexity),
			years(h.GrowthDur), beta(h.Beta), dash(h.BetaSource), report.Pct(h.Weight), years(h.ContribDuration),
			empirical(h.Empirical))
	}
	if whole {
		// Cash is held at zero duration, convexity and growth duration.
		z := report.Years(0)
		fmt.Fprintf(tw, "CASH\t-\t-\t-\t%s\t%s\t%s\t%s\t-\t-\t%s\t%s\t-\t\n", z, z, report.Convexity(0), z,
			report.Pct(d.CashWeight), z)
		s := d.Summary
		fmt.Fprintf(tw, "PORTFOLIO\t-\t-\t-\t%s\t%s\t%s\t%s\t%s\t-\t%s\t%s\t%s\t\n",
			years(s.ModifiedDuration), years(s.MacaulayDuration), report.Opt(s.Convexity, report.Convexity),
			years(s.GrowthDuration), beta(s.Beta), report.Pct(1), years(s.ModifiedDuration), empirical(s.Empirical))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if whole && len(d.Sectors) > 0 {
		fmt.Fprintln(w, "\nSectors")
		tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "SECTOR\tWEIGHT\tVALUE\tCONTRIB. DURATION\tCONTRIB. GROWTH DUR.\t")
		for _, s := range d.Sectors {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t\n", s.Name, report.Pct(s.Weight), report.Money(s.Value, d.BaseCurrency),
				years(s.ContribDuration), years(s.ContribGrowthDuration))
		}
		if err := tw.Flush(); err != nil {
			return err
		}
	}
	if len(d.Excluded) > 0 {
		fmt.Fprintln(w, "\nLeft out of the model figures")
		for _, e := range d.Excluded {
			fmt.Fprintf(w, "  %s (%s of value): %s\n", e.ID, report.Pct(e.ValueShare), e.Reason)
		}
	}
	return nil
}
