package stress

import (
	"cmp"
	"fmt"
	"math"
	"slices"
)

// HoldingPnL is one holding's result in a scenario or replay.
type HoldingPnL struct {
	ID     string
	Name   string
	Sector string
	// Value is the current value, base currency.
	Value float64
	// PnL is the full-revaluation profit and loss, base currency; Pct is
	// PnL/Value as a decimal (the holding's own return).
	PnL float64
	Pct float64
	// Taylor and TaylorPct are the Taylor estimate beside PnL and Pct.
	// Historical replays have no Taylor estimate and leave them zero.
	Taylor    float64
	TaylorPct float64
}

// Failure is a holding left out of a result, with the reason.
type Failure struct {
	ID     string
	Reason string
}

// Result is one scenario applied to the portfolio.
//
// Portfolio figures sum the holdings that did not fail; percentages are
// over the total value of all positions (cash and failures included).
type Result struct {
	Scenario Scenario
	// PnL is Σ full-revaluation P&L, base currency; PnLPct = PnL/total.
	PnL    float64
	PnLPct float64
	// TaylorPnL and TaylorPct are the same for the Taylor estimate.
	TaylorPnL float64
	TaylorPct float64
	// Error = PnL − TaylorPnL, base currency; ErrorPct = Error/total.
	Error    float64
	ErrorPct float64
	// PerHolding lists the positions in input order, failures left out.
	PerHolding []HoldingPnL
	// Top is the five largest |PnL| among PerHolding, largest first, ties
	// by ID ascending; holdings with a P&L of exactly zero are left out.
	Top []HoldingPnL
	// Failed lists holdings whose revaluation failed, in input order.
	Failed []Failure
}

// TopN is the number of contributors in Result.Top and ReplayResult.Top.
const TopN = 5

// Run applies each scenario to the positions. marketERP is the equity risk
// premium in force, decimal, used for Δk (Shock.DeltaK).
//
// For a holding of value V, model ratio R = Revalue(s.Model()) and price
// factor P = 1 + β'·MarketMove:
//
//	full   P&L = V·(R·P − 1)
//	Taylor P&L = V·((1 + T)·P − 1),  T = Sensitivities.Estimate(Δk, Δg, ΔL, ΔS, ΔC)
//
// so a pure market move is exact in both and the error column measures the
// model's Taylor error alone. Revalue is not called when the model part of
// the shock is zero (R = 1). A Revalue error, a ratio that is negative or
// not finite, or P < 0 makes the holding a Failure, never a number.
//
// Errors (wrapping ErrPosition, ErrPortfolio, ErrScenario or ErrShock) are
// for inputs that make no sense: non-finite numbers, missing or duplicate
// IDs and scenario names, a total value that is not positive.
func Run(positions []Position, scenarios []Scenario, marketERP float64) ([]Result, error) {
	total, err := checkPositions(positions)
	if err != nil {
		return nil, err
	}
	if !finite(marketERP) || marketERP < 0 {
		return nil, fmt.Errorf("%w: market ERP %v", ErrShock, marketERP)
	}
	if err := checkScenarios(scenarios); err != nil {
		return nil, err
	}
	out := make([]Result, len(scenarios))
	for i := range scenarios {
		out[i] = runOne(positions, scenarios[i], marketERP, total)
	}
	return out, nil
}

func checkScenarios(scs []Scenario) error {
	seen := make(map[string]bool, len(scs))
	for i, sc := range scs {
		if sc.Name == "" {
			return fmt.Errorf("%w: scenario %d has no name", ErrScenario, i)
		}
		if seen[sc.Name] {
			return fmt.Errorf("%w: duplicate name %q", ErrScenario, sc.Name)
		}
		seen[sc.Name] = true
		if err := sc.Shock.Validate(); err != nil {
			return fmt.Errorf("scenario %q: %w", sc.Name, err)
		}
	}
	return nil
}

func runOne(ps []Position, sc Scenario, erp, total float64) Result {
	r := Result{Scenario: sc, PerHolding: make([]HoldingPnL, 0, len(ps))}
	model := sc.Shock.Model()
	modelZero := model.IsZero()
	for i := range ps {
		p := &ps[i]
		h := HoldingPnL{ID: p.ID, Name: p.Name, Sector: p.Sector, Value: p.Value}
		if p.Revalue == nil {
			r.PerHolding = append(r.PerHolding, h)
			continue
		}
		ratio := 1.0
		if !modelZero {
			var err error
			ratio, err = p.Revalue(model)
			if err != nil {
				r.Failed = append(r.Failed, Failure{ID: p.ID, Reason: err.Error()})
				continue
			}
			if !finite(ratio) || ratio < 0 {
				r.Failed = append(r.Failed, Failure{ID: p.ID, Reason: fmt.Sprintf("revaluation ratio %v is not a finite non-negative number", ratio)})
				continue
			}
		}
		price := 1 + sc.Shock.ShockedBeta(p.Beta)*sc.Shock.MarketMove
		if price < 0 {
			r.Failed = append(r.Failed, Failure{ID: p.ID, Reason: fmt.Sprintf("market move %v with beta %v gives a negative price", sc.Shock.MarketMove, sc.Shock.ShockedBeta(p.Beta))})
			continue
		}
		t := 0.0
		if !modelZero {
			t = taylorModel(p, model, erp)
		}
		h.Pct = ratio*price - 1
		h.TaylorPct = (1+t)*price - 1
		h.PnL = p.Value * h.Pct
		h.Taylor = p.Value * h.TaylorPct
		r.PnL += h.PnL
		r.TaylorPnL += h.Taylor
		r.PerHolding = append(r.PerHolding, h)
	}
	r.Error = r.PnL - r.TaylorPnL
	r.PnLPct = r.PnL / total
	r.TaylorPct = r.TaylorPnL / total
	r.ErrorPct = r.Error / total
	r.Top = top(r.PerHolding, TopN)
	return r
}

// top returns the n largest |PnL| of hs, largest first, ties by ID,
// leaving out exact zeros. hs is not modified.
func top(hs []HoldingPnL, n int) []HoldingPnL {
	var t []HoldingPnL
	for _, h := range hs {
		if h.PnL != 0 {
			t = append(t, h)
		}
	}
	slices.SortFunc(t, func(a, b HoldingPnL) int {
		if c := cmp.Compare(math.Abs(b.PnL), math.Abs(a.PnL)); c != 0 {
			return c
		}
		return cmp.Compare(a.ID, b.ID)
	})
	if len(t) > n {
		t = t[:n:n]
	}
	return t
}
