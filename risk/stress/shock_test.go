package stress

import (
	"math"
	"testing"
)

// TestShockDeltaK: Δk equals k' − k with both sides from CAPM,
// k = rf + β·ERP (Sharpe 1964), computed here from the shocked inputs.
// Relative tolerance 1e-12 against the larger of |Δk| and 1e-4 (a few
// roundings of numbers below 1).
func TestShockDeltaK(t *testing.T) {
	cases := []struct {
		name          string
		s             Shock
		rf, beta, erp float64
		rf2, b2, erp2 float64 // shocked inputs, written out by hand
	}{
		{"rates", Shock{RatesBP: 100}, 0.04, 1.2, 0.05, 0.05, 1.2, 0.05},
		{"erp", Shock{ERP: 0.01}, 0.04, 1.2, 0.05, 0.04, 1.2, 0.06},
		{"beta shift", Shock{BetaShift: 0.2}, 0.04, 0.9, 0.05, 0.04, 1.1, 0.05},
		{"beta scale", Shock{BetaScale: 1.5}, 0.04, 0.8, 0.05, 0.04, 1.2, 0.05},
		{"all", Shock{RatesBP: -50, ERP: 0.005, BetaScale: 1.1, BetaShift: -0.1}, 0.03, 1.0, 0.055, 0.025, 1.0, 0.06},
	}
	for _, c := range cases {
		want := (c.rf2 + c.b2*c.erp2) - (c.rf + c.beta*c.erp)
		got := c.s.DeltaK(c.beta, c.erp)
		if math.Abs(got-want) > 1e-12*math.Max(math.Abs(want), 1e-4) {
			t.Errorf("%s: DeltaK = %.17g, want %.17g", c.name, got, want)
		}
	}
}

// TestShockDeltaGAddsSector: the sector shift adds to the all-holdings
// shift (the documented convention), percentage points to decimals.
func TestShockDeltaGAddsSector(t *testing.T) {
	s := Shock{GrowthPP: -1, GrowthBySector: map[string]float64{"Utilities": -0.5}}
	for _, c := range []struct {
		sector string
		want   float64
	}{{"Utilities", -0.015}, {"Energy", -0.01}, {"", -0.01}} {
		if got := s.DeltaG(c.sector); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("DeltaG(%q) = %v, want %v", c.sector, got, c.want)
		}
	}
}

// TestShockIsZero: the zero Shock, a zero sector map and a beta scale of
// one change nothing; any shift does.
func TestShockIsZero(t *testing.T) {
	cases := []struct {
		s    Shock
		want bool
	}{
		{Shock{}, true},
		{Shock{BetaScale: 1}, true},
		{Shock{GrowthBySector: map[string]float64{"Energy": 0}}, true},
		{Shock{BetaScale: 0.9}, false},
		{Shock{GrowthBySector: map[string]float64{"Energy": -1}}, false},
		{Shock{NSCurvatureBP: 1}, false},
		{Shock{MarketMove: -0.1}, false},
	}
	for i, c := range cases {
		if got := c.s.IsZero(); got != c.want {
			t.Errorf("case %d %+v: IsZero = %v, want %v", i, c.s, got, c.want)
		}
	}
}
