package stats

import (
	"errors"
	"fmt"
	"math"
)

// Errors returned (wrapped, with context) by this package.
var (
	ErrEmpty        = errors.New("empty input")
	ErrLength       = errors.New("mismatched lengths")
	ErrTooShort     = errors.New("too few observations")
	ErrWindow       = errors.New("invalid window")
	ErrLambda       = errors.New("decay factor lambda outside (0, 1)")
	ErrConfidence   = errors.New("confidence level outside (0, 1)")
	ErrNonFinite    = errors.New("NaN or infinite value")
	ErrNonPositive  = errors.New("non-positive value")
	ErrZeroVariance = errors.New("zero variance")
	ErrHorizon      = errors.New("invalid horizon")
	ErrMethod       = errors.New("unknown method")
	ErrDomain       = errors.New("outside the domain of the approximation")
)

// checkFinite returns an error wrapping ErrNonFinite naming the first NaN or
// infinite element of x.
func checkFinite(op string, x []float64) error {
	// Fast pass: v - v is 0 for a finite v and NaN for NaN or ±Inf, so the
	// sums stay 0 exactly when every element is finite.
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(x); i += 4 {
		s0 += x[i] - x[i]
		s1 += x[i+1] - x[i+1]
		s2 += x[i+2] - x[i+2]
		s3 += x[i+3] - x[i+3]
	}
	for ; i < len(x); i++ {
		s0 += x[i] - x[i]
	}
	if s0+s1+s2+s3 == 0 {
		return nil
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("stats: %s: element %d is %v: %w", op, i, v, ErrNonFinite)
		}
	}
	return nil
}

// checkConfidence refuses a confidence level outside the open interval (0, 1).
func checkConfidence(op string, c float64) error {
	if !(c > 0 && c < 1) {
		return fmt.Errorf("stats: %s: confidence %v: %w", op, c, ErrConfidence)
	}
	return nil
}
