package jobs

import (
	"context"
	"fmt"

	"plumbline/jobs/config"
	"plumbline/risk/pack"
	"plumbline/store"
)

// storedRun is a run with everything needed to recompute or export it:
// its stored configuration and the inputs as the store held them when the
// run was made (read at the run's ledger mark, with the drift history as
// it stood before the run).
type storedRun struct {
	run       *store.Run
	cfg       *config.Config
	market    *market
	inputs    *pack.Inputs
	inputHash string
}

// loadStoredRun reads run id and gathers its inputs again.
func loadStoredRun(ctx context.Context, db *store.DB, id int64) (*storedRun, error) {
	run, err := db.GetRun(ctx, id)
	if err != nil {
		return nil, err
	}
	cfg, err := config.FromCanonical(run.ConfigJSON)
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", id, err)
	}
	then := db.At(run.LedgerMark)
	ports, err := selectPortfolios(ctx, then, []string{run.PortfolioID})
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", id, err)
	}
	m, err := loadMarket(ctx, then, run.AsOf)
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", id, err)
	}
	hist, err := history(ctx, db, run.PortfolioID, run.AsOf, run.ID)
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", id, err)
	}
	in, err := gather(ctx, then, m, ports[0], cfg.BaseCurrency, hist)
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", id, err)
	}
	ih, err := inputHash(m, in)
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", id, err)
	}
	return &storedRun{run: run, cfg: cfg, market: m, inputs: in, inputHash: ih}, nil
}
