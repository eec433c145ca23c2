package valuation

import (
	"math"
	"testing"
)

func TestGordonTextbookExamples(t *testing.T) {
	cases := []struct {
		name      string
		d1, k, g  float64
		want, tol float64
	}{
		// Brealey, Myers and Allen, Principles of Corporate Finance, ch. 4
		// constant-growth example (from memory): next dividend $3.00,
		// r = 12%, g = 8%. By hand: 3.00/(0.12 − 0.08) = 3.00/0.04 = 75.00.
		// Exact arithmetic, so 1e-12 relative.
		{"BMA constant growth", 3.00, 0.12, 0.08, 75.00, 1e-12},
		// Ross, Westerfield and Jaffe, Corporate Finance, stock valuation
		// chapter (from memory): terminal part of the differential-growth
		// example, D6 = 1.15⁵·1.10 = 2.2125 (by hand: 1.15⁵ = 2.011357,
		// ×1.10 = 2.212492), r = 15%, g = 10%: 2.212492/0.05 = 44.2498.
		{"RWJ terminal value", 1.15 * 1.15 * 1.15 * 1.15 * 1.15 * 1.10, 0.15, 0.10, 44.2498, 1e-5},
	}
	for _, c := range cases {
		v, err := GordonValue(c.d1, c.k, c.g)
		if err != nil || !relClose(v, c.want, c.tol) {
			t.Errorf("%s: GordonValue = %.6f, %v; want %.6f", c.name, v, err, c.want)
		}
	}
	// D0 form, common practice: D1 = D0(1+g). By hand: D0 = 2, g = 5%,
	// k = 10%: 2.10/0.05 = 42.
	if v, err := GordonValueD0(2, 0.10, 0.05); err != nil || !relClose(v, 42, 1e-12) {
		t.Errorf("GordonValueD0 = %v, %v; want 42", v, err)
	}
	// Quarterly payments: a level perpetuity of 1.00 a quarter (D0 = 4,
	// g = 0) at 10% a year is 1/((1.10)^{1/4} − 1), the perpetuity formula
	// at the equivalent quarterly rate (common practice). By hand:
	// 1.10^{0.25} = e^{0.25·0.0953102} = e^{0.0238275} = 1.0241137, so
	// V = 1/0.0241137 = 41.4702; six significant figures, so 1e-5 relative.
	if v, err := (ConstantGrowth{D0: 4, K: 0.10, Frequency: 4}).Value(); err != nil || !relClose(v, 41.4702, 1e-5) {
		t.Errorf("quarterly perpetuity = %v, %v; want 41.4702", v, err)
	}
	// The generalised model with annual payments and no stub is Gordon.
	if v, err := (ConstantGrowth{D0: 2, K: 0.10, G: 0.05}).Value(); err != nil || !relClose(v, 42, 1e-12) {
		t.Errorf("ConstantGrowth.Value = %v, %v; want 42", v, err)
	}
}

func TestConstantGrowthTextbookForms(t *testing.T) {
	// Annual payments, no stub. Textbook forms (common practice), obtained by
	// differentiating V = D0(1+g)/(k−g) by hand:
	//   dV/dk = −V/(k−g)                    → modified 1/(k−g)
	//   Macaulay = (1+k)·modified = (1+k)/(k−g)
	//   d²V/dk² = 2V/(k−g)²                 → convexity 2/(k−g)²
	//   dV/dg = D0(1+k)/(k−g)²              → (1+k)/((1+g)(k−g)) = 1/(k−g) + 1/(1+g)
	//   d²V/dg² = 2D0(1+k)/(k−g)³           → 2(1+k)/((1+g)(k−g)²)
	//   d²V/dkdg = −D0(2+k+g)/(k−g)³        → −(2+k+g)/((1+g)(k−g)²)
	// and with D1 fixed (V = D1/(k−g)): 1/(k−g), 2/(k−g)², −2/(k−g)².
	// Closed forms evaluated two ways agree to rounding: 1e-12 relative.
	for _, kg := range [][2]float64{{0.09, 0.04}, {0.08, 0.07}, {0.12, -0.02}, {0.06, 0}} {
		k, g := kg[0], kg[1]
		gap := k - g
		d0, err := ConstantGrowth{D0: 1.5, K: k, G: g}.Measures(D0Fixed)
		if err != nil {
			t.Fatal(err)
		}
		d1, _ := ConstantGrowth{D0: 1.5, K: k, G: g}.Measures(D1Fixed)
		checks := []struct {
			name      string
			got, want float64
		}{
			{"value", d0.Value, 1.5 * (1 + g) / gap},
			{"modified", d0.ModifiedDuration, 1 / gap},
			{"Macaulay", d0.MacaulayDuration, (1 + k) / gap},
			{"convexity", d0.Convexity, 2 / (gap * gap)},
			{"growth D0", d0.GrowthDuration, 1/gap + 1/(1+g)},
			{"growth convexity D0", d0.GrowthConvexity, 2 * (1 + k) / ((1 + g) * gap * gap)},
			{"cross D0", d0.CrossKG, -(2 + k + g) / ((1 + g) * gap * gap)},
			{"growth D1", d1.GrowthDuration, 1 / gap},
			{"growth convexity D1", d1.GrowthConvexity, 2 / (gap * gap)},
			{"cross D1", d1.CrossKG, -2 / (gap * gap)},
			{"modified D1", d1.ModifiedDuration, 1 / gap},
		}
		for _, c := range checks {
			if !relClose(c.got, c.want, 1e-12) {
				t.Errorf("k=%g g=%g %s = %.15g, want %.15g", k, g, c.name, c.got, c.want)
			}
		}
	}
}

func TestConstantGrowthValueMatchesPaymentSum(t *testing.T) {
	// The frequency/stub closed form against the payment-by-payment sum of
	// its definition (doc.go). The sum is truncated below 1e-17 of the
	// total; rounding over up to ~10⁵ terms stays below 1e-11 relative.
	for _, m := range []int{1, 2, 4, 12} {
		for _, f := range []float64{0, 0.25, 0.6, 0.95} {
			c := ConstantGrowth{D0: 1.2, K: 0.085, G: 0.035, Frequency: m, StubFraction: f}
			v, err := c.Value()
			if err != nil {
				t.Fatal(err)
			}
			want := bruteStages(1.2, m, f, nil, 0.085, 0.035)
			if !relClose(v, want, 1e-11) {
				t.Errorf("m=%d f=%g: %.12f, sum %.12f", m, f, v, want)
			}
		}
	}
}

func TestClosedFormMatchesNumerical(t *testing.T) {
	// Closed forms against effective measures from central differences with
	// Richardson extrapolation on the generic stage evaluator. Each
	// difference must lie within the reported error estimate, and within
	// 1e-6 relative (the estimate bounds the h/2 difference's truncation
	// error, (h/(k−g))² ≈ 1e-5 at most here, and the extrapolation is
	// far better).
	beta := 1.1
	for _, tc := range []struct {
		g    float64
		m    int
		f    float64
		conv GrowthConvention
	}{
		{0.03, 1, 0, D0Fixed}, {0.03, 1, 0, D1Fixed}, {0.05, 4, 0.3, D0Fixed},
		{0.06, 12, 0.9, D1Fixed}, {-0.01, 2, 0.5, D0Fixed}, {0.075, 4, 0, D0Fixed},
	} {
		a := Assumptions{D0: 2, Growth: tc.g, Beta: &beta, Frequency: tc.m, StubFraction: tc.f}
		mkt := Market{RiskFree: 0.035, ERP: 0.045}
		cf, err := Analyze(a, mkt, Options{GrowthConvention: tc.conv})
		if err != nil {
			t.Fatal(err)
		}
		nu, err := Analyze(a, mkt, Options{GrowthConvention: tc.conv, Numerical: true})
		if err != nil {
			t.Fatal(err)
		}
		if cf.Numerical || !nu.Numerical {
			t.Fatalf("Numerical flags: closed %v, numerical %v", cf.Numerical, nu.Numerical)
		}
		for _, c := range []struct {
			name           string
			closed, num, e float64
		}{
			{"modified", cf.ModifiedDuration, nu.ModifiedDuration, nu.Errors.ModifiedDuration},
			{"Macaulay", cf.MacaulayDuration, nu.MacaulayDuration, nu.Errors.MacaulayDuration},
			{"convexity", cf.Convexity, nu.Convexity, nu.Errors.Convexity},
			{"growth", cf.GrowthDuration, nu.GrowthDuration, nu.Errors.GrowthDuration},
			{"growth convexity", cf.GrowthConvexity, nu.GrowthConvexity, nu.Errors.GrowthConvexity},
			{"cross", cf.CrossKG, nu.CrossKG, nu.Errors.CrossKG},
			{"risk-free", cf.RiskFreeDuration, nu.RiskFreeDuration, nu.Errors.RiskFreeDuration},
		} {
			diff := math.Abs(c.closed - c.num)
			if diff > c.e || !relClose(c.num, c.closed, 1e-6) {
				t.Errorf("%+v %s: closed %.12g numerical %.12g (error estimate %.3g)", tc, c.name, c.closed, c.num, c.e)
			}
		}
	}
}

func TestMacaulayIsModifiedTimesOnePlusK(t *testing.T) {
	// Under one flat yield, Macaulay = (1+y)·modified (Macaulay 1938;
	// common practice for bonds, here for the dividend stream). The
	// numerical cases are independent central differences (a rate shift and
	// a continuously compounded shift): 1e-8 relative.
	beta := 0.9
	mkt := Market{RiskFree: 0.03, ERP: 0.05} // k = 7.5%
	for _, a := range []Assumptions{
		{D0: 1, Growth: 0.03, Beta: &beta},
		{D0: 1, Growth: 0.03, Beta: &beta, Frequency: 4, StubFraction: 0.5},
		{D0: 1, Growth: 0.02, Beta: &beta, Frequency: 12, StubFraction: 0.2,
			Stages: []Stage{{Years: 4, Growth: 0.12}, {Years: 3, Growth: 0.06}, {Years: 2, Growth: 0.04}}},
	} {
		s, err := Analyze(a, mkt, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if !relClose(s.MacaulayDuration, (1+s.K)*s.ModifiedDuration, 1e-8) {
			t.Errorf("%v: Macaulay %.12g, (1+k)·modified %.12g", s.Model, s.MacaulayDuration, (1+s.K)*s.ModifiedDuration)
		}
	}
}

func TestDurationGrowsAsGapNarrows(t *testing.T) {
	// Property (common practice): with k fixed, duration and convexity rise
	// as g approaches k, without bound (1/(k−g) and 2/(k−g)² for Gordon).
	k := 0.09
	for _, stages := range [][]Stage{nil, {{Years: 3, Growth: 0.1}, {Years: 4, Growth: 0.06}}} {
		prevD, prevC := 0.0, 0.0
		for _, g := range []float64{-0.02, 0, 0.03, 0.06, 0.08, 0.089} {
			s, err := Analyze(Assumptions{D0: 1, Growth: g, DiscountRate: &k, Stages: stages}, Market{}, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if s.ModifiedDuration <= prevD || s.Convexity <= prevC || s.GrowthDuration <= 0 {
				t.Errorf("%v g=%g: duration %g (prev %g), convexity %g (prev %g)", s.Model, g, s.ModifiedDuration, prevD, s.Convexity, prevC)
			}
			prevD, prevC = s.ModifiedDuration, s.Convexity
		}
	}
}
