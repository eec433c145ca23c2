package pack

import "errors"

// Errors returned by Compute wrap one of these, with the portfolio, the
// as-of date and what is missing; test with errors.Is. A problem confined
// to one holding never returns an error: it becomes an Exclusion or a
// Finding of the Document.
var (
	// ErrInputs reports inputs that make no sense as a whole: no Inputs,
	// no as-of date.
	ErrInputs = errors.New("pack: invalid inputs")
	// ErrParams reports parameters that make no sense (a window of zero
	// days, a decay outside (0, 1), an invalid limit or scenario ...).
	ErrParams = errors.New("pack: invalid parameters")
	// ErrNoHoldings reports a portfolio without a holdings snapshot on or
	// before the as-of date, or whose value there is not positive.
	ErrNoHoldings = errors.New("pack: no holdings")
	// ErrNoPrices reports inputs without any usable price on or before the
	// as-of date, or without a usable price for every held security.
	ErrNoPrices = errors.New("pack: no prices")
	// ErrNoMarketData reports a missing yield curve or equity risk premium
	// on or before the as-of date.
	ErrNoMarketData = errors.New("pack: no market data")
)
