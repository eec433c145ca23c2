package stress

import (
	"math"
	"testing"
)

// nsLoadings are the Nelson-Siegel loadings of the slope and curvature
// factors at maturity tau (years) with decay lambda (Nelson & Siegel 1987,
// Journal of Business 60(4), from memory).
func nsLoadings(tau, lambda float64) (slope, curv float64) {
	x := tau / lambda
	f := (1 - math.Exp(-x)) / x
	return f, f - math.Exp(-x)
}

// TestStandardCurveTwists: under the Nelson-Siegel form the short end
// (τ → 0: slope loading 1, curvature 0) moves by level+slope and the long
// end (τ → ∞: both loadings 0) by the level alone. The steepener must move
// the short end -50bp and the long end +50bp, the flattener the reverse.
// Loadings at τ = 1e-6 and 1e6 years differ from their limits by < 1e-6,
// hence the 1e-3bp tolerance.
func TestStandardCurveTwists(t *testing.T) {
	want := map[string][2]float64{ // short, long change in bp
		"curve steepener": {-50, 50},
		"curve flattener": {50, -50},
	}
	found := 0
	for _, sc := range Standard() {
		w, ok := want[sc.Name]
		if !ok {
			continue
		}
		found++
		move := func(tau float64) float64 {
			s, c := nsLoadings(tau, 1.5)
			return sc.Shock.NSLevelBP + s*sc.Shock.NSSlopeBP + c*sc.Shock.NSCurvatureBP
		}
		if got := move(1e-6); math.Abs(got-w[0]) > 1e-3 {
			t.Errorf("%s: short end %vbp, want %v", sc.Name, got, w[0])
		}
		if got := move(1e6); math.Abs(got-w[1]) > 1e-3 {
			t.Errorf("%s: long end %vbp, want %v", sc.Name, got, w[1])
		}
	}
	if found != 2 {
		t.Errorf("found %d curve twists, want 2", found)
	}
}

// TestStandardSet: the set asked for (rates ±100/±200bp, growth -1pp,
// rates +100bp with growth -1pp, market -20%, steepener, flattener), each
// valid, non-empty, uniquely named.
func TestStandardSet(t *testing.T) {
	std := Standard()
	if err := checkScenarios(std); err != nil {
		t.Fatal(err)
	}
	type want struct{ rates, growth, market float64 }
	wants := map[string]want{
		"rates +100bp":               {100, 0, 0},
		"rates -100bp":               {-100, 0, 0},
		"rates +200bp":               {200, 0, 0},
		"rates -200bp":               {-200, 0, 0},
		"growth -1pp":                {0, -1, 0},
		"rates +100bp & growth -1pp": {100, -1, 0},
		"market -20%":                {0, 0, -0.2},
	}
	seen := 0
	for _, sc := range std {
		if sc.Shock.IsZero() || sc.Description == "" {
			t.Errorf("%q: zero shock or no description", sc.Name)
		}
		w, ok := wants[sc.Name]
		if !ok {
			continue
		}
		seen++
		s := sc.Shock
		if s.RatesBP != w.rates || s.GrowthPP != w.growth || s.MarketMove != w.market {
			t.Errorf("%q = %+v, want rates %v growth %v market %v", sc.Name, s, w.rates, w.growth, w.market)
		}
	}
	if seen != len(wants) || len(std) != len(wants)+2 {
		t.Errorf("standard set has %d scenarios, %d of the expected ones", len(std), seen)
	}
	std[0].Name = "changed"
	if Standard()[0].Name == "changed" {
		t.Error("Standard shares its slice between calls")
	}
}
