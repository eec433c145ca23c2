package jobs

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"os"
	"path/filepath"
	"sort"
	"time"

	"plumbline/jobs/config"
	"plumbline/report"
	"plumbline/risk/pack"
	"plumbline/store"
)

// PackOptions controls one pack call.
type PackOptions struct {
	// AsOf is the pack date; zero means the latest date with complete data.
	AsOf time.Time
	// Portfolios limits the call to these ids; empty means all.
	Portfolios []string
	// Reason is recorded when a run supersedes an earlier run of its date.
	Reason string
	// Render stores a PDF with each run; OutDir, when set, also writes it
	// there as <portfolio>-<as-of>-r<run>.pdf.
	Render bool
	OutDir string
	// Queue puts a mail per portfolio with recipients in the outbox, in
	// the run's transaction.
	Queue bool
	// Now is the clock (run creation time); nil means time.Now.
	Now func() time.Time
	// Version is the program version recorded with the run.
	Version string
	// Progress, when set, is told of each finished portfolio.
	Progress func(done, total int, portfolio string)
	Logger   *slog.Logger
}

// PackResult is one portfolio's outcome.
type PackResult struct {
	Portfolio string         `json:"portfolio"`
	AsOf      string         `json:"as_of"`
	RunID     int64          `json:"run_id"`
	Revision  int            `json:"revision"`
	PDF       string         `json:"pdf,omitempty"`
	PDFSHA256 string         `json:"pdf_sha256,omitempty"`
	Document  *pack.Document `json:"results"`
}

// ErrNoData is returned when no date has the data a pack needs.
var ErrNoData = errors.New("no date with holdings, prices, a yield curve and an equity risk premium")

// LatestCompleteDate is the latest date on which a portfolio has a
// holdings snapshot and the store has prices, a yield curve and an equity
// risk premium on or before it: the default as-of date.
func LatestCompleteDate(ctx context.Context, db *store.DB) (time.Time, error) {
	l, err := db.LatestDates(ctx)
	if err != nil {
		return time.Time{}, err
	}
	var best time.Time
	for _, d := range l.Holdings {
		if d.After(best) {
			best = d
		}
	}
	if best.IsZero() || l.Prices.IsZero() {
		return time.Time{}, ErrNoData
	}
	if l.Prices.Before(best) {
		best = l.Prices
	}
	return best, nil
}

// BuildPacks computes, persists and (optionally) renders and queues the
// pack of each portfolio on one as-of date. Each portfolio is one
// transaction: a failure of one leaves the others' runs in place and is
// returned at the end.
func BuildPacks(ctx context.Context, db *store.DB, cfg *config.Config, opt PackOptions) ([]PackResult, error) {
	now := opt.Now
	if now == nil {
		now = time.Now
	}
	log := opt.Logger
	if log == nil {
		log = slog.New(slog.DiscardHandler)
	}
	asOf := opt.AsOf
	if asOf.IsZero() {
		var err error
		if asOf, err = LatestCompleteDate(ctx, db); err != nil {
			return nil, err
		}
	}
	ports, err := selectPortfolios(ctx, db, opt.Portfolios)
	if err != nil {
		return nil, err
	}
	secs, err := db.Securities(ctx)
	if err != nil {
		return nil, err
	}
	sectors := map[string]bool{}
	for _, s := range secs {
		sectors[s.Sector] = true
	}
	var known []string
	for s := range sectors {
		known = append(known, s)
	}
	sort.Strings(known)
	if err := cfg.CheckSectors(known); err != nil {
		return nil, err
	}
	cfgJSON, err := cfg.Canonical()
	if err != nil {
		return nil, err
	}
	cfgHash, err := cfg.Hash()
	if err != nil {
		return nil, err
	}
	params, err := Params(cfg)
	if err != nil {
		return nil, err
	}
	mark, err := db.LedgerMark(ctx)
	if err != nil {
		return nil, err
	}
	m, err := loadMarket(ctx, db, asOf)
	if err != nil {
		return nil, err
	}
	var out []PackResult
	var errs []error
	for i, p := range ports {
		if err := ctx.Err(); err != nil {
			return out, err
		}
		res, err := buildOne(ctx, db, cfg, m, p, params, cfgJSON, cfgHash, mark, now, opt)
		if err != nil {
			log.Error("pack failed", "portfolio", p.ID, "as_of", asOf.Format(time.DateOnly), "err", err)
			errs = append(errs, fmt.Errorf("portfolio %s: %w", p.ID, err))
		} else {
			log.Info("pack stored", "portfolio", p.ID, "as_of", res.AsOf, "run", res.RunID, "revision", res.Revision)
			out = append(out, *res)
		}
		if opt.Progress != nil {
			opt.Progress(i+1, len(ports), p.ID)
		}
	}
	return out, errors.Join(errs...)
}

func selectPortfolios(ctx context.Context, db *store.DB, ids []string) ([]store.Portfolio, error) {
	all, err := db.Portfolios(ctx)
	if err != nil {
		return nil, err
	}
	if len(ids) == 0 {
		if len(all) == 0 {
			return nil, fmt.Errorf("no portfolios loaded: ingest a portfolios file first")
		}
		return all, nil
	}
	byID := map[string]store.Portfolio{}
	for _, p := range all {
		byID[p.ID] = p
	}
	var out []store.Portfolio
	for _, id := range ids {
		p, ok := byID[id]
		if !ok {
			return nil, fmt.Errorf("portfolio %q is not loaded", id)
		}
		out = append(out, p)
	}
	return out, nil
}

// history returns the headline metrics of the portfolio's earlier runs as
// they stood before run beforeID (0: now).
func history(ctx context.Context, db *store.DB, portfolio string, asOf time.Time, beforeID int64) ([]pack.HistoryPoint, error) {
	runs, err := db.PriorRuns(ctx, portfolio, asOf, beforeID)
	if err != nil {
		return nil, err
	}
	out := make([]pack.HistoryPoint, 0, len(runs))
	for _, r := range runs {
		var doc pack.Document
		if err := json.Unmarshal(r.ResultsJSON, &doc); err != nil {
			return nil, fmt.Errorf("run %d: results: %w", r.ID, err)
		}
		out = append(out, pack.HistoryPoint{AsOf: doc.AsOf, Metrics: pack.Headline(&doc)})
	}
	return out, nil
}

func buildOne(ctx context.Context, db *store.DB, cfg *config.Config, m *market, p store.Portfolio,
	params pack.Params, cfgJSON []byte, cfgHash string, mark int64, now func() time.Time, opt PackOptions) (*PackResult, error) {
	hist, err := history(ctx, db, p.ID, m.asOf, 0)
	if err != nil {
		return nil, err
	}
	in, err := gather(ctx, db, m, p, cfg.BaseCurrency, hist)
	if err != nil {
		return nil, err
	}
	ih, err := inputHash(m, in)
	if err != nil {
		return nil, err
	}
	doc, err := pack.Compute(in, params)
	if err != nil {
		return nil, err
	}
	results, err := json.Marshal(doc)
	if err != nil {
		return nil, err
	}
	var metrics []store.MetricRow
	for _, mt := range pack.Metrics(doc) {
		metrics = append(metrics, store.MetricRow{Scope: mt.Scope, Key: mt.Key, Metric: mt.Name, Value: mt.Value})
	}
	created := now().UTC().Truncate(time.Second)
	nr := store.NewRun{
		PortfolioID: p.ID, AsOf: m.asOf, CreatedAt: created, Reason: opt.Reason,
		ProgramVersion: opt.Version, ConfigJSON: cfgJSON, ConfigHash: cfgHash, InputHash: ih,
		LedgerMark: mark, ResultsSchema: pack.SchemaVersion, ResultsJSON: results, Metrics: metrics,
	}
	var complete func(*store.Run) (*store.Completion, error)
	if opt.Render || opt.Queue {
		complete = func(r *store.Run) (*store.Completion, error) {
			pdf, pages, err := RenderRun(r, cfg)
			if err != nil {
				return nil, err
			}
			c := &store.Completion{PDF: pdf, Pages: pages}
			if opt.Queue {
				msg, ok, err := mailFor(r, cfg, pdf)
				if err != nil {
					return nil, err
				}
				if ok {
					c.Outbox = append(c.Outbox, msg)
				}
			}
			return c, nil
		}
	}
	run, err := db.SaveRun(ctx, nr, complete)
	if err != nil {
		return nil, err
	}
	res := &PackResult{Portfolio: p.ID, AsOf: m.asOf.Format(time.DateOnly), RunID: run.ID,
		Revision: run.Revision, PDFSHA256: run.PDFSHA256, Document: doc}
	if opt.OutDir != "" && run.PDFSHA256 != "" {
		path, err := WritePDF(ctx, db, run.ID, opt.OutDir)
		if err != nil {
			return nil, err
		}
		res.PDF = path
	}
	return res, nil
}

// RenderRun renders a stored run's PDF from its stored results and its
// stored configuration only, so the same run renders to the same bytes.
func RenderRun(r *store.Run, current *config.Config) ([]byte, int, error) {
	var doc pack.Document
	if err := json.Unmarshal(r.ResultsJSON, &doc); err != nil {
		return nil, 0, fmt.Errorf("run %d: results: %w", r.ID, err)
	}
	if doc.Schema != pack.SchemaVersion {
		return nil, 0, fmt.Errorf("run %d: results schema %q, this program reads %q", r.ID, doc.Schema, pack.SchemaVersion)
	}
	stored, err := config.FromCanonical(r.ConfigJSON)
	if err != nil {
		return nil, 0, err
	}
	meta := report.Meta{RunID: r.ID, Revision: r.Revision, CreatedAt: r.CreatedAt,
		ProgramVersion: r.ProgramVersion, ConfigHash: r.ConfigHash, InputHash: r.InputHash,
		Firm: stored.Report.Firm}
	if r.Supersedes != 0 {
		s := r.Supersedes
		meta.Supersedes = &s
	}
	opt := report.Options{Paper: stored.Report.Paper, Sections: stored.Report.Sections}
	if dir := stored.Report.TemplateDir; dir != "" {
		opt.Texts = os.DirFS(dir)
	}
	var buf bytes.Buffer
	if err := report.Render(&buf, &doc, meta, opt); err != nil {
		return nil, 0, fmt.Errorf("run %d: render: %w", r.ID, err)
	}
	pages, err := report.PageCount(buf.Bytes())
	if err != nil {
		return nil, 0, err
	}
	return buf.Bytes(), pages, nil
}

// WritePDF writes a run's stored PDF into dir and returns its path.
func WritePDF(ctx context.Context, db *store.DB, runID int64, dir string) (string, error) {
	r, err := db.GetRun(ctx, runID)
	if err != nil {
		return "", err
	}
	pdf, err := db.RunPDF(ctx, runID, r.PDFSHA256)
	if err != nil {
		return "", err
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return "", err
	}
	path := filepath.Join(dir, fmt.Sprintf("%s-%s-run%d.pdf", r.PortfolioID, r.AsOf.Format(time.DateOnly), r.ID))
	return path, writeFileAtomic(path, pdf, 0o644)
}
