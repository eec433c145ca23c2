package main

import (
	"context"
	"flag"
	"fmt"

	"plumbline/jobs"
)

func init() { register(&exportCmd{}) }

type exportCmd struct {
	common
	json bool
	fs   *flag.FlagSet
}

func (c *exportCmd) Name() string     { return "export" }
func (c *exportCmd) Synopsis() string { return "write a run's inputs, results and PDF into a folder" }

func (c *exportCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.BoolVar(&c.json, "json", false, "print the list of files as JSON")
	}
	return c.fs
}

func (c *exportCmd) Usage() string {
	return usageText("export RUN DIR", `
Writes what an auditor needs to examine a run into DIR: the inputs the run used
as CSV files in the ingest formats (portfolios, securities, assumptions, prices,
yields, premiums, holdings, flows), the results document (results.json), the
stored configuration (config.json), the PDF when the run has one, and
MANIFEST.sha256 with the sha256 of every file (check with 'sha256sum -c').`, c.flags())
}

func (c *exportCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(), args)
	if err != nil {
		return err
	}
	if len(pos) != 2 {
		return usageError("want a run id and a folder")
	}
	id, err := parseRunID(pos[0])
	if err != nil {
		return err
	}
	_, db, err := c.open(ctx)
	if err != nil {
		return err
	}
	defer db.Close()
	res, err := jobs.Export(ctx, db, id, pos[1])
	if err != nil {
		return err
	}
	if c.json {
		return writeJSON(env.Stdout, res)
	}
	for _, f := range res.Files {
		fmt.Fprintf(env.Stdout, "%s/%s\n", res.Dir, f)
	}
	return nil
}
