package curve

import (
	"errors"
	"math"
	"testing"
)

// Maturities (months) of the Diebold and Li (2006) data set.
var dlTenors = []float64{3, 6, 9, 12, 15, 18, 21, 24, 30, 36, 48, 60, 72, 84, 96, 108, 120}

func synth(ns NelsonSiegel, tenors []float64) []float64 {
	y := make([]float64, len(tenors))
	for i, t := range tenors {
		// Published loading formula, Diebold and Li (2006) eq. (3), written
		// out here rather than through Yield so the test does not reuse it.
		x := ns.Lambda * t
		l1 := (1 - math.Exp(-x)) / x
		y[i] = ns.Level + ns.Slope*l1 + ns.Curvature*(l1-math.Exp(-x))
	}
	return y
}

func TestFitRecoversSyntheticCurve(t *testing.T) {
	cases := []NelsonSiegel{
		// λ on the Diebold–Li value, upward-sloping curve with a hump.
		{Level: 0.06, Slope: -0.02, Curvature: 0.015, Lambda: DieboldLiLambda},
		// λ off any grid point, inverted curve with a trough.
		{Level: 0.045, Slope: 0.01, Curvature: -0.02, Lambda: 0.0437},
		// Fast decay.
		{Level: 0.035, Slope: -0.015, Curvature: 0.005, Lambda: 0.21},
	}
	for _, want := range cases {
		res, err := Fit(dlTenors, synth(want, dlTenors), FitOptions{})
		if err != nil {
			t.Fatalf("%v: %v", want, err)
		}
		got := res.Curve
		// Exact data: the fit should reach the generating parameters to what
		// the optimizer's gradient threshold (1e-12 in percent²) allows; 1e-8
		// absolute on decimal betas (1e-6 bp) and 1e-6 relative on λ is loose.
		if math.Abs(got.Level-want.Level) > 1e-8 || math.Abs(got.Slope-want.Slope) > 1e-8 ||
			math.Abs(got.Curvature-want.Curvature) > 1e-8 || math.Abs(got.Lambda/want.Lambda-1) > 1e-6 {
			t.Errorf("fit %v, want %v (grid λ %g, polished %v)", got, want, res.GridLambda, res.Polished)
		}
		if res.RMSE > 1e-9 {
			t.Errorf("RMSE %g on exact data", res.RMSE)
		}
	}
}

func TestFitNoisyCurve(t *testing.T) {
	want := NelsonSiegel{Level: 0.05, Slope: -0.02, Curvature: 0.01, Lambda: DieboldLiLambda}
	y := synth(want, dlTenors)
	// Deterministic ±2 bp pattern standing in for measurement noise.
	pattern := []float64{1, -1, -1, 1, 0, 1, -1}
	for i := range y {
		y[i] += 0.0002 * pattern[i%len(pattern)]
	}
	res, err := Fit(dlTenors, y, FitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// Least squares cannot do worse than the generating curve, whose RMSE
	// is at most the 2 bp noise amplitude.
	if res.RMSE > 0.0002 {
		t.Errorf("RMSE %g above noise amplitude", res.RMSE)
	}
	// The long end is pinned by many tenors: level within 25 bp.
	if math.Abs(res.Curve.Level-want.Level) > 0.0025 {
		t.Errorf("level %g, want about %g", res.Curve.Level, want.Level)
	}
	again, _ := Fit(dlTenors, y, FitOptions{})
	if again != res {
		t.Errorf("fit not deterministic: %+v vs %+v", again, res)
	}
}

func TestFitErrors(t *testing.T) {
	good := synth(NelsonSiegel{Level: 0.05, Slope: -0.01, Lambda: DieboldLiLambda}, dlTenors)
	nan := append([]float64(nil), good...)
	nan[3] = math.NaN()
	low := append([]float64(nil), good...)
	low[0] = -1
	negTenor := append([]float64(nil), dlTenors...)
	negTenor[0] = -3
	cases := []struct {
		name   string
		tenors []float64
		yields []float64
		opt    FitOptions
		want   error
	}{
		{"length mismatch", dlTenors, good[:5], FitOptions{}, ErrLengthMismatch},
		{"three tenors", []float64{12, 24, 36}, []float64{0.03, 0.035, 0.04}, FitOptions{}, ErrTooFewTenors},
		{"repeated tenors", []float64{12, 12, 24, 24, 36}, []float64{0.03, 0.03, 0.035, 0.035, 0.04}, FitOptions{}, ErrTooFewTenors},
		{"NaN yield", dlTenors, nan, FitOptions{}, ErrNotFinite},
		{"Inf tenor", []float64{12, 24, math.Inf(1), 48}, []float64{0.03, 0.03, 0.03, 0.03}, FitOptions{}, ErrNotFinite},
		{"negative tenor", negTenor, good, FitOptions{}, ErrTenor},
		{"yield -100%", dlTenors, low, FitOptions{}, ErrYield},
		{"inverted range", dlTenors, good, FitOptions{LambdaMin: 0.5, LambdaMax: 0.1}, ErrLambdaRange},
		{"negative range", dlTenors, good, FitOptions{LambdaMin: -0.5}, ErrLambdaRange},
	}
	for _, c := range cases {
		_, err := Fit(c.tenors, c.yields, c.opt)
		if !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
		}
	}
}

func BenchmarkFit(b *testing.B) {
	y := synth(NelsonSiegel{Level: 0.05, Slope: -0.02, Curvature: 0.01, Lambda: 0.0437}, dlTenors)
	for b.Loop() {
		if _, err := Fit(dlTenors, y, FitOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}
