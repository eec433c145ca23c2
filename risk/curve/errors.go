package curve

import (
	"errors"
	"fmt"
)

// Sentinel errors; every error returned by this package wraps one of them.
var (
	ErrNotFinite      = errors.New("curve: value is NaN or infinite")
	ErrLambda         = errors.New("curve: decay lambda must be positive")
	ErrTenor          = errors.New("curve: tenor must be positive (months)")
	ErrYield          = errors.New("curve: yield must exceed -1")
	ErrLengthMismatch = errors.New("curve: tenors and yields differ in length")
	ErrTooFewTenors   = errors.New("curve: fewer than 4 distinct tenors")
	ErrLambdaRange    = errors.New("curve: invalid lambda search range")
	ErrSingular       = errors.New("curve: loadings are collinear for every lambda tried")
)

// InputError names the offending input. Unwrap gives the sentinel error.
type InputError struct {
	Field string
	Value float64
	Err   error
}

func (e *InputError) Error() string { return fmt.Sprintf("%v (%s = %g)", e.Err, e.Field, e.Value) }

// Unwrap returns the sentinel error.
func (e *InputError) Unwrap() error { return e.Err }
