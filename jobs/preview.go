package jobs

import (
	"context"
	"errors"
	"fmt"
	"sort"
	"time"

	"plumbline/jobs/config"
	"plumbline/risk/pack"
	"plumbline/store"
)

// Preview computes the pack results of one portfolio on asOf exactly as
// BuildPacks would, from the same inputs and configuration, but stores
// nothing: no run, no metrics, no PDF, no mail. A zero asOf means the
// latest date with complete data.
func Preview(ctx context.Context, db *store.DB, cfg *config.Config, portfolioID string, asOf time.Time) (*pack.Document, error) {
	docs, err := Previews(ctx, db, cfg, []string{portfolioID}, asOf)
	if err != nil {
		return nil, err
	}
	return docs[0], nil
}

// Previews is Preview for several portfolios (all when ids is empty),
// reading the shared market data once. The documents are in the order of
// ids (or of the store). A portfolio that fails is left out and its error
// returned, joined with the others', after the rest are computed.
func Previews(ctx context.Context, db *store.DB, cfg *config.Config, ids []string, asOf time.Time) ([]*pack.Document, error) {
	// One ledger mark for every read, as BuildPacks takes, so a file
	// ingested meanwhile cannot mix into some portfolios and not others.
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
	if err := checkStoreSectors(ctx, view, cfg); err != nil {
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
	var docs []*pack.Document
	var errs []error
	for _, p := range ports {
		if err := ctx.Err(); err != nil {
			return docs, err
		}
		doc, err := previewOne(ctx, db, view, cfg, m, p, params)
		if err != nil {
			errs = append(errs, fmt.Errorf("portfolio %s: %w", p.ID, err))
			continue
		}
		docs = append(docs, doc)
	}
	if len(docs) == 0 && len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	return docs, errors.Join(errs...)
}

// previewOne is buildOne up to pack.Compute: the same history (runs, read
// through db), inputs (read through view, db at the ledger mark) and
// parameters, so the figures are the ones a pack of the date would store.
func previewOne(ctx context.Context, db, view *store.DB, cfg *config.Config, m *market, p store.Portfolio, params pack.Params) (*pack.Document, error) {
	hist, err := history(ctx, db, p.ID, m.asOf, 0)
	if err != nil {
		return nil, err
	}
	in, err := gather(ctx, view, m, p, cfg.BaseCurrency, hist)
	if err != nil {
		return nil, err
	}
	return pack.Compute(in, params)
}

// checkStoreSectors refuses scenario sectors that no loaded security has,
// as BuildPacks does before computing.
func checkStoreSectors(ctx context.Context, db *store.DB, cfg *config.Config) error {
	secs, err := db.Securities(ctx)
	if err != nil {
		return err
	}
	seen := map[string]bool{}
	var known []string
	for _, s := range secs {
		if !seen[s.Sector] {
			seen[s.Sector] = true
			known = append(known, s.Sector)
		}
	}
	sort.Strings(known)
	return cfg.CheckSectors(known)
}
