package curve

import (
	"errors"
	"math"
	"testing"
)

func TestLoadingsDieboldLi(t *testing.T) {
	// Loading formulas and λ = 0.0609/month from Diebold and Li (2006),
	// "Forecasting the term structure of government bond yields", eq. (3).
	// Hand computation at τ = 30 months: x = 0.0609·30 = 1.827,
	// e^{−1.827} = e^{−1.8}·e^{−0.027} = 0.165299·0.973361 = 0.160896,
	// slope = (1 − 0.160896)/1.827 = 0.839104/1.827 = 0.459280,
	// curvature = 0.459280 − 0.160896 = 0.298384.
	// Hand values carry six decimals, hence the 2e-6 tolerance.
	cases := []struct {
		tau, slope, curv float64
		tol              float64
	}{
		{30, 0.459280, 0.298384, 2e-6},
		// τ = 0: limits 1 and 0 (l'Hôpital), exact.
		{0, 1, 0, 1e-15},
		// τ = 12: x = 0.7308, e^{−x} = e^{−0.7}·e^{−0.0308} = 0.496585·0.969669 = 0.481523,
		// slope = 0.518477/0.7308 = 0.709464, curvature = 0.709464 − 0.481523 = 0.227941.
		{12, 0.709464, 0.227941, 2e-6},
	}
	for _, c := range cases {
		s, k := Loadings(DieboldLiLambda, c.tau)
		if math.Abs(s-c.slope) > c.tol || math.Abs(k-c.curv) > c.tol {
			t.Errorf("Loadings(%g) = (%.7f, %.7f), want (%.6f, %.6f)", c.tau, s, k, c.slope, c.curv)
		}
	}
}

func TestCurvaturePeakNear30Months(t *testing.T) {
	// Diebold and Li (2006) pick λ = 0.0609 so that the curvature loading
	// peaks at about 30 months. Locate the maximum by golden-section search
	// on the loading itself (independent of CurvaturePeak's constant).
	f := func(tau float64) float64 { _, c := Loadings(DieboldLiLambda, tau); return -c }
	a, b := 1.0, 120.0
	g := (math.Sqrt(5) - 1) / 2
	for b-a > 1e-9 {
		c, d := b-g*(b-a), a+g*(b-a)
		if f(c) < f(d) {
			b = d
		} else {
			a = c
		}
	}
	peak := (a + b) / 2
	// "near 30 months": within one month. (The exact value is 29.45.)
	if math.Abs(peak-30) > 1 {
		t.Fatalf("curvature peak at %.3f months, want 30 ± 1", peak)
	}
	// CurvaturePeak must agree with the search to the search's resolution;
	// the flat top limits locating the maximum to about √ε relative.
	if got := CurvaturePeak(DieboldLiLambda); math.Abs(got-peak) > 1e-4 {
		t.Fatalf("CurvaturePeak = %.6f, search found %.6f", got, peak)
	}
	// x* solves e^{−x}(1 + x + x²) = 1 (first-order condition, by hand).
	x := curvaturePeakX
	if r := math.Exp(-x)*(1+x+x*x) - 1; math.Abs(r) > 1e-15 {
		t.Fatalf("stationarity residual %g", r)
	}
}

func TestLoadingsSeriesContinuity(t *testing.T) {
	// The small-x branch must join the closed form: both are accurate to
	// ~1e-16 near x = 1e-6 (series truncation error O(x³)).
	lam := 1.0
	for _, x := range []float64{0.999999e-6, 1e-6, 1.000001e-6} {
		s, c := Loadings(lam, x)
		es := -math.Expm1(-x) / x
		ec := es - math.Exp(-x)
		if math.Abs(s-es) > 1e-15 || math.Abs(c-ec) > 1e-12 {
			t.Errorf("x=%g: (%g, %g) vs (%g, %g)", x, s, c, es, ec)
		}
	}
}

func TestYieldAndDiscount(t *testing.T) {
	ns := NelsonSiegel{Level: 0.05, Slope: -0.02, Curvature: 0.01, Lambda: DieboldLiLambda}
	// y(0) = β0 + β1 and y(∞) = β0: limits of the loadings (Diebold and Li 2006).
	if y := ns.Yield(0); math.Abs(y-0.03) > 1e-15 {
		t.Errorf("y(0) = %g, want 0.03", y)
	}
	if y := ns.Yield(1e7); math.Abs(y-0.05) > 1e-6 {
		t.Errorf("y(∞) = %g, want 0.05", y)
	}
	// Annual compounding (common practice): a flat 5% curve discounts 24
	// months by 1/1.05² = 0.9070294784580499 (by hand: 1/1.1025).
	flat := NelsonSiegel{Level: 0.05, Lambda: DieboldLiLambda}
	if d := flat.DiscountFactor(24); math.Abs(d-1/1.1025) > 1e-15 {
		t.Errorf("DF(24) = %.16f, want %.16f", d, 1/1.1025)
	}
}

func TestValidate(t *testing.T) {
	cases := []struct {
		name string
		ns   NelsonSiegel
		want error
	}{
		{"valid", NelsonSiegel{Level: 0.04, Lambda: 0.06}, nil},
		{"zero lambda", NelsonSiegel{Level: 0.04}, ErrLambda},
		{"negative lambda", NelsonSiegel{Level: 0.04, Lambda: -0.1}, ErrLambda},
		{"NaN level", NelsonSiegel{Level: math.NaN(), Lambda: 0.06}, ErrNotFinite},
		{"Inf slope", NelsonSiegel{Slope: math.Inf(1), Lambda: 0.06}, ErrNotFinite},
		{"NaN curvature", NelsonSiegel{Curvature: math.NaN(), Lambda: 0.06}, ErrNotFinite},
		{"Inf lambda", NelsonSiegel{Lambda: math.Inf(1)}, ErrNotFinite},
	}
	for _, c := range cases {
		err := c.ns.Validate()
		if !errors.Is(err, c.want) || (c.want == nil) != (err == nil) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
		}
		var ie *InputError
		if c.want != nil && !errors.As(err, &ie) {
			t.Errorf("%s: error %v is not an *InputError", c.name, err)
		}
	}
}
