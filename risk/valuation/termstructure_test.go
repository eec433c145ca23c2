package valuation

import (
	"errors"
	"math"
	"testing"

	"plumbline/risk/curve"
)

func TestTermStructureFlatCurveIsConstantGrowth(t *testing.T) {
	// A flat curve (slope = curvature = 0) discounts every payment at
	// Level + spread, so the model must equal constant growth at that k for
	// any frequency and stub; the explicit-horizon sum and the terminal
	// series are rearrangements of the same geometric series: 1e-12.
	flat := curve.NelsonSiegel{Level: 0.04, Lambda: curve.DieboldLiLambda}
	for _, m := range []int{1, 4, 12} {
		for _, f := range []float64{0, 0.55} {
			ts, err := TermStructure{D0: 2, Frequency: m, StubFraction: f, Curve: flat, Spread: 0.05, G: 0.03}.Value()
			if err != nil {
				t.Fatal(err)
			}
			cg, _ := ConstantGrowth{D0: 2, Frequency: m, StubFraction: f, K: 0.09, G: 0.03}.Value()
			if !relClose(ts, cg, 1e-12) {
				t.Errorf("m=%d f=%g: term structure %.15g, constant growth %.15g", m, f, ts, cg)
			}
			// A flat growth curve at 3% is the same growth path.
			gc := curve.NelsonSiegel{Level: 0.03, Lambda: 0.1}
			tg, _ := TermStructure{D0: 2, Frequency: m, StubFraction: f, Curve: flat, Spread: 0.05, GrowthCurve: &gc}.Value()
			if !relClose(tg, cg, 1e-12) {
				t.Errorf("m=%d f=%g: flat growth curve %.15g, constant growth %.15g", m, f, tg, cg)
			}
		}
	}
	// Stage growth on a flat curve is the multi-stage model at one rate.
	stages := []Stage{{Years: 3, Growth: 0.12}, {Years: 4.5, Growth: 0.06}}
	ts, _ := TermStructure{D0: 1, Frequency: 4, StubFraction: 0.3, Curve: flat, Spread: 0.05, G: 0.03, Stages: stages}.Value()
	ms, _ := MultiStage{D0: 1, Frequency: 4, StubFraction: 0.3, K: 0.09, G: 0.03, Stages: stages}.Value()
	if !relClose(ts, ms, 1e-12) {
		t.Errorf("stages on flat curve %.15g, multi-stage %.15g", ts, ms)
	}
}

// bruteCurve sums the term-structure definition payment by payment with the
// loading formula of Diebold and Li (2006) written out, the tail continued
// at the long-end forward rate until payments vanish.
func bruteCurve(d0 float64, m int, f float64, c curve.NelsonSiegel, spread float64, gc curve.NelsonSiegel, horizon float64) float64 {
	ns := func(p curve.NelsonSiegel, months float64) float64 {
		x := p.Lambda * months
		l1 := (1 - math.Exp(-x)) / x
		return p.Level + p.Slope*l1 + p.Curvature*(l1-math.Exp(-x))
	}
	mf := float64(m)
	var pv, lastG, lastDF, lastT float64
	for j := 1; ; j++ {
		tau := float64(j) / mf
		t := tau - f/mf
		var g, df float64
		if t <= horizon+1e-9 {
			g = math.Pow(1+ns(gc, 12*tau), tau)
			df = math.Pow(1+ns(c, 12*t)+spread, -t)
			lastG, lastDF, lastT = g, df, t
		} else {
			g = lastG * math.Pow(1+gc.Level, t-lastT)
			df = lastDF * math.Pow(1+c.Level+spread, -(t-lastT))
		}
		x := d0 / mf * g * df
		pv += x
		if t > horizon && x < 1e-17*pv {
			return pv
		}
	}
}

func TestTermStructureMatchesPaymentSum(t *testing.T) {
	// Upward-sloping curve with a hump, growth curve fading from 9% to 3%.
	// Sum truncated below 1e-17 of the total; 1e-11 relative.
	c := curve.NelsonSiegel{Level: 0.05, Slope: -0.03, Curvature: 0.02, Lambda: curve.DieboldLiLambda}
	gc := curve.NelsonSiegel{Level: 0.03, Slope: 0.06, Curvature: -0.01, Lambda: 0.03}
	for _, m := range []int{1, 4} {
		v, err := TermStructure{D0: 1.5, Frequency: m, StubFraction: 0.35, Curve: c, Spread: 0.045, GrowthCurve: &gc, Horizon: 25}.Value()
		if err != nil {
			t.Fatal(err)
		}
		want := bruteCurve(1.5, m, 0.35, c, 0.045, gc, 25)
		if !relClose(v, want, 1e-11) {
			t.Errorf("m=%d: %.12f, payment sum %.12f", m, v, want)
		}
	}
}

func TestTermStructureFactorDurations(t *testing.T) {
	c := curve.NelsonSiegel{Level: 0.045, Slope: -0.02, Curvature: 0.015, Lambda: curve.DieboldLiLambda}
	beta := 1.1
	a := Assumptions{D0: 1.2, Growth: 0.03, Beta: &beta, Frequency: 4, StubFraction: 0.1,
		Stages: []Stage{{Years: 3, Growth: 0.10}, {Years: 3, Growth: 0.06}}}
	mkt := Market{RiskFree: 0.03, ERP: 0.05, Curve: &c}
	opt := Options{UseCurve: true}
	s, err := Analyze(a, mkt, opt)
	if err != nil {
		t.Fatal(err)
	}
	if s.Model != ModelTermStructure || !relClose(s.K, 0.045+1.1*0.05, 1e-15) || !relClose(s.Spread, 0.055, 1e-15) {
		t.Fatalf("model %v k %g spread %g", s.Model, s.K, s.Spread)
	}
	// Independent check through full revaluation of shocked inputs: a plain
	// central difference with h = 1e-5 has truncation error h²·V'''/(6V),
	// about h²/(k−g)³ ≈ 3e-7 here (k − g ≈ 0.07), and rounding error
	// ε/h ≈ 1e-11: within 1e-6 relative.
	h := 1e-5
	fd := func(up, down Shock) float64 {
		vu, err1 := Revalue(a, mkt, opt, up)
		vd, err2 := Revalue(a, mkt, opt, down)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		return -(vu - vd) / (2 * h * s.Value)
	}
	for _, c := range []struct {
		name string
		got  float64
		want float64
	}{
		{"level", s.NSLevelDuration, fd(Shock{NSLevel: h}, Shock{NSLevel: -h})},
		{"slope", s.NSSlopeDuration, fd(Shock{NSSlope: h}, Shock{NSSlope: -h})},
		{"curvature", s.NSCurvatureDuration, fd(Shock{NSCurvature: h}, Shock{NSCurvature: -h})},
		{"modified", s.ModifiedDuration, fd(Shock{Rate: h}, Shock{Rate: -h})},
		{"risk-free", s.RiskFreeDuration, fd(Shock{RiskFree: h}, Shock{RiskFree: -h})},
		{"beta", s.BetaDuration, fd(Shock{Beta: h}, Shock{Beta: -h})},
		{"ERP", s.ERPDuration, fd(Shock{ERP: h}, Shock{ERP: -h})},
		{"growth", -s.GrowthDuration, fd(Shock{Growth: h}, Shock{Growth: -h})},
	} {
		if !relClose(c.got, c.want, 1e-6) {
			t.Errorf("%s duration %.10g, revaluation difference %.10g", c.name, c.got, c.want)
		}
	}
	// Loadings satisfy 1 ≥ slope ≥ curvature ≥ 0 (Diebold and Li 2006), and
	// every payment has positive weight, so the factor durations are
	// ordered the same way.
	if !(s.NSLevelDuration > s.NSSlopeDuration && s.NSSlopeDuration > s.NSCurvatureDuration && s.NSCurvatureDuration > 0) {
		t.Errorf("factor durations not ordered: %g %g %g", s.NSLevelDuration, s.NSSlopeDuration, s.NSCurvatureDuration)
	}
	if s.Convexity <= 0 || s.StageRateDurations != nil || len(s.StageGrowthDurations) != 3 {
		t.Errorf("convexity %g, stage slices %v %v", s.Convexity, s.StageRateDurations, s.StageGrowthDurations)
	}
}

func TestTermStructureSelection(t *testing.T) {
	c := curve.NelsonSiegel{Level: 0.045, Slope: -0.02, Lambda: curve.DieboldLiLambda}
	beta := 1.0
	k := 0.09
	mkt := Market{RiskFree: 0.03, ERP: 0.05, Curve: &c}
	// An explicit discount rate wins over the curve (selection rule).
	s, err := Analyze(Assumptions{D0: 1, Growth: 0.02, Beta: &beta, DiscountRate: &k}, mkt, Options{UseCurve: true})
	if err != nil || s.Model != ModelConstantGrowth {
		t.Errorf("explicit k with UseCurve: %v, %v", s.Model, err)
	}
	// Without UseCurve the curve is ignored.
	s, err = Analyze(Assumptions{D0: 1, Growth: 0.02, Beta: &beta}, mkt, Options{})
	if err != nil || s.Model != ModelConstantGrowth || s.K != 0.08 {
		t.Errorf("no UseCurve: %v k=%g, %v", s.Model, s.K, err)
	}
	// Requested without a curve.
	_, err = Analyze(Assumptions{D0: 1, Growth: 0.02, Beta: &beta}, Market{RiskFree: 0.03, ERP: 0.05}, Options{UseCurve: true})
	if !errors.Is(err, ErrNoCurve) {
		t.Errorf("no curve: %v", err)
	}
	// A broken curve reports both this package's and the curve package's sentinel.
	bad := c
	bad.Lambda = 0
	_, err = Analyze(Assumptions{D0: 1, Growth: 0.02, Beta: &beta}, Market{Curve: &bad}, Options{UseCurve: true})
	if !errors.Is(err, ErrCurve) || !errors.Is(err, curve.ErrLambda) {
		t.Errorf("bad curve: %v", err)
	}
}

func TestTermStructureNumericsMatchClosedForms(t *testing.T) {
	// On a flat curve the term-structure model is constant growth, so its
	// effective measures (computed payment by payment) must match the
	// closed forms within their error estimates, for both growth
	// conventions.
	flat := curve.NelsonSiegel{Level: 0.035, Lambda: curve.DieboldLiLambda}
	beta := 0.9
	a := Assumptions{D0: 1.4, Growth: 0.025, Beta: &beta, Frequency: 2, StubFraction: 0.4}
	mkt := Market{RiskFree: 0.03, ERP: 0.05, Curve: &flat} // k = 0.035 + 0.045
	for _, conv := range []GrowthConvention{D0Fixed, D1Fixed} {
		s, err := Analyze(a, mkt, Options{UseCurve: true, GrowthConvention: conv})
		if err != nil {
			t.Fatal(err)
		}
		cf, _ := ConstantGrowth{D0: 1.4, K: 0.08, G: 0.025, Frequency: 2, StubFraction: 0.4}.Measures(conv)
		for _, c := range []struct {
			name         string
			num, want, e float64
		}{
			{"value", s.Value, cf.Value, 1e-12 * cf.Value},
			{"modified", s.ModifiedDuration, cf.ModifiedDuration, s.Errors.ModifiedDuration},
			{"Macaulay", s.MacaulayDuration, cf.MacaulayDuration, s.Errors.MacaulayDuration},
			{"convexity", s.Convexity, cf.Convexity, s.Errors.Convexity},
			{"growth", s.GrowthDuration, cf.GrowthDuration, s.Errors.GrowthDuration},
			{"growth convexity", s.GrowthConvexity, cf.GrowthConvexity, s.Errors.GrowthConvexity},
			{"cross", s.CrossKG, cf.CrossKG, s.Errors.CrossKG},
		} {
			if math.Abs(c.num-c.want) > c.e {
				t.Errorf("%v %s: %.12g, closed form %.12g (estimate %.3g)", conv, c.name, c.num, c.want, c.e)
			}
		}
	}
}
