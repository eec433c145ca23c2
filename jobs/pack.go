package jobs

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"time"

	"plumbline/jobs/config"
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

// packDay is what every portfolio's pack of one date shares: the store
// view at one ledger mark, the date, the portfolios, the parameters and
// the market data.
type packDay struct {
	view   *store.DB
	asOf   time.Time
	ports  []store.Portfolio
	params pack.Params
	market *market
}

// prepareDay takes the ledger mark and reads, through it, what the packs
// of asOf (zero: the latest complete date) for the portfolios ids (empty:
// all) share. Every input is read at that mark, which the runs record: a
// file ingested meanwhile (the daemon's drop folder) is left for the next
// pack, and verify can read the same rows later.
func prepareDay(ctx context.Context, db *store.DB, cfg *config.Config, asOf time.Time, ids []string) (*packDay, error) {
	mark, err := db.LedgerMark(ctx)
	if err != nil {
		return nil, err
	}
	view := db.At(mark)
	if asOf.IsZero() {
		if asOf, err = LatestCompleteDate(ctx, view); err != nil {
			return nil, err
		}
	}
	ports, err := selectPortfolios(ctx, view, ids)
	if err != nil {
		return nil, err
	}
	params, err := Params(cfg)
	if err != nil {
		return nil, err
	}
	m, err := loadMarket(ctx, view, asOf)
	if err != nil {
		return nil, err
	}
	// Scenario sectors must name sectors the loaded securities have.
	var known []string
	seen := map[string]bool{}
	for _, s := range m.securities {
		if !seen[s.Sector] {
			seen[s.Sector] = true
			known = append(known, s.Sector)
		}
	}
	sort.Strings(known)
	if err := cfg.CheckSectors(known); err != nil {
		return nil, err
	}
	return &packDay{view: view, asOf: asOf, ports: ports, params: params, market: m}, nil
}

// portfolioInputs gathers one portfolio's inputs on top of the day's
// market data, with the drift history as it stands now.
func portfolioInputs(ctx context.Context, db, view *store.DB, cfg *config.Config, m *market, p store.Portfolio) (*pack.Inputs, error) {
	hist, err := history(ctx, db, p.ID, m.asOf, 0)
	if err != nil {
		return nil, err
	}
	return gather(ctx, view, m, p, cfg.BaseCurrency, hist)
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
	day, err := prepareDay(ctx, db, cfg, opt.AsOf, opt.Portfolios)
	if err != nil {
		return nil, err
	}
	in, asOf, ports, params, m := day.view, day.asOf, day.ports, day.params, day.market
	cfgJSON, err := cfg.Canonical()
	if err != nil {
		return nil, err
	}
	cfgHash, err := cfg.Hash()
	if err != nil {
		return nil, err
	}
	// Portfolios compute concurrently (they only read m, which is shared,
	// and their own rows) and are stored one at a time in their order.
	var out []PackResult
	var errs []error
	type computed struct {
		c   *computedRun
		err error
	}
	err = inOrder(ctx, len(ports), runtime.GOMAXPROCS(0), func(ctx context.Context, i int) computed {
		c, err := computeOne(ctx, db, in, cfg, m, ports[i], params, cfgJSON, cfgHash, opt)
		return computed{c, err}
	}, func(i int, r computed) {
		p := ports[i]
		var res *PackResult
		err := r.err
		if err == nil {
			res, err = storeOne(ctx, db, cfg, r.c, now, opt)
		}
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
	})
	if err != nil {
		return out, err
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
// they stood before run beforeID (0: now), from the headlines stored with
// each run (the values pack.Headline gave when it was saved).
func history(ctx context.Context, db *store.DB, portfolio string, asOf time.Time, beforeID int64) ([]pack.HistoryPoint, error) {
	hs, err := db.PriorHeadlines(ctx, portfolio, asOf, beforeID)
	if err != nil {
		return nil, err
	}
	out := make([]pack.HistoryPoint, len(hs))
	for i, h := range hs {
		out[i] = pack.HistoryPoint{AsOf: h.AsOf.Format(time.DateOnly), Metrics: h.Metrics}
	}
	return out, nil
}

// computedRun is one portfolio's pack, computed and not yet stored.
type computedRun struct {
	doc *pack.Document
	nr  store.NewRun // CreatedAt is set when it is stored
}

// computeOne reads the portfolio's inputs from view (db at the pack's
// ledger mark) and its earlier runs from db, and computes its pack. It
// only reads, so portfolios may compute concurrently.
func computeOne(ctx context.Context, db, view *store.DB, cfg *config.Config, m *market, p store.Portfolio,
	params pack.Params, cfgJSON []byte, cfgHash string, opt PackOptions) (*computedRun, error) {
	in, err := portfolioInputs(ctx, db, view, cfg, m, p)
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
	return &computedRun{doc: doc, nr: store.NewRun{
		PortfolioID: p.ID, AsOf: m.asOf, Reason: opt.Reason,
		ProgramVersion: opt.Version, ConfigJSON: cfgJSON, ConfigHash: cfgHash, InputHash: ih,
		LedgerMark: view.Mark(), ResultsSchema: pack.SchemaVersion, ResultsJSON: results, Metrics: metrics,
		Headline: pack.Headline(doc),
	}}, nil
}

// storeOne stores a computed pack as a run, rendered and queued as opt
// asks, in one transaction, and writes its PDF to opt.OutDir.
func storeOne(ctx context.Context, db *store.DB, cfg *config.Config, c *computedRun, now func() time.Time, opt PackOptions) (*PackResult, error) {
	nr, doc := c.nr, c.doc
	nr.CreatedAt = now().UTC().Truncate(time.Second)
	var complete func(*store.Run) (*store.Completion, error)
	if opt.Render || opt.Queue {
		complete = func(r *store.Run) (*store.Completion, error) {
			d, err := decodeRun(r)
			if err != nil {
				return nil, err
			}
			pdf, pages, err := d.render()
			if err != nil {
				return nil, err
			}
			c := &store.Completion{PDF: pdf, Pages: pages}
			if to := cfg.Recipients(r.PortfolioID); opt.Queue && len(to) > 0 {
				msg, err := d.mail(to)
				if err != nil {
					return nil, err
				}
				c.Outbox = append(c.Outbox, msg)
			}
			return c, nil
		}
	}
	run, err := db.SaveRun(ctx, nr, complete)
	if err != nil {
		return nil, err
	}
	res := &PackResult{Portfolio: nr.PortfolioID, AsOf: nr.AsOf.Format(time.DateOnly), RunID: run.ID,
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
func RenderRun(r *store.Run) ([]byte, int, error) {
	d, err := decodeRun(r)
	if err != nil {
		return nil, 0, err
	}
	return d.render()
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
