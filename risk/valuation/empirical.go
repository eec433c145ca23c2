package valuation

// RateSensitivity is the empirical rate sensitivity of a holding or a
// portfolio over one window.
type RateSensitivity struct {
	Regression                // weekly total return on weekly yield change (decimal)
	EmpiricalDuration float64 // −Slope, years: comparable with ModifiedDuration
	End               int     // index of the window's last observation
}

// EmpiricalDuration regresses weekly total returns on weekly changes of a
// chosen zero-yield tenor,
//
//	r_t = α + b·Δy_t + ε_t,   empirical duration = −b
//
// with r decimal simple returns and Δy = y_t − y_{t−1} in decimal (0.0001 =
// 1 bp), aligned by week. It reports the slope's standard error and R². For a
// portfolio, pass the portfolio's weekly total returns.
//
// Empirical equity durations are typically far shorter than model
// durations: the constant-growth 1/(k−g) is often 20 to 50 years, while
// return regressions give single digits or even negative values, because
// rates move together with expected growth and risk premia that the model
// holds fixed (from memory: Leibowitz, "Total portfolio duration", Financial
// Analysts Journal 1986; Reilly, Wright and Johnson, "Analysis of the
// interest rate sensitivity of common stocks", Journal of Portfolio
// Management 2007). Report both; neither replaces the other.
func EmpiricalDuration(returns, yieldChanges []float64) (RateSensitivity, error) {
	r, err := regress(yieldChanges, returns)
	if err != nil {
		return RateSensitivity{}, err
	}
	return RateSensitivity{Regression: r, EmpiricalDuration: -r.Slope, End: len(returns) - 1}, nil
}

// RollingEmpiricalDuration applies EmpiricalDuration to every window of
// `window` consecutive weeks; result i covers observations i … i+window−1.
// Windows whose yield changes are all equal fail with ErrZeroVariance.
func RollingEmpiricalDuration(returns, yieldChanges []float64, window int) ([]RateSensitivity, error) {
	if len(returns) != len(yieldChanges) {
		return nil, inputErr("yield changes length", float64(len(yieldChanges)), ErrLengthMismatch)
	}
	if window < 3 {
		return nil, inputErr("window", float64(window), ErrWindow)
	}
	if len(returns) < window {
		return nil, inputErr("observations", float64(len(returns)), ErrTooFewObservations)
	}
	out := make([]RateSensitivity, 0, len(returns)-window+1)
	for end := window; end <= len(returns); end++ {
		rs, err := EmpiricalDuration(returns[end-window:end], yieldChanges[end-window:end])
		if err != nil {
			return nil, err
		}
		rs.End = end - 1
		out = append(out, rs)
	}
	return out, nil
}

// YieldChanges returns Δy_t = y_t − y_{t−1} for t = 1 … n−1 (decimal).
func YieldChanges(yields []float64) ([]float64, error) {
	if len(yields) < 2 {
		return nil, inputErr("yields", float64(len(yields)), ErrTooFewObservations)
	}
	out := make([]float64, len(yields)-1)
	for i := 1; i < len(yields); i++ {
		for _, y := range yields[i-1 : i+1] {
			if !finite(y) {
				return nil, inputErr("yield", y, ErrNotFinite)
			}
		}
		out[i-1] = yields[i] - yields[i-1]
	}
	return out, nil
}
