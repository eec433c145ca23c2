package pack

import (
	"errors"
	"fmt"
	"math"
	"time"

	"plumbline/risk/limits"
	"plumbline/risk/stress"
)

// Params are the parameters of one pack run. They carry no defaults: the
// configuration fills every field (one source of truth for defaults).
// Units: days are trading days unless a name says calendar days; rates and
// fractions are decimals.
type Params struct {
	// RiskFreeTenorMonths picks the zero yield used as rf in k = rf + β·ERP,
	// interpolated linearly in tenor when the curve lacks that tenor.
	RiskFreeTenorMonths int
	// GrowthConvention is "d0" (trailing dividend held fixed when growth
	// moves) or "d1" (next year's dividend held fixed).
	GrowthConvention string
	// RollingWindows are the rolling-volatility windows, trading days.
	RollingWindows []int
	// EWMALambda is the decay of the EWMA variance, in (0, 1).
	EWMALambda float64
	// VaRLookbackDays is the number of daily returns behind VaR and ES,
	// benchmark beta and tracking error.
	VaRLookbackDays int
	// BacktestDays is the number of days of the 99% 1-day VaR backtest.
	BacktestDays int
	// LargeFlowFraction is the GIPS large-flow threshold as a fraction of
	// value (a flow at or above it triggers a revaluation).
	LargeFlowFraction float64
	// EmpiricalTenorMonths is the zero yield whose weekly changes the
	// empirical duration regresses on; EmpiricalWindowWeeks its window.
	EmpiricalTenorMonths int
	EmpiricalWindowWeeks int
	// BetaWindowWeeks is the window of weekly total returns for a beta
	// the assumptions do not give.
	BetaWindowWeeks int
	// StalePriceDays is how many calendar days an old close may be carried
	// for a holding without a close on the as-of date before it is excluded.
	StalePriceDays int
	// UseCurve values holdings without an explicit discount rate with the
	// term-structure model on the fitted curve; false uses constant growth
	// (or multi-stage when the assumptions have stages).
	UseCurve bool
	// Scenarios are the stress scenarios, in report order.
	Scenarios []stress.Scenario
	// WorstWindowDays is the length of the worst historical window searched
	// for on the current holdings, trading days.
	WorstWindowDays int
	// Replays are named historical windows replayed on current holdings.
	Replays []NamedWindow
	// Limits are the committee's limits, evaluated in order.
	Limits []limits.Limit
	// Drift sets when a headline metric's change is flagged.
	Drift DriftParams
	// HistoryDays is the number of most recent days kept in Series.
	HistoryDays int
}

// NamedWindow is a historical window, From and To inclusive calendar
// dates.
type NamedWindow struct {
	Name     string
	From, To time.Time
}

// Validate returns every problem with the parameters, each wrapping
// ErrParams.
func (p Params) Validate() error {
	var errs []error
	bad := func(format string, a ...any) {
		errs = append(errs, fmt.Errorf("%w: "+format, append([]any{ErrParams}, a...)...))
	}
	tenor := func(name string, v int) {
		if v < 1 || v > 600 {
			bad("%s %d is outside 1..600 months", name, v)
		}
	}
	tenor("risk-free tenor", p.RiskFreeTenorMonths)
	tenor("empirical tenor", p.EmpiricalTenorMonths)
	if p.GrowthConvention != "d0" && p.GrowthConvention != "d1" {
		bad("growth convention %q: want \"d0\" or \"d1\"", p.GrowthConvention)
	}
	if len(p.RollingWindows) == 0 {
		bad("no rolling window")
	}
	seen := map[int]bool{}
	for _, w := range p.RollingWindows {
		if w < 2 {
			bad("rolling window %d is below 2 days", w)
		}
		if seen[w] {
			bad("rolling window %d given twice", w)
		}
		seen[w] = true
	}
	if !(p.EWMALambda > 0 && p.EWMALambda < 1) {
		bad("EWMA lambda %v is outside (0, 1)", p.EWMALambda)
	}
	if p.VaRLookbackDays < 2 {
		bad("VaR lookback %d is below 2 days", p.VaRLookbackDays)
	}
	if p.BacktestDays < 1 {
		bad("backtest of %d days", p.BacktestDays)
	}
	if math.IsNaN(p.LargeFlowFraction) || math.IsInf(p.LargeFlowFraction, 0) || p.LargeFlowFraction < 0 {
		bad("large-flow fraction %v is not a non-negative number", p.LargeFlowFraction)
	}
	if p.EmpiricalWindowWeeks < 3 {
		bad("empirical window %d is below 3 weeks", p.EmpiricalWindowWeeks)
	}
	if p.BetaWindowWeeks < 3 {
		bad("beta window %d is below 3 weeks", p.BetaWindowWeeks)
	}
	if p.StalePriceDays < 0 {
		bad("stale-price days %d is negative", p.StalePriceDays)
	}
	if p.WorstWindowDays < 1 {
		bad("worst window of %d days", p.WorstWindowDays)
	}
	if p.HistoryDays < 1 {
		bad("history of %d days", p.HistoryDays)
	}
	if math.IsNaN(p.Drift.ZThreshold) || p.Drift.ZThreshold <= 0 {
		bad("drift z threshold %v is not positive", p.Drift.ZThreshold)
	}
	if p.Drift.MinHistory < 0 {
		bad("drift minimum history %d is negative", p.Drift.MinHistory)
	}
	// Scenarios, named replays and the worst-window replay share one
	// namespace: the scenario scope of Metrics, keyed by name.
	worst := WorstWindowName(p.WorstWindowDays)
	names := map[string]bool{}
	for i, sc := range p.Scenarios {
		switch {
		case sc.Name == "":
			bad("scenario %d has no name", i+1)
		case names[sc.Name]:
			bad("scenario %q given twice", sc.Name)
		case sc.Name == worst:
			bad("scenario %q has the name of the worst-window replay", sc.Name)
		}
		names[sc.Name] = true
		if err := sc.Shock.Validate(); err != nil {
			bad("scenario %q: %v", sc.Name, err)
		}
	}
	replays := map[string]bool{}
	for i, w := range p.Replays {
		switch {
		case w.Name == "":
			bad("replay %d has no name", i+1)
		case replays[w.Name]:
			bad("replay %q given twice", w.Name)
		case names[w.Name]:
			bad("replay %q has the name of a stress scenario", w.Name)
		case w.Name == worst:
			bad("replay %q has the name of the worst-window replay", w.Name)
		}
		replays[w.Name] = true
		if w.From.IsZero() || w.To.IsZero() || dayOf(w.To) < dayOf(w.From) {
			bad("replay %q: window %s to %s", w.Name, w.From.Format(time.DateOnly), w.To.Format(time.DateOnly))
		}
	}
	lnames := map[string]bool{}
	for _, l := range p.Limits {
		if err := l.Validate(); err != nil {
			bad("%v", err)
		}
		if lnames[l.Name] {
			bad("limit %q given twice", l.Name)
		}
		lnames[l.Name] = true
	}
	return errors.Join(errs...)
}
