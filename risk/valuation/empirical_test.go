package valuation

import (
	"errors"
	"math"
	"testing"
)

func TestEmpiricalDurationAnscombe(t *testing.T) {
	// Regression against R's lm on Anscombe I (regression_test.go): the
	// empirical duration is minus the slope.
	r, err := EmpiricalDuration(anscombeY, anscombeX)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.EmpiricalDuration+0.5001) > rPrintTol || math.Abs(r.SlopeStdErr-0.1179) > rPrintTol ||
		math.Abs(r.RSquared-0.6665) > rPrintTol || r.End != 10 {
		t.Errorf("%+v", r)
	}
}

func TestRollingEmpiricalDuration(t *testing.T) {
	// Weekly returns built exactly as r = 0.001 − D·Δy with D = 2 for the
	// first 30 weeks and D = 6 after: windows inside a regime recover D to
	// rounding (1e-9, yield changes are ~1e-3) with R² = 1.
	n, w := 60, 20
	dy := make([]float64, n)
	ret := make([]float64, n)
	for i := range n {
		dy[i] = 0.001 * math.Cos(float64(i)*1.3)
		d := 2.0
		if i >= 30 {
			d = 6
		}
		ret[i] = 0.001 - d*dy[i]
	}
	rs, err := RollingEmpiricalDuration(ret, dy, w)
	if err != nil {
		t.Fatal(err)
	}
	if len(rs) != n-w+1 {
		t.Fatalf("%d windows, want %d", len(rs), n-w+1)
	}
	for i, r := range rs {
		if r.End != i+w-1 || r.N != w {
			t.Fatalf("window %d: end %d n %d", i, r.End, r.N)
		}
		start := r.End - w + 1
		switch {
		case r.End < 30:
			if math.Abs(r.EmpiricalDuration-2) > 1e-9 || math.Abs(r.RSquared-1) > 1e-9 {
				t.Errorf("window ending %d: %+v", r.End, r)
			}
		case start >= 30:
			if math.Abs(r.EmpiricalDuration-6) > 1e-9 {
				t.Errorf("window ending %d: %+v", r.End, r)
			}
		}
	}
	// By hand: yields 3.00%, 3.10%, 3.05% → changes +10 bp, −5 bp.
	ch, err := YieldChanges([]float64{0.03, 0.031, 0.0305})
	if err != nil || len(ch) != 2 || math.Abs(ch[0]-0.001) > 1e-15 || math.Abs(ch[1]+0.0005) > 1e-15 {
		t.Errorf("YieldChanges = %v, %v", ch, err)
	}
}

func TestEmpiricalDurationErrors(t *testing.T) {
	x := []float64{0.001, -0.002, 0.0005, 0.003}
	cases := []struct {
		name string
		err  error
		want error
	}{
		{"mismatch", second2(EmpiricalDuration(x, x[:3])), ErrLengthMismatch},
		{"two weeks", second2(EmpiricalDuration(x[:2], x[:2])), ErrTooFewObservations},
		{"constant yields", second2(EmpiricalDuration(x, []float64{0.001, 0.001, 0.001, 0.001})), ErrZeroVariance},
		{"Inf return", second2(EmpiricalDuration([]float64{0, math.Inf(1), 0, 0}, x)), ErrNotFinite},
		{"window 2", second3(RollingEmpiricalDuration(x, x, 2)), ErrWindow},
		{"window too long", second3(RollingEmpiricalDuration(x, x, 5)), ErrTooFewObservations},
		{"rolling mismatch", second3(RollingEmpiricalDuration(x, x[:3], 3)), ErrLengthMismatch},
		{"one yield", second3(YieldChanges([]float64{0.03})), ErrTooFewObservations},
		{"NaN yield", second3(YieldChanges([]float64{0.03, math.NaN()})), ErrNotFinite},
	}
	for _, c := range cases {
		if !errors.Is(c.err, c.want) {
			t.Errorf("%s: %v, want %v", c.name, c.err, c.want)
		}
	}
}

func second2(_ RateSensitivity, err error) error { return err }

func second3[T any](_ []T, err error) error { return err }
