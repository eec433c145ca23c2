package main

import (
	"context"
	"flag"
	"fmt"
	"text/tabwriter"

	"plumbline/store"
)

func init() { register(&sqlCmd{}) }

// sqlCmd runs one read-only query for audits.
type sqlCmd struct {
	common
	json    bool
	maxRows int
	fs      *flag.FlagSet
}

func (c *sqlCmd) Name() string     { return "sql" }
func (c *sqlCmd) Synopsis() string { return "run a read-only SQL query against the database" }

func (c *sqlCmd) flags(env *Env) *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.BoolVar(&c.json, "json", false, "print the result as JSON")
		c.fs.IntVar(&c.maxRows, "max-rows", 10000, "stop after `N` rows (0: no cap)")
	}
	return c.fs
}

func (c *sqlCmd) Usage() string {
	return usageText(`sql [--db PATH] [--json] "SELECT ..."`, `
Runs one SQL query against the Plumbline database for an audit or an ad-hoc
look, and prints the rows as a table (or JSON). The database is opened
read-only and query-only, and an authorizer refuses anything that could change
it or reach another file: INSERT, UPDATE, DELETE, CREATE, DROP, ATTACH, VACUUM,
transaction control and any PRAGMA that sets a value. Run metrics are in the
run_metrics table; runs, inputs and the ingest ledger are described in the
README.`, c.flags(nil))
}

func (c *sqlCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(env), args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return usageError("want exactly one query argument, got %d", len(pos))
	}
	cfg, err := c.load()
	if err != nil {
		return err
	}
	res, err := store.AuditQuery(ctx, cfg.Database, pos[0], c.maxRows)
	if err != nil {
		return err
	}
	if c.json {
		return writeJSON(env.Stdout, res)
	}
	tw := tabwriter.NewWriter(env.Stdout, 0, 4, 2, ' ', 0)
	for i, col := range res.Columns {
		if i > 0 {
			fmt.Fprint(tw, "\t")
		}
		fmt.Fprint(tw, col)
	}
	fmt.Fprintln(tw)
	for _, row := range res.Rows {
		for i, v := range row {
			if i > 0 {
				fmt.Fprint(tw, "\t")
			}
			if v == nil {
				fmt.Fprint(tw, "NULL")
			} else {
				fmt.Fprint(tw, v)
			}
		}
		fmt.Fprintln(tw)
	}
	return tw.Flush()
}
