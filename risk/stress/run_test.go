package stress

import (
	"errors"
	"math"
	"testing"
)

func relClose(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(math.Abs(want), 1e-300)
}

// TestRunRateShockGordonClosedForm: for a constant-growth holding a
// parallel rate shift Δ gives V'/V − 1 = (k−g)/(k−g+Δ) − 1 = −Δ/(k−g+Δ),
// straight from the Gordon formula V = D1/(k−g) (Bodie, Kane & Marcus,
// Investments, "Equity Valuation Models", from memory). The two sides are
// computed by different expressions, so they agree to rounding: relative
// tolerance 1e-12.
func TestRunRateShockGordonClosedForm(t *testing.T) {
	const tol = 1e-12
	cases := []struct {
		name   string
		h      gordon
		rateBP float64
	}{
		{"+100bp, k-g 4%", gordon{d0: 2, rf: 0.04, beta: 1, erp: 0.05, g: 0.05}, 100},
		{"-100bp, k-g 4%", gordon{d0: 2, rf: 0.04, beta: 1, erp: 0.05, g: 0.05}, -100},
		{"+200bp, k-g 6%", gordon{d0: 1, rf: 0.03, beta: 1.2, erp: 0.05, g: 0.03}, 200},
		{"-200bp, k-g 6%", gordon{d0: 1, rf: 0.03, beta: 1.2, erp: 0.05, g: 0.03}, -200},
		{"+37.5bp, negative growth", gordon{d0: 4, rf: 0.05, beta: 0.8, erp: 0.055, g: -0.02}, 37.5},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			const value, cash = 1_000_000, 250_000
			ps := []Position{
				c.h.position("A", value),
				{ID: "CASH", Value: cash},
			}
			res, err := Run(ps, []Scenario{{Name: "s", Shock: Shock{RatesBP: c.rateBP}}}, c.h.erp)
			if err != nil {
				t.Fatal(err)
			}
			r := res[0]
			d := c.rateBP / 1e4
			wantPct := -d / (c.h.k() - c.h.g + d)
			if got := r.PerHolding[0].Pct; !relClose(got, wantPct, tol) {
				t.Errorf("holding Pct = %.17g, closed form %.17g", got, wantPct)
			}
			if got := r.PnL; !relClose(got, value*wantPct, tol) {
				t.Errorf("PnL = %.17g, closed form %.17g", got, value*wantPct)
			}
			if got := r.PnLPct; !relClose(got, value*wantPct/(value+cash), tol) {
				t.Errorf("PnLPct = %.17g, closed form %.17g", got, value*wantPct/(value+cash))
			}
			if r.PerHolding[1].PnL != 0 || len(r.Failed) != 0 {
				t.Errorf("cash P&L %v, failed %v: want 0 and none", r.PerHolding[1].PnL, r.Failed)
			}
		})
	}
}

// TestTaylorErrorShrinksCubically: by Taylor's theorem the remainder of a
// second-order expansion is O(h³), so halving every shift divides the error
// by 8 (log2 of the ratio → 3). With the shifts used (Δk up to 20bp against
// k−g ≥ 4%) the next term changes the ratio by about Δk/(k−g) ≤ 5%, i.e.
// the exponent by ≤ 0.07; the test allows 0.1.
func TestTaylorErrorShrinksCubically(t *testing.T) {
	h := gordon{d0: 2, rf: 0.04, beta: 1.1, erp: 0.05, g: 0.035, sector: "Utilities"}
	dirs := []struct {
		name  string
		shock func(x float64) Shock // moves k or g by about x bp
	}{
		{"rates", func(x float64) Shock { return Shock{RatesBP: x} }},
		{"growth", func(x float64) Shock { return Shock{GrowthPP: x / 100} }},
		{"sector growth", func(x float64) Shock { return Shock{GrowthBySector: map[string]float64{"Utilities": -x / 100}} }},
		{"rates and growth", func(x float64) Shock { return Shock{RatesBP: x, GrowthPP: -x / 100} }},
		{"erp and beta shift", func(x float64) Shock { return Shock{ERP: x / 1e4, BetaShift: x / 500} }},
		{"beta scale", func(x float64) Shock { return Shock{BetaScale: 1 + x/1100} }},
	}
	for _, d := range dirs {
		t.Run(d.name, func(t *testing.T) {
			var errs []float64
			for _, x := range []float64{20, 10, 5} {
				res, err := Run([]Position{h.position("A", 1e6)}, []Scenario{{Name: "s", Shock: d.shock(x)}}, h.erp)
				if err != nil {
					t.Fatal(err)
				}
				errs = append(errs, res[0].Error)
			}
			for i := 1; i < len(errs); i++ {
				if p := math.Log2(errs[i-1] / errs[i]); math.Abs(p-3) > 0.1 {
					t.Errorf("error %g -> %g on halving: order %.3f, want 3", errs[i-1], errs[i], p)
				}
			}
		})
	}
}

// TestTaylorErrorRateExact: for a pure rate shift the Gordon ratio is
// 1/(1+x) with x = Δ/(k−g) and the expansion 1 − x + x², so the error is
// exactly V·(1/(1+x) − 1 + x − x²) = −V·x³/(1+x) (algebra on the Gordon
// formula). The error is a difference of numbers ~V, so it carries an
// absolute rounding error near 1e-16·V; the tolerance is 1e-9 of V.
func TestTaylorErrorRateExact(t *testing.T) {
	h := gordon{d0: 2, rf: 0.04, beta: 1, erp: 0.05, g: 0.05}
	const v = 1e6
	for _, bp := range []float64{-200, -100, -10, 10, 100, 200} {
		res, err := Run([]Position{h.position("A", v)}, []Scenario{{Name: "s", Shock: Shock{RatesBP: bp}}}, h.erp)
		if err != nil {
			t.Fatal(err)
		}
		x := bp / 1e4 / (h.k() - h.g)
		want := -v * x * x * x / (1 + x)
		if got := res[0].Error; math.Abs(got-want) > 1e-9*v {
			t.Errorf("%vbp: Error = %.10g, want %.10g", bp, got, want)
		}
	}
}

// TestMarketMoveIsExact: a market move is a price shock r = β·r_m (the
// single-index model, Sharpe 1963), applied exactly in both columns, so
// P&L = V·β'·move and the Taylor error is zero. Relative tolerance 1e-12
// (one multiplication and one subtraction of 1).
func TestMarketMoveIsExact(t *testing.T) {
	hs := []struct {
		id    string
		beta  float64
		value float64
	}{{"A", 0.5, 300}, {"B", 1.2, 500}, {"C", -0.3, 200}}
	cases := []struct {
		name  string
		shock Shock
		beta  func(b float64) float64
	}{
		{"market -20%", Shock{MarketMove: -0.2}, func(b float64) float64 { return b }},
		{"market +10%, beta x1.5 +0.1", Shock{MarketMove: 0.1, BetaScale: 1.5, BetaShift: 0.1}, func(b float64) float64 { return 1.5*b + 0.1 }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var ps []Position
			for _, h := range hs {
				// The closure ignores the shock: only the price moves here.
				ps = append(ps, Position{ID: h.id, Value: h.value, Beta: h.beta,
					Revalue: func(Shock) (float64, error) { return 1, nil }})
			}
			ps = append(ps, Position{ID: "CASH", Value: 1000})
			res, err := Run(ps, []Scenario{{Name: c.name, Shock: c.shock}}, 0.05)
			if err != nil {
				t.Fatal(err)
			}
			r := res[0]
			var want float64
			for i, h := range hs {
				w := h.value * c.beta(h.beta) * c.shock.MarketMove
				want += w
				if got := r.PerHolding[i].PnL; !relClose(got, w, 1e-12) {
					t.Errorf("%s PnL = %v, want %v", h.id, got, w)
				}
			}
			if !relClose(r.PnL, want, 1e-12) || !relClose(r.TaylorPnL, want, 1e-12) {
				t.Errorf("PnL %v Taylor %v, want both %v", r.PnL, r.TaylorPnL, want)
			}
			if r.Error != 0 {
				t.Errorf("Error = %v, want exactly 0", r.Error)
			}
		})
	}
}

// TestRunFailuresAreListed: a shock that leaves k <= g, a closure giving a
// non-finite ratio and a price pushed below zero each make a Failure and
// are left out of every sum (common practice: a model that cannot value a
// holding gives no number).
func TestRunFailuresAreListed(t *testing.T) {
	ok := gordon{d0: 1, rf: 0.04, beta: 1, erp: 0.05, g: 0.02}
	tight := gordon{d0: 1, rf: 0.04, beta: 1, erp: 0.05, g: 0.08} // k−g = 1%
	ps := []Position{
		ok.position("OK", 100),
		tight.position("TIGHT", 100),
		{ID: "NAN", Value: 100, Beta: 1, Revalue: func(Shock) (float64, error) { return math.NaN(), nil }},
		{ID: "HIGHBETA", Value: 100, Beta: 6, Revalue: func(Shock) (float64, error) { return 1, nil }},
	}
	res, err := Run(ps, []Scenario{{Name: "growth +2pp, market -20%", Shock: Shock{GrowthPP: 2, MarketMove: -0.2}}}, 0.05)
	if err != nil {
		t.Fatal(err)
	}
	r := res[0]
	var failed []string
	for _, f := range r.Failed {
		failed = append(failed, f.ID)
		if f.Reason == "" {
			t.Errorf("%s: empty reason", f.ID)
		}
	}
	if want := []string{"TIGHT", "NAN", "HIGHBETA"}; !equalStrings(failed, want) {
		t.Errorf("failed = %v, want %v", failed, want)
	}
	if len(r.PerHolding) != 1 || r.PerHolding[0].ID != "OK" {
		t.Fatalf("PerHolding = %+v, want only OK", r.PerHolding)
	}
	if r.PnL != r.PerHolding[0].PnL || math.IsNaN(r.PnL) {
		t.Errorf("portfolio PnL %v, want OK's %v", r.PnL, r.PerHolding[0].PnL)
	}
}

func equalStrings(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestTopContributors: the five largest absolute P&Ls, ties by ID, zeros
// left out (the definition in Result.Top). P&Ls are V·β·move, exact in
// binary for these inputs.
func TestTopContributors(t *testing.T) {
	betas := []struct {
		id   string
		beta float64
	}{{"F", 0.25}, {"B", -1}, {"A", 1}, {"E", 0.5}, {"D", 0.5}, {"C", 2}, {"G", 0}}
	var ps []Position
	for _, b := range betas {
		ps = append(ps, Position{ID: b.id, Value: 100, Beta: b.beta, Revalue: func(Shock) (float64, error) { return 1, nil }})
	}
	res, err := Run(ps, []Scenario{{Name: "m", Shock: Shock{MarketMove: -0.25}}}, 0.05)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, h := range res[0].Top {
		got = append(got, h.ID)
	}
	if want := []string{"C", "A", "B", "D", "E"}; !equalStrings(got, want) {
		t.Errorf("Top = %v, want %v", got, want)
	}
}

// TestRunRefusesNonsense: inputs that make no sense are typed errors.
func TestRunRefusesNonsense(t *testing.T) {
	one := func(Shock) (float64, error) { return 1, nil }
	good := []Position{{ID: "A", Value: 100, Beta: 1, Revalue: one}}
	sc := []Scenario{{Name: "s", Shock: Shock{RatesBP: 100}}}
	cases := []struct {
		name string
		ps   []Position
		scs  []Scenario
		erp  float64
		want error
	}{
		{"no ID", []Position{{Value: 1, Revalue: one}}, sc, 0.05, ErrPosition},
		{"duplicate ID", []Position{good[0], good[0]}, sc, 0.05, ErrPosition},
		{"NaN value", []Position{{ID: "A", Value: math.NaN(), Revalue: one}}, sc, 0.05, ErrPosition},
		{"negative stock", []Position{{ID: "A", Value: -1, Revalue: one}, {ID: "C", Value: 10}}, sc, 0.05, ErrPosition},
		{"Inf sensitivity", []Position{{ID: "A", Value: 1, Revalue: one, Sens: Sensitivities{ConvK: math.Inf(1)}}}, sc, 0.05, ErrPosition},
		{"zero total", []Position{{ID: "A", Value: 100, Revalue: one}, {ID: "C", Value: -100}}, sc, 0.05, ErrPortfolio},
		{"empty", nil, sc, 0.05, ErrPortfolio},
		{"NaN ERP", good, sc, math.NaN(), ErrShock},
		{"negative ERP", good, sc, -0.01, ErrShock},
		{"no scenario name", good, []Scenario{{Shock: Shock{RatesBP: 1}}}, 0.05, ErrScenario},
		{"duplicate scenario", good, []Scenario{sc[0], sc[0]}, 0.05, ErrScenario},
		{"NaN shock", good, []Scenario{{Name: "x", Shock: Shock{GrowthPP: math.NaN()}}}, 0.05, ErrShock},
		{"market -100%", good, []Scenario{{Name: "x", Shock: Shock{MarketMove: -1}}}, 0.05, ErrShock},
		{"negative beta scale", good, []Scenario{{Name: "x", Shock: Shock{BetaScale: -1}}}, 0.05, ErrShock},
		{"empty sector", good, []Scenario{{Name: "x", Shock: Shock{GrowthBySector: map[string]float64{"": 1}}}}, 0.05, ErrShock},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Run(c.ps, c.scs, c.erp)
			if !errors.Is(err, c.want) {
				t.Errorf("err = %v, want %v", err, c.want)
			}
		})
	}
}
