package valuation

import (
	"errors"
	"fmt"
)

// Sentinel errors. Every error returned by this package wraps one of them,
// usually inside an *InputError naming the field; test with errors.Is.
var (
	ErrNotFinite          = errors.New("valuation: input is NaN or infinite")
	ErrNegativeDividend   = errors.New("valuation: negative dividend")
	ErrNoDividend         = errors.New("valuation: zero dividend, so the dividend model value is zero and its sensitivities undefined")
	ErrGrowthNotBelowRate = errors.New("valuation: terminal growth is not below the discount rate (k <= g)")
	ErrGrowthOutOfRange   = errors.New("valuation: growth rate must exceed -1")
	ErrRateOutOfRange     = errors.New("valuation: discount rate must be positive")
	ErrStageLength        = errors.New("valuation: stage length must be positive (years)")
	ErrFrequency          = errors.New("valuation: payments per year must be 1, 2, 4 or 12")
	ErrStubFraction       = errors.New("valuation: stub fraction must be in [0, 1)")
	ErrMissingBeta        = errors.New("valuation: neither a beta nor a discount rate is given")
	ErrNoCurve            = errors.New("valuation: term-structure model requested but no curve supplied")
	ErrCurve              = errors.New("valuation: invalid Nelson-Siegel curve")
	ErrHorizon            = errors.New("valuation: term-structure horizon must be at least one year")
	ErrStep               = errors.New("valuation: difference step must be positive")
	ErrConvention         = errors.New("valuation: unknown growth convention")
	ErrNumerical          = errors.New("valuation: numerical derivative could not be evaluated")
	ErrLengthMismatch     = errors.New("valuation: series differ in length")
	ErrTooFewObservations = errors.New("valuation: too few observations")
	ErrWindow             = errors.New("valuation: rolling window must be at least 3")
	ErrZeroVariance       = errors.New("valuation: regressor has zero variance")
	ErrPosition           = errors.New("valuation: position market value is invalid")
	ErrNoValue            = errors.New("valuation: included market value is not positive")
	ErrNoSensitivities    = errors.New("valuation: holding has no sensitivities")
)

// InputError names the input that was refused. Unwrap returns the sentinel.
type InputError struct {
	Field string  // e.g. "growth", "stage 2 years", "beta"
	Value float64 // the value refused
	Err   error   // one of the sentinel errors above
}

// Error names the field and its value to four significant digits, enough
// to see what was refused without the noise of binary rounding
// (-0.0020000000000000018 reads -0.002); Value keeps it in full.
func (e *InputError) Error() string { return fmt.Sprintf("%v (%s = %.4g)", e.Err, e.Field, e.Value) }

// Unwrap returns the sentinel error.
func (e *InputError) Unwrap() error { return e.Err }

func inputErr(field string, v float64, err error) error {
	return &InputError{Field: field, Value: v, Err: err}
}
