package pack

import (
	"errors"
	"math"
	"testing"

	"plumbline/risk/valuation"
)

// The portfolio's Δk and Δg over the week are the value-weighted averages
// of the included holdings' changes, weights the values at the first date
// (Explain's doc comment). By hand on the fixture, from 2025-06-06 to
// 2025-06-13: every k is CAPM's, k = rf + β·ERP with rf the 120-month
// zero yield (the DUNE beta is the as-of estimate on both dates), so
// Δk_i = Δrf + β_i·ΔERP; BRKW's long-run growth moves from 2.5% to 2.7%
// in an assumption effective 2025-06-10, the others' stays; CVNT (k <= g)
// and cash are left out. The values are the 2025-06-06 closes times the
// split-adjusted quantities (2,400 ALDR, 1,500 BRKW, 1,000 DUNE).
// Sums of three terms in another order: 1e-12 relative.
func TestPortfolioExplainMoves(t *testing.T) {
	in := fxInputs()
	in.Assumptions = append(in.Assumptions, Assumption{SecurityID: "BRKW", Effective: day("2025-06-10"),
		AnnualDividend: 1.5, Frequency: 1, Growth: 0.027, Beta: f64(0.8), Stages: []Stage{{Years: 3, Growth: 0.08}}})
	doc := mustCompute(t, in, fxParams())
	e := doc.Explain
	if e == nil || e.From != "2025-06-06" {
		t.Fatalf("explain %+v", e)
	}
	d0 := day("2025-06-06")
	t0, t1 := fxIndex(d0), fxIndex(fxAsOf)
	drf, derp := fxYield(t1, 120)-fxYield(t0, 120), fxPremium(t1)-fxPremium(t0)
	dune := holding(t, doc, "DUNE")
	if dune.Beta == nil || dune.BetaSource != "estimated" {
		t.Fatalf("DUNE beta %v (%s)", dune.Beta, dune.BetaSource)
	}
	lines := []struct {
		mv, beta, dg float64
	}{
		{2400 * fxClose("ALDR", t0, d0), 1.1, 0},
		{1500 * fxClose("BRKW", t0, d0), 0.8, 0.027 - 0.025},
		{1000 * fxClose("DUNE", t0, d0), *dune.Beta, 0},
	}
	var mv, dk, dg float64
	for _, l := range lines {
		mv += l.mv
		dk += l.mv * (drf + l.beta*derp)
		dg += l.mv * l.dg
	}
	dk, dg = dk/mv, dg/mv
	if dk == 0 || math.Abs(e.DeltaK-dk) > 1e-12*math.Abs(dk) {
		t.Errorf("portfolio Δk %v, want %v", e.DeltaK, dk)
	}
	if dg == 0 || math.Abs(e.DeltaG-dg) > 1e-12*math.Abs(dg) {
		t.Errorf("portfolio Δg %v, want %v", e.DeltaG, dg)
	}
}

// meanMoves weighs by value and leaves out what ExplainPortfolio leaves
// out (cash, holdings with an error, negative values). Hand arithmetic:
// (100·0.001 + 300·0.003)/400 = 0.0025 and (100·0.004 + 300·0)/400 =
// 0.001; exact to 1e-15 (three roundings).
func TestMeanMoves(t *testing.T) {
	pos := func(mv, dk, dg float64) valuation.ExplainPosition {
		return valuation.ExplainPosition{MarketValue: mv, Explanation: valuation.ReturnExplanation{DK: dk, DG: dg}}
	}
	bad := pos(500, 0.5, 0.5)
	bad.Err = errors.New("no assumptions")
	cash := pos(1000, 0.2, 0.2)
	cash.Cash = true
	for _, tc := range []struct {
		name   string
		ps     []valuation.ExplainPosition
		dk, dg float64
	}{
		{"two holdings, cash, an excluded one, a short", []valuation.ExplainPosition{cash, pos(100, 0.001, 0.004), bad, pos(300, 0.003, 0), pos(-50, 0.9, 0.9)}, 0.0025, 0.001},
		{"cash only", []valuation.ExplainPosition{cash}, 0, 0},
		{"nothing", nil, 0, 0},
	} {
		dk, dg := meanMoves(tc.ps)
		if math.Abs(dk-tc.dk) > 1e-15 || math.Abs(dg-tc.dg) > 1e-15 {
			t.Errorf("%s: %v, %v; want %v, %v", tc.name, dk, dg, tc.dk, tc.dg)
		}
	}
}
