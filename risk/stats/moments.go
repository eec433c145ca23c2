package stats

import (
	"fmt"
	"math"
)

// Mean returns the arithmetic mean of x:
//
//	mean = (1/n) Σ x_i
func Mean(x []float64) (float64, error) {
	if len(x) == 0 {
		return 0, fmt.Errorf("stats: mean: %w", ErrEmpty)
	}
	if err := checkFinite("mean", x); err != nil {
		return 0, err
	}
	return mean(x), nil
}

// StdDev returns the sample standard deviation of x (two-pass, n-1 divisor):
//
//	s = sqrt( Σ (x_i - mean)² / (n-1) )
func StdDev(x []float64) (float64, error) {
	if len(x) < 2 {
		return 0, fmt.Errorf("stats: std dev: %d observations, need 2: %w", len(x), ErrTooShort)
	}
	if err := checkFinite("std dev", x); err != nil {
		return 0, err
	}
	m := mean(x)
	return math.Sqrt(centralSum(x, m, 2) / float64(len(x)-1)), nil
}

// Skewness returns the adjusted Fisher-Pearson sample skewness of x:
//
//	G1 = sqrt(n(n-1))/(n-2) * m3 / m2^(3/2),   m_k = (1/n) Σ (x_i - mean)^k
//
// the bias-corrected estimator (scipy.stats.skew with bias=False). It needs
// at least 3 observations and refuses a constant series.
func Skewness(x []float64) (float64, error) {
	n := len(x)
	if n < 3 {
		return 0, fmt.Errorf("stats: skewness: %d observations, need 3: %w", n, ErrTooShort)
	}
	if err := checkFinite("skewness", x); err != nil {
		return 0, err
	}
	m := mean(x)
	fn := float64(n)
	m2 := centralSum(x, m, 2) / fn
	if m2 == 0 {
		return 0, fmt.Errorf("stats: skewness: constant series: %w", ErrZeroVariance)
	}
	m3 := centralSum(x, m, 3) / fn
	g1 := m3 / math.Pow(m2, 1.5)
	return math.Sqrt(fn*(fn-1)) / (fn - 2) * g1, nil
}

// ExcessKurtosis returns the bias-corrected sample excess kurtosis of x:
//
//	G2 = (n-1)/((n-2)(n-3)) * ((n+1) g2 + 6),   g2 = m4/m2² - 3
//
// (scipy.stats.kurtosis with fisher=True, bias=False). It is 0 for normal
// data, needs at least 4 observations and refuses a constant series.
func ExcessKurtosis(x []float64) (float64, error) {
	n := len(x)
	if n < 4 {
		return 0, fmt.Errorf("stats: excess kurtosis: %d observations, need 4: %w", n, ErrTooShort)
	}
	if err := checkFinite("excess kurtosis", x); err != nil {
		return 0, err
	}
	m := mean(x)
	fn := float64(n)
	m2 := centralSum(x, m, 2) / fn
	if m2 == 0 {
		return 0, fmt.Errorf("stats: excess kurtosis: constant series: %w", ErrZeroVariance)
	}
	m4 := centralSum(x, m, 4) / fn
	g2 := m4/(m2*m2) - 3
	return (fn - 1) / ((fn - 2) * (fn - 3)) * ((fn+1)*g2 + 6), nil
}

// mean is the two-pass corrected mean: the plain mean plus the mean of the
// residuals, which removes most of the rounding error of the first pass.
func mean(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	m := s / float64(len(x))
	var c float64
	for _, v := range x {
		c += v - m
	}
	return m + c/float64(len(x))
}

// centralSum returns Σ (x_i - m)^k for k in 2..4.
func centralSum(x []float64, m float64, k int) float64 {
	var s float64
	for _, v := range x {
		d := v - m
		switch k {
		case 2:
			s += d * d
		case 3:
			s += d * d * d
		default:
			s += d * d * d * d
		}
	}
	return s
}
