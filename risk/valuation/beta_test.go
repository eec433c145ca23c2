package valuation

import (
	"errors"
	"math"
	"testing"
)

func TestEstimateBetaAnscombe(t *testing.T) {
	// Anscombe I (regression_test.go) repeated five times: 55 weeks,
	// enough for EstimateBeta. Replicating every pair leaves the OLS
	// intercept, slope and R² unchanged; the slope's standard error scales
	// by √((n−2)/(5n−2)) = √(9/53) (by hand: SE² = SSE/((n−2)·Sxx), with SSE
	// and Sxx both ×5), so 0.117906·0.412082 = 0.048587.
	var bench, sec []float64
	for range 5 {
		bench = append(bench, anscombeX...)
		sec = append(sec, anscombeY...)
	}
	r, err := EstimateBeta(sec, bench)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.Slope-0.5001) > rPrintTol || math.Abs(r.Alpha-3.0001) > rPrintTol ||
		math.Abs(r.RSquared-0.6665) > rPrintTol || math.Abs(r.SlopeStdErr-0.048587) > 1e-6 || r.N != 55 {
		t.Errorf("%+v", r)
	}
}

func TestEstimateBetaUsesLast104Weeks(t *testing.T) {
	// 150 weeks: the first 46 follow β = 0.2, the last 104 exactly
	// β = 1.3 (r_s = 0.001 + 1.3·r_b), so a 104-week window recovers 1.3
	// to rounding (1e-12).
	var bench, sec []float64
	for i := range 150 {
		rb := 0.02 * math.Sin(float64(i)*0.7)
		b := 1.3
		if i < 46 {
			b = 0.2
		}
		bench = append(bench, rb)
		sec = append(sec, 0.001+b*rb)
	}
	r, err := EstimateBeta(sec, bench)
	if err != nil || math.Abs(r.Slope-1.3) > 1e-12 || r.N != BetaWindowWeeks || math.Abs(r.RSquared-1) > 1e-12 {
		t.Errorf("%+v, %v", r, err)
	}
}

func TestEstimateBetaErrors(t *testing.T) {
	flat := make([]float64, 60)
	some := make([]float64, 60)
	for i := range some {
		some[i] = float64(i%7) * 0.01
	}
	withNaN := append([]float64(nil), some...)
	withNaN[10] = math.NaN()
	cases := []struct {
		name     string
		sec, ben []float64
		want     error
	}{
		{"length mismatch", some, some[:59], ErrLengthMismatch},
		{"too few weeks", some[:51], some[:51], ErrTooFewObservations},
		{"NaN return", withNaN, some, ErrNotFinite},
		{"constant benchmark", some, flat, ErrZeroVariance},
	}
	for _, c := range cases {
		if _, err := EstimateBeta(c.sec, c.ben); !errors.Is(err, c.want) {
			t.Errorf("%s: %v, want %v", c.name, err, c.want)
		}
	}
}
