// Package stress revalues a portfolio under hypothetical shocks and replays
// historical windows on the current holdings.
//
// It knows nothing of any valuation model: each Position carries a Revalue
// closure returning V_shocked/V_now and a set of model Sensitivities, so the
// package compares full revaluation with the second-order Taylor estimate
// built from those sensitivities. It is pure: no I/O, no clock, no logging.
//
// Conventions: amounts are in the base currency; rates, returns and
// weights are decimals (0.05 = 5%) unless the name carries BP (basis
// points, 1bp = 0.0001) or PP (percentage points, 1pp = 0.01).
package stress
