package jobs

import (
	"context"
	"errors"
	"fmt"
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
	day, err := prepareDay(ctx, db, cfg, asOf, ids)
	if err != nil {
		return nil, err
	}
	var docs []*pack.Document
	var errs []error
	for _, p := range day.ports {
		if err := ctx.Err(); err != nil {
			return docs, err
		}
		doc, err := previewOne(ctx, db, day, cfg, p)
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

// previewOne is computeOne without storing: the same history, inputs
// (read at the day's ledger mark) and parameters, so the figures are the
// ones a pack of the date would store.
func previewOne(ctx context.Context, db *store.DB, day *packDay, cfg *config.Config, p store.Portfolio) (*pack.Document, error) {
	in, err := portfolioInputs(ctx, db, day.view, cfg, day.market, p)
	if err != nil {
		return nil, err
	}
	return pack.Compute(in, day.params)
}
