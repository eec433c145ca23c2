package stats

import (
	"fmt"
	"math"
)

// RiskMetricsLambda is the decay factor commonly used for daily returns
// (RiskMetrics Technical Document, 1996): λ = 0.94.
const RiskMetricsLambda = 0.94

// EWMAVariance returns the exponentially weighted moving average of squared
// returns, zero-mean convention:
//
//	s_0 = r_0²,   s_t = λ s_{t-1} + (1-λ) r_t²
//
// s_t uses the returns up to and including r_t, so it is the variance
// forecast for period t+1. The seed r_0² is the convention of pandas'
// ewm(alpha=1-λ, adjust=False); use EWMAVarianceSeeded for another seed.
// λ must lie in (0, 1); 0.94 (RiskMetricsLambda) is usual for daily data.
func EWMAVariance(r []float64, lambda float64) ([]float64, error) {
	if len(r) == 0 {
		return nil, fmt.Errorf("stats: ewma variance: %w", ErrEmpty)
	}
	if err := checkFinite("ewma variance", r); err != nil {
		return nil, err
	}
	return EWMAVarianceSeeded(r[1:], lambda, r[0]*r[0], true)
}

// EWMAVarianceSeeded runs the EWMA recursion from a given starting variance
// s_{-1} = seed (for example the sample variance of a start-up sample):
//
//	s_t = λ s_{t-1} + (1-λ) r_t²,   t = 0 .. n-1
//
// If keepSeed is true the seed itself is the first element of the result
// (len n+1), otherwise the result has one element per return.
func EWMAVarianceSeeded(r []float64, lambda, seed float64, keepSeed bool) ([]float64, error) {
	if !(lambda > 0 && lambda < 1) {
		return nil, fmt.Errorf("stats: ewma variance: lambda %v: %w", lambda, ErrLambda)
	}
	if math.IsNaN(seed) || math.IsInf(seed, 0) {
		return nil, fmt.Errorf("stats: ewma variance: seed %v: %w", seed, ErrNonFinite)
	}
	if seed < 0 {
		return nil, fmt.Errorf("stats: ewma variance: seed %v: %w", seed, ErrNonPositive)
	}
	if err := checkFinite("ewma variance", r); err != nil {
		return nil, err
	}
	out := make([]float64, 0, len(r)+1)
	if keepSeed {
		out = append(out, seed)
	}
	s := seed
	for _, v := range r {
		s = lambda*s + (1-lambda)*v*v
		out = append(out, s)
	}
	return out, nil
}

// EWMAVolatility returns the square root of EWMAVariance(r, lambda): the
// per-period volatility forecast for the period after each return.
func EWMAVolatility(r []float64, lambda float64) ([]float64, error) {
	v, err := EWMAVariance(r, lambda)
	if err != nil {
		return nil, err
	}
	for i := range v {
		v[i] = math.Sqrt(v[i])
	}
	return v, nil
}
