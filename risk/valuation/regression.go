package valuation

import (
	"math"

	"gonum.org/v1/gonum/stat"
)

// Regression is an ordinary least-squares line y = Alpha + Slope·x.
type Regression struct {
	Alpha       float64
	Slope       float64
	SlopeStdErr float64 // √(s²/Σ(x−x̄)²) with s² = Σ residual² / (n−2)
	RSquared    float64 // 1 − Σ residual² / Σ (y−ȳ)²
	N           int
}

// regress fits y on x by OLS (gonum stat.LinearRegression and
// stat.RSquared) and adds the slope's standard error. It needs n ≥ 3
// finite pairs and a regressor with positive variance.
func regress(x, y []float64) (Regression, error) {
	if len(x) != len(y) {
		return Regression{}, inputErr("series length", float64(len(y)), ErrLengthMismatch)
	}
	n := len(x)
	if n < 3 {
		return Regression{}, inputErr("observations", float64(n), ErrTooFewObservations)
	}
	for i := range x {
		if !finite(x[i]) {
			return Regression{}, inputErr("regressor", x[i], ErrNotFinite)
		}
		if !finite(y[i]) {
			return Regression{}, inputErr("response", y[i], ErrNotFinite)
		}
	}
	xm := stat.Mean(x, nil)
	var sxx float64
	for _, v := range x {
		sxx += (v - xm) * (v - xm)
	}
	if !(sxx > 0) {
		return Regression{}, inputErr("regressor variance", sxx, ErrZeroVariance)
	}
	alpha, beta := stat.LinearRegression(x, y, nil, false)
	var sse float64
	for i := range x {
		e := y[i] - alpha - beta*x[i]
		sse += e * e
	}
	r := Regression{Alpha: alpha, Slope: beta, N: n, SlopeStdErr: math.Sqrt(sse / float64(n-2) / sxx)}
	// R² is undefined (0/0) for a constant response; report 0 there: the
	// line explains none of a variation that does not exist.
	if stat.Variance(y, nil) > 0 {
		r.RSquared = stat.RSquared(x, y, nil, alpha, beta)
	}
	return r, nil
}
