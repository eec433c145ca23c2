package valuation

// BetaWindowWeeks is the estimation window of EstimateBeta: two years of
// weekly returns.
const BetaWindowWeeks = 104

// MinBetaWeeks is the fewest weekly observations EstimateBeta accepts.
const MinBetaWeeks = 52

// EstimateBeta estimates CAPM beta as the OLS slope of the security's weekly
// total returns on the benchmark's weekly total returns:
//
//	r_s,t = α + β·r_b,t + ε_t
//
// over the last BetaWindowWeeks (104) aligned weeks, or all of them when
// fewer are given; at least MinBetaWeeks (52) are required. The two series
// are decimal simple returns aligned by week, oldest first; the benchmark is
// the portfolio's benchmark. Regression.Slope is β, with its standard error
// and R².
func EstimateBeta(security, benchmark []float64) (Regression, error) {
	if len(security) != len(benchmark) {
		return Regression{}, inputErr("benchmark length", float64(len(benchmark)), ErrLengthMismatch)
	}
	if len(security) < MinBetaWeeks {
		return Regression{}, inputErr("weekly observations", float64(len(security)), ErrTooFewObservations)
	}
	if n := len(security); n > BetaWindowWeeks {
		security, benchmark = security[n-BetaWindowWeeks:], benchmark[n-BetaWindowWeeks:]
	}
	return regress(benchmark, security)
}
