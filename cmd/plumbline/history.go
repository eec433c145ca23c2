package main

import (
	"context"
	"encoding/csv"
	"flag"
	"fmt"
	"strconv"
	"text/tabwriter"
	"time"

	"plumbline/store"
)

func init() { register(&historyCmd{}) }

type historyCmd struct {
	common
	metric, portfolio, from, to, format, scope, key string
	fs                                              *flag.FlagSet
}

func (c *historyCmd) Name() string     { return "history" }
func (c *historyCmd) Synopsis() string { return "print a metric's time series across runs" }

func (c *historyCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.metric, "metric", "", "metric `NAME`, e.g. duration_modified (required)")
		c.fs.StringVar(&c.portfolio, "portfolio", "", "only portfolio `ID`")
		c.fs.StringVar(&c.from, "from", "", "first as-of `DATE`")
		c.fs.StringVar(&c.to, "to", "", "last as-of `DATE`")
		c.fs.StringVar(&c.format, "format", "table", "output `FORMAT`: table, csv or json")
		c.fs.StringVar(&c.scope, "scope", "portfolio", "metric `SCOPE`: portfolio, sector, holding, scenario or limit")
		c.fs.StringVar(&c.key, "key", "", "sector, holding, scenario or limit `NAME` within the scope")
	}
	return c.fs
}

func (c *historyCmd) Usage() string {
	return usageText("history --metric NAME [--portfolio ID] [--from D] [--to D] [--format table|csv|json]", `
Prints one metric across the current (not superseded) runs, by portfolio and
as-of date, so drift can be followed week by week. Metric names are those of the
run_metrics table; an unknown name lists the names available at the scope.`, c.flags())
}

func (c *historyCmd) Run(ctx context.Context, env *Env, args []string) error {
	if _, err := parseArgs(c, env, c.flags(), args); err != nil {
		return err
	}
	if c.metric == "" {
		return usageError("--metric is required")
	}
	if c.format != "table" && c.format != "csv" && c.format != "json" {
		return usageError("--format %q: want table, csv or json", c.format)
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
	pts, err := db.MetricHistory(ctx, c.metric, c.scope, c.key, c.portfolio, from, to)
	if err != nil {
		return err
	}
	if len(pts) == 0 {
		names, _ := db.MetricNames(ctx, c.scope)
		known := false
		for _, n := range names {
			known = known || n == c.metric
		}
		if !known {
			return usageError("no metric %q at scope %s; known: %v", c.metric, c.scope, names)
		}
	}
	switch c.format {
	case "json":
		if pts == nil {
			pts = []store.MetricPoint{}
		}
		return writeJSON(env.Stdout, pts)
	case "csv":
		w := csv.NewWriter(env.Stdout)
		w.Write([]string{"portfolio_id", "as_of", "run_id", "scope", "key", "metric", "value"})
		for _, p := range pts {
			w.Write([]string{p.PortfolioID, p.AsOf.Format(time.DateOnly), strconv.FormatInt(p.RunID, 10), p.Scope, p.Key,
				c.metric, strconv.FormatFloat(p.Value, 'g', -1, 64)})
		}
		w.Flush()
		return w.Error()
	}
	tw := tabwriter.NewWriter(env.Stdout, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "PORTFOLIO\tAS OF\tRUN\tKEY\t%s\tCHANGE\t\n", c.metric)
	prev := map[string]float64{}
	for _, p := range pts {
		k := p.PortfolioID + "|" + p.Key
		change := ""
		if v, ok := prev[k]; ok {
			change = strconv.FormatFloat(p.Value-v, 'f', 6, 64)
		}
		prev[k] = p.Value
		key := p.Key
		if key == "" {
			key = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%d\t%s\t%s\t%s\t\n", p.PortfolioID, p.AsOf.Format(time.DateOnly), p.RunID, key,
			strconv.FormatFloat(p.Value, 'f', 6, 64), change)
	}
	return tw.Flush()
}
