package curve

import (
	"fmt"
	"math"
)

// DieboldLiLambda is the decay per month fixed by Diebold and Li (2006),
// "Forecasting the term structure of government bond yields", Journal of
// Econometrics 130, chosen so that the curvature loading peaks near 30 months.
const DieboldLiLambda = 0.0609

// curvaturePeakX solves e^{−x}(1 + x + x²) = 1, the stationarity condition of
// the curvature loading (1−e^{−x})/x − e^{−x} in x = λτ.
const curvaturePeakX = 1.7932821329007613

// NelsonSiegel is a zero-coupon yield curve in the Diebold–Li parameterisation:
//
//	y(τ) = Level + Slope·(1−e^{−λτ})/(λτ) + Curvature·((1−e^{−λτ})/(λτ) − e^{−λτ})
//
// with τ in months, λ per month and y a decimal annually compounded zero yield.
// y(0) = Level + Slope and y(∞) = Level. The zero value is not a valid curve
// (λ must be positive).
type NelsonSiegel struct {
	Level     float64 // β0, decimal: long-end limit of the curve
	Slope     float64 // β1, decimal: short end minus long end
	Curvature float64 // β2, decimal: medium-term hump
	Lambda    float64 // λ, decay per month, > 0
}

// Validate reports whether every parameter is finite and λ > 0.
func (ns NelsonSiegel) Validate() error {
	for _, p := range [...]struct {
		name string
		v    float64
	}{{"level", ns.Level}, {"slope", ns.Slope}, {"curvature", ns.Curvature}, {"lambda", ns.Lambda}} {
		if math.IsNaN(p.v) || math.IsInf(p.v, 0) {
			return &InputError{Field: p.name, Value: p.v, Err: ErrNotFinite}
		}
	}
	if ns.Lambda <= 0 {
		return &InputError{Field: "lambda", Value: ns.Lambda, Err: ErrLambda}
	}
	return nil
}

// Loadings returns the slope and curvature loadings at x = λτ:
//
//	slope     = (1−e^{−x})/x
//	curvature = (1−e^{−x})/x − e^{−x}
//
// with their limits 1 and 0 at x = 0. τ must be ≥ 0 and λ > 0; Loadings does
// not check (it sits in inner loops; use Validate on the curve).
func Loadings(lambda, tenorMonths float64) (slope, curvature float64) {
	x := lambda * tenorMonths
	if x < 1e-6 {
		// Taylor series; the next terms are O(x³) < 1e-18.
		return 1 - x/2 + x*x/6, x/2 - x*x/3
	}
	e := math.Exp(-x)
	slope = -math.Expm1(-x) / x
	return slope, slope - e
}

// Yield returns y(τ), the decimal annually compounded zero yield at τ months.
func (ns NelsonSiegel) Yield(tenorMonths float64) float64 {
	l1, l2 := Loadings(ns.Lambda, tenorMonths)
	return ns.Level + ns.Slope*l1 + ns.Curvature*l2
}

// DiscountFactor returns (1 + y(τ))^(−τ/12), the present value of 1 paid in τ months.
func (ns NelsonSiegel) DiscountFactor(tenorMonths float64) float64 {
	return math.Exp(-tenorMonths / 12 * math.Log1p(ns.Yield(tenorMonths)))
}

// CurvaturePeak returns τ* = x*/λ, the tenor in months at which the curvature
// loading is largest (x* ≈ 1.79328). For λ = DieboldLiLambda it is about 29.4.
func CurvaturePeak(lambda float64) float64 { return curvaturePeakX / lambda }

// String formats the curve for diagnostics.
func (ns NelsonSiegel) String() string {
	return fmt.Sprintf("NS(level=%.6g slope=%.6g curvature=%.6g lambda=%.6g/month)", ns.Level, ns.Slope, ns.Curvature, ns.Lambda)
}
