package stats

import (
	"fmt"
	"math"
)

// Periods per year used to annualise statistics of periodic returns.
const (
	TradingDaysPerYear = 252
	WeeksPerYear       = 52
	MonthsPerYear      = 12
)

// AnnualizeVolatility scales a per-period standard deviation to a year:
//
//	σ_annual = σ_period * sqrt(periodsPerYear)
//
// which assumes independent, identically distributed returns. Use
// TradingDaysPerYear for daily, WeeksPerYear for weekly and MonthsPerYear for
// monthly data.
func AnnualizeVolatility(sigma float64, periodsPerYear int) (float64, error) {
	if periodsPerYear <= 0 {
		return 0, fmt.Errorf("stats: annualize volatility: %d periods per year: %w", periodsPerYear, ErrNonPositive)
	}
	if math.IsNaN(sigma) || math.IsInf(sigma, 0) {
		return 0, fmt.Errorf("stats: annualize volatility: sigma %v: %w", sigma, ErrNonFinite)
	}
	if sigma < 0 {
		return 0, fmt.Errorf("stats: annualize volatility: sigma %v: %w", sigma, ErrNonPositive)
	}
	return sigma * math.Sqrt(float64(periodsPerYear)), nil
}
