package stats

import (
	"fmt"
	"math"
)

// Regression is the ordinary least-squares line y = Alpha + Beta·x.
//
//	Beta  = Σ (x_i - x̄)(y_i - ȳ) / Σ (x_i - x̄)²
//	Alpha = ȳ - Beta·x̄
//	R2    = Beta² Σ (x_i - x̄)² / Σ (y_i - ȳ)²
//
// Alpha is per period, in the units of y.
type Regression struct {
	Alpha, Beta, R2 float64
	N               int
}

// Regress fits y on x by least squares; for a beta, y is the asset or
// portfolio returns and x the benchmark returns over the same periods.
// It refuses fewer than 3 observations and a constant x.
func Regress(y, x []float64) (Regression, error) {
	if len(y) != len(x) {
		return Regression{}, fmt.Errorf("stats: regression: %d y values, %d x values: %w", len(y), len(x), ErrLength)
	}
	if len(x) < 3 {
		return Regression{}, fmt.Errorf("stats: regression: %d observations, need 3: %w", len(x), ErrTooShort)
	}
	if err := checkFinite("regression", y); err != nil {
		return Regression{}, err
	}
	if err := checkFinite("regression", x); err != nil {
		return Regression{}, err
	}
	mx, my := mean(x), mean(y)
	var sxx, syy, sxy float64
	for i := range x {
		dx, dy := x[i]-mx, y[i]-my
		sxx += dx * dx
		syy += dy * dy
		sxy += dx * dy
	}
	if sxx == 0 {
		return Regression{}, fmt.Errorf("stats: regression: constant x: %w", ErrZeroVariance)
	}
	b := sxy / sxx
	reg := Regression{Alpha: my - b*mx, Beta: b, N: len(x)}
	if syy > 0 {
		reg.R2 = sxy * sxy / (sxx * syy)
	}
	return reg, nil
}

// Beta returns the OLS slope of asset returns on benchmark returns,
// Cov(r_a, r_b) / Var(r_b); see Regress.
func Beta(asset, bench []float64) (float64, error) {
	reg, err := Regress(asset, bench)
	if err != nil {
		return 0, err
	}
	return reg.Beta, nil
}

// TrackingError returns the sample standard deviation (n-1 divisor) of the
// active returns a_t = r_p,t - r_b,t, per period:
//
//	TE = sqrt( Σ (a_t - ā)² / (n-1) )
//
// Annualise with AnnualizeVolatility (× sqrt(252) for daily returns).
func TrackingError(port, bench []float64) (float64, error) {
	if len(port) != len(bench) {
		return 0, fmt.Errorf("stats: tracking error: %d portfolio returns, %d benchmark returns: %w", len(port), len(bench), ErrLength)
	}
	if len(port) < 2 {
		return 0, fmt.Errorf("stats: tracking error: %d observations, need 2: %w", len(port), ErrTooShort)
	}
	if err := checkFinite("tracking error", port); err != nil {
		return 0, err
	}
	if err := checkFinite("tracking error", bench); err != nil {
		return 0, err
	}
	a := make([]float64, len(port))
	for i := range port {
		a[i] = port[i] - bench[i]
	}
	m := mean(a)
	return math.Sqrt(centralSum(a, m, 2) / float64(len(a)-1)), nil
}
