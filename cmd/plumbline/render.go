package main

import (
	"context"
	"flag"
	"fmt"

	"plumbline/jobs"
)

func init() { register(&renderCmd{}) }

type renderCmd struct {
	common
	out string
	fs  *flag.FlagSet
}

func (c *renderCmd) Name() string     { return "render" }
func (c *renderCmd) Synopsis() string { return "re-render a stored run's PDF" }

func (c *renderCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.out, "out", "", "write the PDF to `FILE` (default: run<ID>.pdf)")
	}
	return c.fs
}

func (c *renderCmd) Usage() string {
	return usageText("render RUN [--out FILE]", `
Renders the PDF of a stored run again, from the run's stored results and stored
configuration only, and writes it to a file. The file is byte-identical to the
PDF stored with the run (when there is one), and the command says so; a run
stored without a PDF gets it attached now.`, c.flags())
}

func (c *renderCmd) Run(ctx context.Context, env *Env, args []string) error {
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
	pdf, pages, err := jobs.RenderRun(run)
	if err != nil {
		return err
	}
	out := c.out
	if out == "" {
		out = fmt.Sprintf("run%d.pdf", id)
	}
	if err := jobs.WriteFile(out, pdf, 0o644); err != nil {
		return err
	}
	sum := jobs.SHA256Hex(pdf)
	switch {
	case run.PDFSHA256 == "":
		if _, err := db.AttachPDF(ctx, id, pdf, pages); err != nil {
			return err
		}
		fmt.Fprintf(env.Stdout, "%s: %d pages, sha256 %s (stored with run %d)\n", out, pages, sum, id)
	case run.PDFSHA256 == sum:
		fmt.Fprintf(env.Stdout, "%s: %d pages, sha256 %s (identical to the stored PDF)\n", out, pages, sum)
	default:
		return &exitError{code: exitRejected, err: fmt.Errorf("%s: sha256 %s differs from the stored PDF's %s", out, sum, run.PDFSHA256)}
	}
	return nil
}
