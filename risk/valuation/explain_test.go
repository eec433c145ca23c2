package valuation

import (
	"errors"
	"math"
	"testing"
)

func TestExplainMoveHandExample(t *testing.T) {
	// Second-order Taylor expansion (common practice), by hand with
	// D = 20, C = 800, Dg = 21, Cg = 900, X = −850, Δk = 1%, Δg = 0.5%:
	//   −20·0.01 = −0.2;  ½·800·0.0001 = 0.04;  21·0.005 = 0.105
	//   ½·900·0.000025 = 0.01125;  −850·0.01·0.005 = −0.0425
	//   Taylor = −0.08625; V 100 → 92: revaluation −0.08; unexplained 0.00625.
	s := sens(20, 800, 21, 900, -850, 1)
	s.Value = 100
	e, err := ExplainMove(s, 0.01, 0.005, 92)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"rate", e.RateTerm, -0.2}, {"rate convexity", e.RateConvexityTerm, 0.04},
		{"growth", e.GrowthTerm, 0.105}, {"growth convexity", e.GrowthConvexityTerm, 0.01125},
		{"cross", e.CrossTerm, -0.0425}, {"Taylor", e.Taylor, -0.08625},
		{"revaluation", e.Revaluation, -0.08}, {"unexplained", e.Unexplained, 0.00625},
	} {
		if math.Abs(c.got-c.want) > 1e-15 {
			t.Errorf("%s = %.17g, want %g", c.name, c.got, c.want)
		}
	}
	if _, err := ExplainMove(s, math.NaN(), 0, 92); !errors.Is(err, ErrNotFinite) {
		t.Errorf("NaN dk: %v", err)
	}
	if _, err := ExplainMove(Sensitivities{}, 0.01, 0, 92); !errors.Is(err, ErrNoSensitivities) {
		t.Errorf("zero value: %v", err)
	}
}

func TestTaylorErrorShrinksWithCubeOfShock(t *testing.T) {
	// Taylor's theorem: the remainder of a second-order expansion is
	// O(|Δ|³), so halving the shock divides it by about 8. Had the cross
	// term been left out the remainder would be O(|Δ|²) and the ratio near
	// 4. Accept 7–9 (the next-order term shifts the ratio by O(Δ)).
	beta := 1.1
	mkt := Market{RiskFree: 0.03, ERP: 0.05}
	for _, a := range []Assumptions{
		{D0: 1, Growth: 0.03, Beta: &beta},
		{D0: 1, Growth: 0.02, Beta: &beta, Frequency: 4, StubFraction: 0.3,
			Stages: []Stage{{Years: 3, Growth: 0.12}, {Years: 2, Growth: 0.07, Rate: ptr(0.1)}}},
	} {
		s, err := Analyze(a, mkt, Options{})
		if err != nil {
			t.Fatal(err)
		}
		var prev float64
		for i, h := range []float64{0.004, 0.002, 0.001} {
			dk, dg := h, -0.6*h
			v1, err := Revalue(a, mkt, Options{}, Shock{Rate: dk, Growth: dg})
			if err != nil {
				t.Fatal(err)
			}
			e, _ := ExplainMove(s, dk, dg, v1)
			u := math.Abs(e.Unexplained)
			if i > 0 {
				if r := prev / u; r < 7 || r > 9 {
					t.Errorf("%v h=%g: remainder ratio %.3f, want about 8", s.Model, h, r)
				}
			}
			prev = u
		}
	}
}

func TestExplainBetween(t *testing.T) {
	// Between two dates rf rises 40 bp and growth falls 20 bp: Δk and Δg
	// must be those moves and the revaluation the shocked value.
	beta := 1.0
	a0 := Assumptions{D0: 1, Growth: 0.03, Beta: &beta}
	m0 := Market{RiskFree: 0.03, ERP: 0.05}
	a1, m1 := a0, m0
	a1.Growth -= 0.002
	m1.RiskFree += 0.004
	e, s0, err := ExplainBetween(a0, m0, a1, m1, Options{})
	if err != nil {
		t.Fatal(err)
	}
	v1, _ := Revalue(a0, m0, Options{}, Shock{RiskFree: 0.004, Growth: -0.002})
	if !relClose(e.DK, 0.004, 1e-12) || !relClose(e.DG, -0.002, 1e-12) || !relClose(e.Revaluation, v1/s0.Value-1, 1e-12) {
		t.Errorf("%+v", e)
	}
	// Remainder is third order: |Δ|³/(k−g)³ ≈ 0.006³/0.05³ ≈ 2e-3 at most.
	if math.Abs(e.Unexplained) > 2e-3 || math.Abs(e.Unexplained) > 0.1*math.Abs(e.Revaluation) {
		t.Errorf("unexplained %g of %g", e.Unexplained, e.Revaluation)
	}
}

func TestExplainPortfolio(t *testing.T) {
	// By hand: weights 0.75 and 0.25 of an included 800 (cash 200 at zero
	// return, one holding excluded): Taylor 0.75·(−0.05) = −0.0375,
	// revaluation 0.75·(−0.048) = −0.036, unexplained 0.0015.
	ps := []ExplainPosition{
		{ID: "A", MarketValue: 600, Explanation: ReturnExplanation{RateTerm: -0.05, Taylor: -0.05, Revaluation: -0.048}},
		{ID: "CASH", MarketValue: 200, Cash: true},
		{ID: "B", MarketValue: 200, Err: ErrNoDividend},
	}
	p, err := ExplainPortfolio(ps)
	if err != nil {
		t.Fatal(err)
	}
	if !relClose(p.Taylor, -0.0375, 1e-14) || !relClose(p.RateTerm, -0.0375, 1e-14) || !relClose(p.Revaluation, -0.036, 1e-14) ||
		!relClose(p.Unexplained, 0.0015, 1e-13) || len(p.Excluded) != 1 || !relClose(p.Excluded[0].Share, 0.2, 1e-15) {
		t.Errorf("%+v", p)
	}
	if _, err := ExplainPortfolio(ps[2:]); !errors.Is(err, ErrNoValue) {
		t.Errorf("nothing included: %v", err)
	}
}
