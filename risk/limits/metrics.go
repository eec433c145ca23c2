// Package limits checks portfolio risk measures against the committee's
// warning and breach levels. It is pure: no I/O, no clock, no logging.
package limits

// Scope is what a metric is measured over.
type Scope string

// Scopes of the metrics.
const (
	ScopePortfolio  Scope = "portfolio"   // one number for the whole book
	ScopeSingleName Scope = "single_name" // the largest single holding
	ScopeSector     Scope = "sector"      // the largest sector
	ScopeScenario   Scope = "scenario"    // one stress scenario, named by the limit
)

// MetricInfo describes one metric a limit may name.
type MetricInfo struct {
	Name    string
	Unit    string // "years", "years²", "ratio" or "decimal" (0.05 = 5%)
	Scope   Scope
	Meaning string
}

// metrics is the fixed list, in report order. Losses are positive numbers
// so that every loss limit is a maximum.
var metrics = []MetricInfo{
	{"duration_modified", "years", ScopePortfolio, "modified duration in the discount rate, −(1/V)·dV/dk, value-weighted"},
	{"convexity", "years²", ScopePortfolio, "convexity in the discount rate, (1/V)·d²V/dk², value-weighted"},
	{"growth_duration", "years", ScopePortfolio, "sensitivity to long-run growth, (1/V)·dV/dg, value-weighted"},
	{"duration_empirical", "years", ScopePortfolio, "minus the slope of weekly returns on weekly yield changes"},
	{"beta", "ratio", ScopePortfolio, "value-weighted beta to the market"},
	{"volatility_ann_21d", "decimal", ScopePortfolio, "standard deviation of daily returns over 21 days, ×√252"},
	{"volatility_ann_63d", "decimal", ScopePortfolio, "standard deviation of daily returns over 63 days, ×√252"},
	{"volatility_ann_252d", "decimal", ScopePortfolio, "standard deviation of daily returns over 252 days, ×√252"},
	{"volatility_ewma_ann", "decimal", ScopePortfolio, "EWMA daily volatility, ×√252"},
	{"tracking_error_ann", "decimal", ScopePortfolio, "standard deviation of daily active returns against the benchmark, ×√252"},
	{"var_95_1d", "decimal", ScopePortfolio, "one-day 95% value at risk, loss as a fraction of portfolio value"},
	{"var_99_1d", "decimal", ScopePortfolio, "one-day 99% value at risk, loss as a fraction of portfolio value"},
	{"es_975_1d", "decimal", ScopePortfolio, "one-day 97.5% expected shortfall, loss as a fraction of portfolio value"},
	{"cash_weight", "decimal", ScopePortfolio, "cash as a fraction of portfolio value (negative for an overdraft)"},
	{"max_single_name_weight", "decimal", ScopeSingleName, "largest holding as a fraction of portfolio value"},
	{"max_sector_weight", "decimal", ScopeSector, "largest sector as a fraction of portfolio value"},
	{"worst_window_loss", "decimal", ScopePortfolio, "loss of the worst historical window replayed on current holdings, fraction of value"},
	{"scenario_loss", "decimal", ScopeScenario, "full-revaluation loss of the named scenario, fraction of value"},
}

// Metrics returns every metric a limit may name, with unit, scope and
// meaning. The slice is a copy.
func Metrics() []MetricInfo {
	return append([]MetricInfo(nil), metrics...)
}

// Lookup returns the metric called name.
func Lookup(name string) (MetricInfo, bool) {
	for _, m := range metrics {
		if m.Name == name {
			return m, true
		}
	}
	return MetricInfo{}, false
}
