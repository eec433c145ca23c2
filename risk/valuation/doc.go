// Package valuation values equities with dividend models and measures their
// sensitivity to discount rates and growth, per holding and per portfolio.
//
// It is pure computation: no I/O, no clock, no logging. Nonsense input
// (k ≤ g, a negative dividend, a stage of zero length, NaN or infinite
// values, ...) returns an error wrapping one of the sentinel errors in
// errors.go, usually as an *InputError naming the field; never a NaN.
//
// # Conventions
//
//   - Rates, growth and returns are decimal annual rates, annually
//     compounded (0.05 = 5%). Basis points are named as such (BasisPoint).
//   - D0 is the trailing annual dividend per share; Frequency m ∈ {1, 2, 4,
//     12} payments a year (0 means 1).
//   - Payment clock: τ counts years from the last dividend payment. Payment
//     j ≥ 1 falls at τ_j = j/m and pays (D0/m)·G(τ_j), G being the dividend
//     growth index (G(0) = 1). So D1 = D0·G(1) is the dividend of the next
//     year; each payment grows by (1+g)^{1/m} on the previous one.
//   - Stub: StubFraction f ∈ [0, 1) of the current payment period has
//     elapsed; the valuation date is at τ = f/m, and payment j is
//     t_j = (j − f)/m years away. With m = 1 and f = 0 the constant-growth
//     model is Gordon's V = D1/(k−g) exactly.
//   - Stages run on the payment clock from the last payment; each has its
//     own growth and (optionally) discount rate, chained: the discount factor
//     to τ is Π (1+k_i)^{−τ_i}. A payment on a stage boundary belongs to the
//     earlier stage.
//   - Model selection: term structure when Options.UseCurve and the holding
//     has no explicit DiscountRate; else multi-stage when it has Stages; else
//     constant growth. k is the explicit DiscountRate when given, else CAPM
//     rf + β·ERP. Beta comes from the assumptions; where absent the caller
//     estimates it with EstimateBeta (OLS slope of 104 weekly total returns
//     on the benchmark's).
//
// # Sign conventions of the measures
//
//   - Modified duration −(1/V) dV/dk (positive); Macaulay duration Σ t·PV/V
//     in years (= (1+k)·modified under one flat k); convexity
//     (1/V) d²V/dk² (positive).
//   - Growth duration +(1/V) dV/dg (positive) and growth convexity
//     (1/V) d²V/dg², with D0 held fixed by default (D1Fixed optional). For
//     Gordon: 1/(k−g) + 1/(1+g) with D0 fixed, 1/(k−g) with D1 fixed.
//   - Cross term (1/V) d²V/(dk dg) (negative for Gordon).
//   - CAPM form: −(1/V) dV/drf, −(1/V) dV/dβ, −(1/V) dV/dERP.
//   - Per-stage and Nelson–Siegel factor durations: −(1/V) dV/dx for rates
//     and factors, +(1/V) dV/dg_i for stage growth.
//   - Dollar duration: currency change of value for +1 bp in k,
//     −D·MV·0.0001 (negative for positive duration).
//
// Constant growth uses closed forms; the multi-stage and term-structure
// models use effective measures by central differences with Richardson
// extrapolation and report error estimates.
package valuation
