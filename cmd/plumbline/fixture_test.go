package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"plumbline/jobs"
	"plumbline/jobs/demo"
	"plumbline/store"
)

// The audit commands' tests share one database built once: the fictional
// three-year scenario, ingested, with three weekly runs per portfolio
// (stored without PDFs to keep it quick, except the first portfolio's
// latest run, rendered so show prints a PDF hash and verify checks it),
// then a corrected holdings file for the second portfolio's middle week
// and a re-run of that week with a reason, superseding the first. The clock,
// the program version and the stored configuration (relative paths) are
// fixed, so every command prints the same bytes on every machine.

// fixture describes the shared database.
type fixture struct {
	dir        string // temporary folder, removed by TestMain
	db         string // database path
	portfolios []string
	weeks      []time.Time // the three as-of dates, oldest first
	rendered   int64       // first portfolio's latest run, with a PDF
	superseded int64       // second portfolio's middle run
	rerun      int64       // the run superseding it, after the correction
	corrected  string      // security whose quantity the correction changed
	pdfSHA256  string      // hex sha256 of the rendered run's stored PDF bytes
}

// rerunReason is the reason recorded with the superseding run.
const rerunReason = "holdings file re-sent by the custodian"

var (
	fixtureOnce sync.Once
	shared      fixture
	fixtureErr  error
)

func TestMain(m *testing.M) {
	code := m.Run()
	if shared.dir != "" {
		os.RemoveAll(shared.dir)
	}
	os.Exit(code)
}

// sharedFixture builds the database on first use; tests must not change
// it (copyFixture gives a private copy).
func sharedFixture(t *testing.T) *fixture {
	t.Helper()
	fixtureOnce.Do(func() { fixtureErr = buildFixture(&shared) })
	if fixtureErr != nil {
		t.Fatalf("fixture: %v", fixtureErr)
	}
	return &shared
}

func buildFixture(f *fixture) error {
	ctx := context.Background()
	dir, err := os.MkdirTemp("", "plumbline-cmd-test-")
	if err != nil {
		return err
	}
	f.dir = dir
	inputs := filepath.Join(dir, "inputs")
	sum, err := demo.Generate(inputs, demo.Options{Years: 3})
	if err != nil {
		return err
	}
	for _, p := range sum.Portfolios {
		f.portfolios = append(f.portfolios, p.ID)
	}
	if len(f.portfolios) < 2 {
		return fmt.Errorf("scenario has %d portfolios, the fixture needs 2", len(f.portfolios))
	}
	// A relative folder: the stored configuration, and so its hash, must
	// not depend on the temporary folder.
	cfg := jobs.DemoConfig("fixture", sum.Firm, f.portfolios)
	f.db = filepath.Join(dir, "plumbline.db")
	db, err := store.Open(ctx, f.db)
	if err != nil {
		return err
	}
	defer db.Close()
	res, err := jobs.Ingest(ctx, db, []string{inputs, filepath.Join(inputs, "holdings")},
		jobs.IngestOptions{IngestOptions: store.IngestOptions{BaseCurrency: cfg.BaseCurrency}})
	if err != nil {
		return err
	}
	for _, r := range res {
		if r.Outcome == store.Rejected {
			return fmt.Errorf("demo file %s rejected: %v", r.Name, r.Errors)
		}
	}
	latest, err := jobs.LatestCompleteDate(ctx, db)
	if err != nil {
		return err
	}
	pack := func(asOf time.Time, ports []string, render bool, reason string, at time.Time) ([]jobs.PackResult, error) {
		return jobs.BuildPacks(ctx, db, cfg, jobs.PackOptions{AsOf: asOf, Portfolios: ports, Render: render,
			Reason: reason, Version: "test", Now: func() time.Time { return at }})
	}
	evening := 21 * time.Hour // runs are made on the evening of their date, UTC
	for w := 2; w >= 0; w-- {
		asOf := latest.AddDate(0, 0, -7*w)
		f.weeks = append(f.weeks, asOf)
		if w > 0 {
			if _, err := pack(asOf, nil, false, "", asOf.Add(evening)); err != nil {
				return err
			}
			continue
		}
		out, err := pack(asOf, f.portfolios[:1], true, "", asOf.Add(evening))
		if err != nil {
			return err
		}
		f.rendered = out[0].RunID
		if _, err := pack(asOf, f.portfolios[1:], false, "", asOf.Add(evening)); err != nil {
			return err
		}
	}
	prior, err := db.Runs(ctx, store.RunFilter{Portfolio: f.portfolios[1], From: f.weeks[1], To: f.weeks[1]})
	if err != nil || len(prior) != 1 {
		return fmt.Errorf("runs of %s on %s: %v %v", f.portfolios[1], f.weeks[1], prior, err)
	}
	f.superseded = prior[0].ID
	fix, err := correctHoldings(f, inputs, f.portfolios[1], f.weeks[1])
	if err != nil {
		return err
	}
	res, err = jobs.Ingest(ctx, db, []string{fix}, jobs.IngestOptions{})
	if err != nil {
		return err
	}
	if len(res) != 1 || len(res[0].Snapshots) != 1 || res[0].Snapshots[0].Revision != 2 {
		return fmt.Errorf("correction not stored as revision 2: %+v", res)
	}
	out, err := pack(f.weeks[1], f.portfolios[1:2], false, rerunReason, latest.Add(evening+30*time.Minute))
	if err != nil {
		return err
	}
	f.rerun = out[0].RunID
	pdf, err := db.RunPDF(ctx, f.rendered, "")
	if err != nil {
		return err
	}
	// A PDF file begins with "%PDF-" (ISO 32000-1, 7.5.2).
	if !strings.HasPrefix(string(pdf), "%PDF-") {
		return fmt.Errorf("run %d: stored PDF starts %q", f.rendered, pdf[:min(len(pdf), 8)])
	}
	digest := sha256.Sum256(pdf)
	f.pdfSHA256 = hex.EncodeToString(digest[:])
	return nil
}

// pdfHashShown is what goldens hold in place of the rendered run's PDF
// hash: the PDF's bytes change with every change of the report's layout,
// which is not what these goldens are about.
const pdfHashShown = "<sha256 of the stored PDF>"

// maskPDFHash checks that out shows the sha256 of the rendered run's
// stored PDF (in full, or its first 12 digits in a table) and replaces it
// with pdfHashShown.
func maskPDFHash(t *testing.T, f *fixture, out string) string {
	t.Helper()
	if !strings.Contains(out, f.pdfSHA256[:12]) {
		t.Errorf("output lacks the PDF hash %s:\n%s", f.pdfSHA256, out)
	}
	return strings.ReplaceAll(strings.ReplaceAll(out, f.pdfSHA256, pdfHashShown), f.pdfSHA256[:12], pdfHashShown)
}

// correctHoldings writes a corrected holdings file of portfolio pf on day:
// the demo's snapshot with the first security's quantity doubled.
func correctHoldings(f *fixture, inputs, pf string, day time.Time) (string, error) {
	b, err := os.ReadFile(filepath.Join(inputs, "holdings", "holdings-"+isoDate(day)+".csv"))
	if err != nil {
		return "", err
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	out := []string{lines[0]}
	for _, l := range lines[1:] {
		c := strings.Split(l, ",")
		if c[1] != pf {
			continue
		}
		if f.corrected == "" && c[2] != "CASH" {
			q, err := strconv.ParseFloat(c[3], 64)
			if err != nil {
				return "", err
			}
			f.corrected, c[3] = c[2], strconv.FormatFloat(2*q, 'f', -1, 64)
		}
		out = append(out, strings.Join(c, ","))
	}
	if f.corrected == "" {
		return "", fmt.Errorf("no security of %s on %s", pf, isoDate(day))
	}
	path := filepath.Join(f.dir, "corrections", "holdings-"+isoDate(day)+"-corrected.csv")
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return "", err
	}
	return path, os.WriteFile(path, []byte(strings.Join(out, "\n")+"\n"), 0o644)
}

// copyFixture copies the shared database into a test's own folder, for
// tests that change it.
func copyFixture(t *testing.T) string {
	t.Helper()
	f := sharedFixture(t)
	to := filepath.Join(t.TempDir(), "plumbline.db")
	for _, suffix := range []string{"", "-wal"} {
		in, err := os.Open(f.db + suffix)
		if os.IsNotExist(err) && suffix != "" {
			continue
		}
		if err != nil {
			t.Fatal(err)
		}
		out, err := os.Create(to + suffix)
		if err != nil {
			in.Close()
			t.Fatal(err)
		}
		_, err = io.Copy(out, in)
		in.Close()
		if cerr := out.Close(); err == nil {
			err = cerr
		}
		if err != nil {
			t.Fatal(err)
		}
	}
	return to
}

func runArg(n int64) string { return strconv.FormatInt(n, 10) }

func isoDate(t time.Time) string { return t.Format(time.DateOnly) }
