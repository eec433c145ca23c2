package valuation

import (
	"errors"
	"math"
	"testing"
)

func sens(mod, conv, gd, gc, x, beta float64) Sensitivities {
	return Sensitivities{Model: ModelConstantGrowth, Value: 10, ModifiedDuration: mod, MacaulayDuration: mod * 1.08,
		Convexity: conv, GrowthDuration: gd, GrowthConvexity: gc, CrossKG: x, Beta: beta, HasBeta: true}
}

func TestAggregateHandExample(t *testing.T) {
	// Market-value-weighted portfolio duration, convexity and beta (common
	// practice; e.g. Fabozzi, Bond Markets, Analysis and Strategies, on
	// portfolio duration as the value-weighted average, from memory).
	// By hand: total 600 + 300 + 100 + 200 = 1200, included 1000 (the 200
	// holding is excluded), weights 0.6, 0.3, 0.1 (cash).
	//   duration   0.6·20 + 0.3·10 = 15
	//   convexity  0.6·800 + 0.3·200 = 540
	//   growth     0.6·21 + 0.3·11 = 15.9;  growth convexity 0.6·900 + 0.3·250 = 615
	//   cross      0.6·(−850) + 0.3·(−220) = −576
	//   beta       (600·1.2 + 300·0.6 + 100·0)/1000 = 0.9
	//   dollar duration −(20·600 + 10·300)·0.0001 = −1.5
	//   excluded share 200/1200 = 1/6, coverage 1000/1200 = 5/6
	// Sums of a few products: 1e-12.
	excl := inputErr("terminal k - g", -0.01, ErrGrowthNotBelowRate)
	ps := []Position{
		{ID: "ALPHA", Sector: "Tools", MarketValue: 600, Sensitivities: sens(20, 800, 21, 900, -850, 1.2)},
		{ID: "BETA", Sector: "Water", MarketValue: 300, Sensitivities: sens(10, 200, 11, 250, -220, 0.6)},
		{ID: "CASH", MarketValue: 100, Cash: true},
		{ID: "GAMMA", Sector: "Tools", MarketValue: 200, Err: excl},
	}
	p, err := Aggregate(ps)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"total", p.TotalValue, 1200}, {"included", p.IncludedValue, 1000}, {"cash", p.CashValue, 100},
		{"coverage", p.Coverage, 1000.0 / 1200}, {"duration", p.ModifiedDuration, 15},
		{"Macaulay", p.MacaulayDuration, 15 * 1.08}, {"convexity", p.Convexity, 540},
		{"growth", p.GrowthDuration, 15.9}, {"growth convexity", p.GrowthConvexity, 615},
		{"cross", p.CrossKG, -576}, {"beta", p.Beta, 0.9}, {"beta coverage", p.BetaCoverage, 1},
		{"dollar duration", p.DollarDuration, -1.5},
	} {
		if !relClose(c.got, c.want, 1e-12) {
			t.Errorf("%s = %.15g, want %.15g", c.name, c.got, c.want)
		}
	}
	if len(p.Excluded) != 1 || p.Excluded[0].ID != "GAMMA" || !relClose(p.Excluded[0].Share, 1.0/6, 1e-15) ||
		!errors.Is(p.Excluded[0].Err, ErrGrowthNotBelowRate) || p.Excluded[0].Reason == "" {
		t.Errorf("excluded %+v", p.Excluded)
	}
	// Sectors in name order; each sums its holdings; cash has its own.
	want := []struct {
		sector string
		n      int
		weight float64
		dur    float64
	}{{CashSector, 1, 0.1, 0}, {"Tools", 1, 0.6, 12}, {"Water", 1, 0.3, 3}}
	if len(p.Sectors) != len(want) {
		t.Fatalf("sectors %+v", p.Sectors)
	}
	for i, w := range want {
		s := p.Sectors[i]
		if s.Sector != w.sector || s.Holdings != w.n || !relClose(s.Weight, w.weight, 1e-15) || !relClose(s.ModifiedDuration, w.dur, 1e-12) {
			t.Errorf("sector %d: %+v, want %+v", i, s, w)
		}
	}
	// Holding contributions add up to the portfolio figures.
	var sum Exposure
	for _, h := range p.Holdings {
		sum.add(h.Exposure)
	}
	if !relClose(sum.ModifiedDuration, p.ModifiedDuration, 1e-12) || !relClose(sum.Beta, p.Beta, 1e-12) ||
		!relClose(sum.DollarDuration, p.DollarDuration, 1e-12) || !relClose(sum.Weight, 1, 1e-12) {
		t.Errorf("contributions %+v do not add up", sum)
	}
}

func TestAggregateEdgeCases(t *testing.T) {
	noBeta := sens(20, 800, 21, 900, -850, 0)
	noBeta.HasBeta = false
	p, err := Aggregate([]Position{
		{ID: "A", Sector: "S", MarketValue: 500, Sensitivities: sens(20, 800, 21, 900, -850, 1.5)},
		{ID: "B", Sector: "S", MarketValue: 500, Sensitivities: noBeta},
		{ID: "OD", MarketValue: -100, Cash: true}, // overdraft: negative weight
		{ID: "Z", Sector: "S", MarketValue: 50},   // never analysed
		{ID: "N", Sector: "S", MarketValue: -5, Sensitivities: sens(1, 1, 1, 1, 1, 1)},
	})
	if err != nil {
		t.Fatal(err)
	}
	// By hand: included 500 + 500 − 100 = 900; duration (500·20 + 500·20)/900;
	// beta over known-beta value 500 − 100 = 400: 500·1.5/400 = 1.875.
	if !relClose(p.ModifiedDuration, 20000.0/900, 1e-12) || !relClose(p.Beta, 1.875, 1e-12) || !relClose(p.BetaCoverage, 400.0/900, 1e-12) {
		t.Errorf("duration %g beta %g coverage %g", p.ModifiedDuration, p.Beta, p.BetaCoverage)
	}
	if len(p.Excluded) != 2 || !errors.Is(p.Excluded[0].Err, ErrNoSensitivities) || !errors.Is(p.Excluded[1].Err, ErrPosition) {
		t.Errorf("excluded %+v", p.Excluded)
	}

	if _, err := Aggregate([]Position{{ID: "A", MarketValue: math.NaN()}}); !errors.Is(err, ErrPosition) {
		t.Errorf("NaN market value: %v", err)
	}
	if _, err := Aggregate([]Position{{ID: "A", MarketValue: 100, Err: ErrNoDividend}}); !errors.Is(err, ErrNoValue) {
		t.Errorf("nothing included: %v", err)
	}
	if _, err := Aggregate(nil); !errors.Is(err, ErrNoValue) {
		t.Errorf("empty: %v", err)
	}
	bad := sens(20, math.Inf(1), 21, 900, -850, 1)
	p, err = Aggregate([]Position{{ID: "A", MarketValue: 100, Sensitivities: bad}, {ID: "C", MarketValue: 1, Cash: true}})
	if err != nil || len(p.Excluded) != 1 || !errors.Is(p.Excluded[0].Err, ErrNotFinite) {
		t.Errorf("infinite convexity: %+v, %v", p.Excluded, err)
	}
}
