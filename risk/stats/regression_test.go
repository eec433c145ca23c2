package stats

import (
	"errors"
	"testing"
)

// TestRegressionAgainstScipy: scipy 1.10 scipy.stats.linregress(bench, asset)
// (slope, intercept, rvalue²) and numpy std(asset - bench, ddof=1) on
// returns.csv. Tolerance 1e-10 relative (12-digit JSON, sums of 600 terms).
func TestRegressionAgainstScipy(t *testing.T) {
	ref := loadReference(t)
	asset, bench := assetReturns(t)
	reg, err := Regress(asset, bench)
	if err != nil {
		t.Fatal(err)
	}
	w := ref.Regression
	if !closeTo(reg.Beta, w.Beta, 1e-10, 0) || !closeTo(reg.Alpha, w.Alpha, 1e-10, 0) || !closeTo(reg.R2, w.R2, 1e-10, 0) {
		t.Errorf("regression %+v, scipy beta %v alpha %v r2 %v", reg, w.Beta, w.Alpha, w.R2)
	}
	b, _ := Beta(asset, bench)
	if b != reg.Beta {
		t.Errorf("Beta %v != Regress().Beta %v", b, reg.Beta)
	}
	te, err := TrackingError(asset, bench)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(te, w.TrackingError, 1e-10, 0) {
		t.Errorf("tracking error %v, numpy %v", te, w.TrackingError)
	}
}

// TestRegressionExactLine: y = 0.001 + 1.5x exactly gives beta 1.5, alpha
// 0.001, R² = 1 and a tracking error equal to 0.5·std(x) (definitions).
func TestRegressionExactLine(t *testing.T) {
	x := []float64{0.01, -0.02, 0.015, 0.003, -0.007}
	y := make([]float64, len(x))
	d := make([]float64, len(x))
	for i := range x {
		y[i] = 0.001 + 1.5*x[i]
		d[i] = y[i] - x[i]
	}
	reg, err := Regress(y, x)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(reg.Beta, 1.5, 1e-13, 0) || !closeTo(reg.Alpha, 0.001, 1e-11, 0) || !closeTo(reg.R2, 1, 1e-13, 0) {
		t.Errorf("%+v", reg)
	}
	te, _ := TrackingError(y, x)
	sd, _ := StdDev(d)
	if !closeTo(te, sd, 1e-15, 0) {
		t.Errorf("tracking error %v, std of differences %v", te, sd)
	}
}

func TestRegressionErrors(t *testing.T) {
	if _, err := Regress([]float64{1, 2, 3}, []float64{1, 2}); !errors.Is(err, ErrLength) {
		t.Errorf("length: %v", err)
	}
	if _, err := Regress([]float64{1, 2, 3}, []float64{2, 2, 2}); !errors.Is(err, ErrZeroVariance) {
		t.Errorf("constant x: %v", err)
	}
	if _, err := TrackingError([]float64{1}, []float64{1}); !errors.Is(err, ErrTooShort) {
		t.Errorf("short: %v", err)
	}
}
