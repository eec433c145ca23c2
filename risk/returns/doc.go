// Package returns computes returns: security total returns from prices,
// dividends and splits, daily portfolio values from holdings snapshots,
// time-weighted returns in the GIPS manner (revaluation at large external
// flows, Modified Dietz between them, geometric linking), period returns
// (week-, month-, quarter-, year-to-date, since inception), averages, and
// indices built from constituents.
//
// Conventions:
//   - Returns are decimals (0.05 is 5%). Dates are time.Time values at UTC
//     midnight; only the calendar date is used.
//   - Split ratio s: new shares per old share, effective at the open of its
//     date; dividends D are cash per post-split share going ex on their date
//     and are reinvested at that day's close (the GIPS assumption), so the
//     total return of day t is r_t = s_t (P_t + D_t) / P_{t-1} - 1.
//   - External cash flows are end-of-day: a flow F_t dated t is in the
//     closing value V_t and earns nothing on day t; the value just before it
//     is V_t - F_t.
//   - Annualisation: period returns longer than 365 calendar days are
//     annualised as (1+R)^(365/days) - 1 (actual/365); statistics of periodic
//     returns use 252 trading days, 52 weeks or 12 months a year.
//
// The package does pure computation: no I/O, no clock, no logging. Input
// that makes no sense is refused with an error wrapping one of the Err values.
package returns
