// Package curve evaluates and fits Nelson–Siegel zero-coupon yield curves.
//
// Conventions:
//   - Tenors τ are in months, as in Diebold and Li (2006).
//   - Yields are decimal, annually compounded zero-coupon yields (0.04 = 4%).
//   - The decay λ is per month. The curvature loading peaks at τ* = x*/λ months,
//     where x* ≈ 1.79328 solves e^{−x}(1 + x + x²) = 1.
//   - The discount factor for τ months is (1 + y(τ))^(−τ/12).
//
// The package is pure computation: no I/O, no clock, no logging. Invalid input
// returns an error that matches one of the sentinel errors with errors.Is.
package curve
