// Package stats holds the risk statistics of return series: rolling mean and
// standard deviation, EWMA volatility, drawdowns, covariance matrices, risk
// contributions, beta and tracking error, value at risk and expected
// shortfall, and VaR backtests.
//
// Conventions, unless a function says otherwise:
//   - Returns are decimals (0.01 is 1%) for one period each, oldest first.
//   - "Sample" statistics divide by n-1 (Bessel's correction).
//   - Losses are reported as positive numbers: a VaR of 0.02 is a loss of 2%
//     of the starting value.
//   - Annualisation uses 252 trading days, 52 weeks or 12 months per year
//     (see TradingDaysPerYear); volatilities scale by the square root.
//
// The package does pure computation: no I/O, no clock, no logging. Input
// that makes no sense (empty series, mismatched lengths, a window longer than
// the data, NaN or infinite values, a confidence outside (0, 1) ...) is
// refused with an error that wraps one of the Err values below, so callers
// can test it with errors.Is.
package stats
