package stress

import "errors"

// Errors returned by this package wrap one of these; test with errors.Is.
var (
	// ErrShock reports a shock with a non-finite or meaningless field.
	ErrShock = errors.New("stress: invalid shock")
	// ErrScenario reports a scenario without a name or with a duplicate name.
	ErrScenario = errors.New("stress: invalid scenario")
	// ErrPosition reports a position with a missing ID, a duplicate ID or a
	// non-finite number.
	ErrPosition = errors.New("stress: invalid position")
	// ErrPortfolio reports a portfolio whose total value is not positive.
	ErrPortfolio = errors.New("stress: portfolio value is not positive")
	// ErrHistory reports a return history that does not fit the positions.
	ErrHistory = errors.New("stress: invalid return history")
	// ErrWindow reports a replay window outside the history.
	ErrWindow = errors.New("stress: invalid window")
)
