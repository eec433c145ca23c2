package main

import (
	"context"
	"flag"
	"fmt"

	"plumbline/jobs"
)

func init() { register(&verifyCmd{}) }

type verifyCmd struct {
	common
	json bool
	fs   *flag.FlagSet
}

func (c *verifyCmd) Name() string     { return "verify" }
func (c *verifyCmd) Synopsis() string { return "recompute a stored run and report any difference" }

func (c *verifyCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.BoolVar(&c.json, "json", false, "print JSON")
	}
	return c.fs
}

func (c *verifyCmd) Usage() string {
	return usageText("verify RUN [--json]", `
Recomputes a stored run from its inputs as they stood when it was made (every
row ingested up to the run's ledger mark) with the configuration stored with
the run, and compares the input hash, every stored
metric, the full results document and the PDF (re-rendered) with what was
stored. Prints "identical" or each metric that differs. Exit code 0 when
identical, 3 when anything differs, 1 when the recomputation itself failed.`, c.flags())
}

func (c *verifyCmd) Run(ctx context.Context, env *Env, args []string) error {
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
	v, err := jobs.Verify(ctx, db, id)
	if err != nil {
		return err
	}
	if c.json {
		if err := writeJSON(env.Stdout, v); err != nil {
			return err
		}
	} else {
		w := env.Stdout
		fmt.Fprintf(w, "run %d (%s, as of %s)\n", v.RunID, v.Portfolio, v.AsOf)
		if v.InputsMatch {
			fmt.Fprintf(w, "inputs:  identical (%s)\n", v.InputHash)
		} else {
			fmt.Fprintf(w, "inputs:  DIFFER (stored %s, now %s)\n", v.StoredInputHash, v.InputHash)
		}
		if len(v.Differences) == 0 {
			fmt.Fprintf(w, "metrics: identical (%d compared)\n", v.Metrics)
		} else {
			fmt.Fprintf(w, "metrics: %d of %d DIFFER\n", len(v.Differences), v.Metrics)
			for _, d := range v.Differences {
				f := func(p *float64) string {
					if p == nil {
						return "absent"
					}
					return fmt.Sprintf("%.10g", *p)
				}
				key := d.Key
				if key == "" {
					key = "-"
				}
				fmt.Fprintf(w, "  %s %s %s: stored %s, recomputed %s\n", d.Scope, key, d.Metric, f(d.Stored), f(d.Recomputed))
			}
		}
		if v.ResultsMatch {
			fmt.Fprintln(w, "results: identical")
		} else {
			fmt.Fprintln(w, "results: DIFFER")
		}
		if v.PDFMatch != nil {
			if *v.PDFMatch {
				fmt.Fprintln(w, "pdf:     identical")
			} else {
				fmt.Fprintln(w, "pdf:     DIFFERS")
			}
		}
		if v.Identical() {
			fmt.Fprintln(w, "identical")
		}
	}
	if !v.Identical() {
		return &exitError{code: exitRejected}
	}
	return nil
}
