package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"

	"golang.org/x/term"

	"plumbline/jobs"
	"plumbline/store"
)

func init() { register(&ingestCmd{}) }

// ingestCmd loads end-of-day input files into the database.
type ingestCmd struct {
	common
	quarantine string
	json       bool
	fs         *flag.FlagSet
}

func (c *ingestCmd) Name() string     { return "ingest" }
func (c *ingestCmd) Synopsis() string { return "validate and load input CSV files into the database" }

func (c *ingestCmd) flags(env *Env) *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
		c.common.register(c.fs)
		c.fs.StringVar(&c.quarantine, "quarantine", "", "move rejected files into `DIR`")
		c.fs.BoolVar(&c.json, "json", false, "print the results as JSON")
	}
	return c.fs
}

func (c *ingestCmd) Usage() string {
	return usageText("ingest [--config FILE] [--db PATH] [--quarantine DIR] [--json] PATH...", `
Validates end-of-day input files and loads them into the database. A PATH is a
CSV file or a folder, whose .csv files are taken in name order. The kind of
each file (portfolios, securities, assumptions, prices, yields, premiums,
holdings, flows) is recognised from its header line, and files are loaded in
that order, so a holdings file may name a security defined by a securities file
given in the same call. Each file is loaded whole or not at all: one bad row
rejects the file, and every error found (up to 50 per file) is listed with its
file, line and column. A file already loaded is reported as a duplicate and
skipped. A corrected holdings file for a date already loaded becomes a new
revision of that snapshot; the old one is kept. For every other kind, a row
that repeats a stored one is skipped and a row that contradicts one is an
error. Every file offered is recorded in the ingest ledger. Exit status: 0 when
every file was accepted or a duplicate, 3 when some file was rejected, 1 on any
other failure.`, c.flags(nil))
}

func (c *ingestCmd) Run(ctx context.Context, env *Env, args []string) error {
	paths, err := parseArgs(c, env, c.flags(env), args)
	if err != nil {
		return err
	}
	if len(paths) == 0 {
		return usageError("no files or folders to ingest (see 'plumbline ingest --help')")
	}
	cfg, db, err := c.open(ctx)
	if err != nil {
		return err
	}
	defer db.Close()

	opt := jobs.IngestOptions{QuarantineDir: c.quarantine}
	opt.BaseCurrency = cfg.BaseCurrency
	if isTerminal(env.Stderr) {
		opt.Progress = progressPrinter(env.Stderr)
	}
	results, ingestErr := jobs.Ingest(ctx, db, paths, opt)
	if c.json {
		if results == nil {
			results = []store.FileResult{}
		}
		if err := writeJSON(env.Stdout, results); err != nil {
			return err
		}
	} else if err := printIngest(env.Stdout, results); err != nil {
		return err
	}
	if ingestErr != nil {
		return ingestErr
	}
	rejected := 0
	for _, r := range results {
		if r.Outcome == store.Rejected {
			rejected++
		}
	}
	if rejected > 0 {
		return &exitError{code: exitRejected, err: fmt.Errorf("%d of %d files rejected", rejected, len(results))}
	}
	return nil
}

// printIngest writes one table row per file with its details indented
// below, then a count of outcomes.
func printIngest(w io.Writer, results []store.FileResult) error {
	if len(results) == 0 {
		_, err := fmt.Fprintln(w, "no CSV files found")
		return err
	}
	var tb bytes.Buffer
	tw := tabwriter.NewWriter(&tb, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "FILE\tKIND\tROWS\tOUTCOME\t")
	for _, r := range results {
		kind := string(r.Kind)
		if kind == "" {
			kind = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%d\t%s\t\n", r.Name, kind, r.Rows, r.Outcome)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	lines := strings.Split(strings.TrimSuffix(tb.String(), "\n"), "\n")
	var b strings.Builder
	b.WriteString(strings.TrimRight(lines[0], " ") + "\n")
	counts := map[store.Outcome]int{}
	for i, r := range results {
		counts[r.Outcome]++
		b.WriteString(strings.TrimRight(lines[i+1], " ") + "\n")
		for _, d := range details(r) {
			b.WriteString("    " + d + "\n")
		}
	}
	files := "files"
	if len(results) == 1 {
		files = "file"
	}
	fmt.Fprintf(&b, "%d %s: %d accepted, %d duplicate, %d rejected\n",
		len(results), files, counts[store.Accepted], counts[store.Duplicate], counts[store.Rejected])
	_, err := io.WriteString(w, b.String())
	return err
}

// details are the lines shown under a file's row.
func details(r store.FileResult) []string {
	var out []string
	switch r.Outcome {
	case store.Duplicate:
		if r.DuplicateOf == r.Name {
			out = append(out, "already ingested; nothing to do")
		} else {
			out = append(out, "same content as "+r.DuplicateOf+", already ingested; nothing to do")
		}
	case store.Accepted:
		// Holdings report unchanged snapshots below instead.
		if r.Unchanged > 0 && len(r.Snapshots) == 0 {
			out = append(out, fmt.Sprintf("%d rows already stored with the same values", r.Unchanged))
		}
		for _, s := range r.Snapshots {
			day := s.AsOf.Format("2006-01-02")
			switch {
			case s.Unchanged:
				out = append(out, fmt.Sprintf("%s %s: same as revision %d, unchanged", s.Portfolio, day, s.Revision))
			case s.Supersedes > 0:
				out = append(out, fmt.Sprintf("%s %s: revision %d supersedes revision %d", s.Portfolio, day, s.Revision, s.Supersedes))
			}
		}
	case store.Rejected:
		for i := range r.Errors {
			out = append(out, r.Errors[i].Error())
		}
		if r.ErrorsTruncated {
			out = append(out, fmt.Sprintf("checking stopped after %d errors", len(r.Errors)))
		}
		if r.Quarantined != "" {
			out = append(out, "moved to "+r.Quarantined)
		}
	}
	return out
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// progressPrinter shows one updating line per file on a terminal.
func progressPrinter(w io.Writer) func(store.Progress) {
	return func(p store.Progress) {
		kind := string(p.Kind)
		if kind == "" {
			kind = "?"
		}
		end := ""
		if p.Done {
			end = "\n"
		}
		fmt.Fprintf(w, "\r\033[Kingesting %s (%s) ... %d rows%s", p.Name, kind, p.Rows, end)
	}
}
