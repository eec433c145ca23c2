package returns

import (
	"fmt"
	"math"
)

// ArithmeticMean returns (1/n) Σ x_i. For returns it overstates the growth
// actually achieved when returns vary (see GeometricMeanReturn).
func ArithmeticMean(x []float64) (float64, error) {
	if len(x) == 0 {
		return 0, fmt.Errorf("returns: arithmetic mean: %w", ErrEmpty)
	}
	if err := checkFinite("arithmetic mean", x); err != nil {
		return 0, err
	}
	var s float64
	for _, v := range x {
		s += v
	}
	return s / float64(len(x)), nil
}

// GeometricMeanReturn returns the constant per-period return that compounds
// to the same result as the returns r:
//
//	g = ( Π (1 + r_i) )^(1/n) - 1
//
// computed through logarithms, exp( (1/n) Σ ln(1 + r_i) ) - 1. Every return
// must be above -1.
func GeometricMeanReturn(r []float64) (float64, error) {
	if len(r) == 0 {
		return 0, fmt.Errorf("returns: geometric mean return: %w", ErrEmpty)
	}
	var s float64
	for i, v := range r {
		if !isFinite(v) {
			return 0, fmt.Errorf("returns: geometric mean return: return %d is %v: %w", i, v, ErrNonFinite)
		}
		if v <= -1 {
			return 0, fmt.Errorf("returns: geometric mean return: return %d is %v: %w", i, v, ErrReturn)
		}
		s += math.Log1p(v)
	}
	return math.Expm1(s / float64(len(r))), nil
}

// GeometricMean returns the geometric mean of positive values:
//
//	G = exp( (1/n) Σ ln x_i )
func GeometricMean(x []float64) (float64, error) {
	if err := checkPositive("geometric mean", x); err != nil {
		return 0, err
	}
	var s float64
	for _, v := range x {
		s += math.Log(v)
	}
	return math.Exp(s / float64(len(x))), nil
}

// HarmonicMean returns the harmonic mean of positive values:
//
//	H = n / Σ (1/x_i)
func HarmonicMean(x []float64) (float64, error) {
	if err := checkPositive("harmonic mean", x); err != nil {
		return 0, err
	}
	w := make([]float64, len(x))
	for i := range w {
		w[i] = 1
	}
	return WeightedHarmonicMean(x, w)
}

// WeightedHarmonicMean returns the weighted harmonic mean of positive values
// with non-negative weights (not all zero):
//
//	H = Σ w_i / Σ (w_i / x_i)
func WeightedHarmonicMean(x, w []float64) (float64, error) {
	if len(x) != len(w) {
		return 0, fmt.Errorf("returns: weighted harmonic mean: %d values, %d weights: %w", len(x), len(w), ErrLength)
	}
	if err := checkPositive("weighted harmonic mean", x); err != nil {
		return 0, err
	}
	sw, err := checkWeights("weighted harmonic mean", w)
	if err != nil {
		return 0, err
	}
	var s float64
	for i := range x {
		s += w[i] / x[i]
	}
	return sw / s, nil
}

// ValueWeightedRatio returns the value-weighted harmonic mean of ratios such
// as price/earnings, computed through their reciprocals (the earnings
// yields):
//
//	ratio_p = Σ w_i / Σ w_i y_i,   y_i = den_i / num_i   (E_i / P_i for P/E)
//
// With w_i the market value held in security i this is total value divided
// by the earnings that value owns, the look-through P/E. Working with yields
// keeps every holding in: a tiny or zero denominator gives a small or zero
// yield instead of a huge or infinite ratio, and a loss (negative earnings)
// lowers the aggregate yield, as it lowers the earnings owned, instead of
// being dropped. Numerators (prices) must be positive and weights
// non-negative. When the aggregate yield Σ w_i y_i is zero or negative the
// ratio is undefined and ErrUndefined is returned.
func ValueWeightedRatio(w, num, den []float64) (float64, error) {
	if len(w) != len(num) || len(w) != len(den) {
		return 0, fmt.Errorf("returns: value-weighted ratio: %d weights, %d numerators, %d denominators: %w", len(w), len(num), len(den), ErrLength)
	}
	if err := checkPositive("value-weighted ratio", num); err != nil {
		return 0, err
	}
	if err := checkFinite("value-weighted ratio", den); err != nil {
		return 0, err
	}
	sw, err := checkWeights("value-weighted ratio", w)
	if err != nil {
		return 0, err
	}
	var sy float64
	for i := range w {
		sy += w[i] * den[i] / num[i]
	}
	if sy <= 0 {
		return 0, fmt.Errorf("returns: value-weighted ratio: aggregate yield %v: %w", sy/sw, ErrUndefined)
	}
	return sw / sy, nil
}

// AnnualizeMean converts a mean per-period return to a year with
// periodsPerYear periods (252 trading days, 52 weeks, 12 months):
// arithmetic means scale linearly, m·p; geometric means compound,
// (1+g)^p - 1.
func AnnualizeMean(m float64, periodsPerYear int, geometric bool) (float64, error) {
	if periodsPerYear <= 0 {
		return 0, fmt.Errorf("returns: annualize mean: %d periods per year: %w", periodsPerYear, ErrNonPositive)
	}
	if !isFinite(m) {
		return 0, fmt.Errorf("returns: annualize mean: %v: %w", m, ErrNonFinite)
	}
	if !geometric {
		return m * float64(periodsPerYear), nil
	}
	if m <= -1 {
		return 0, fmt.Errorf("returns: annualize mean: %v: %w", m, ErrReturn)
	}
	return math.Pow(1+m, float64(periodsPerYear)) - 1, nil
}

func checkPositive(op string, x []float64) error {
	if len(x) == 0 {
		return fmt.Errorf("returns: %s: %w", op, ErrEmpty)
	}
	for i, v := range x {
		if !isFinite(v) || v <= 0 {
			return fmt.Errorf("returns: %s: value %d is %v: %w", op, i, v, ErrNonPositive)
		}
	}
	return nil
}

// checkWeights requires finite non-negative weights with a positive sum,
// which it returns.
func checkWeights(op string, w []float64) (float64, error) {
	var s float64
	for i, v := range w {
		if !isFinite(v) || v < 0 {
			return 0, fmt.Errorf("returns: %s: weight %d is %v: %w", op, i, v, ErrWeights)
		}
		s += v
	}
	if s <= 0 {
		return 0, fmt.Errorf("returns: %s: weights sum to %v: %w", op, s, ErrWeights)
	}
	return s, nil
}
