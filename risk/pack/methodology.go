package pack

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
	"time"

	"plumbline/risk/valuation"
)

// parameters formats every parameter of the run as a string.
func (p Params) parameters() map[string]string {
	itoa := strconv.Itoa
	ftoa := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	ws := make([]string, len(p.RollingWindows))
	for i, w := range p.RollingWindows {
		ws[i] = itoa(w)
	}
	scs := make([]string, len(p.Scenarios))
	for i, s := range p.Scenarios {
		scs[i] = s.Name
	}
	rps := make([]string, len(p.Replays))
	for i, w := range p.Replays {
		rps[i] = fmt.Sprintf("%s: %s to %s", w.Name, w.From.Format(time.DateOnly), w.To.Format(time.DateOnly))
	}
	ls := make([]string, len(p.Limits))
	for i, l := range p.Limits {
		ls[i] = l.Name
	}
	return map[string]string{
		"risk_free_tenor_months": itoa(p.RiskFreeTenorMonths),
		"growth_convention":      p.GrowthConvention,
		"rolling_windows":        strings.Join(ws, ","),
		"ewma_lambda":            ftoa(p.EWMALambda),
		"var_lookback_days":      itoa(p.VaRLookbackDays),
		"backtest_days":          itoa(p.BacktestDays),
		"large_flow_fraction":    ftoa(p.LargeFlowFraction),
		"empirical_tenor_months": itoa(p.EmpiricalTenorMonths),
		"empirical_window_weeks": itoa(p.EmpiricalWindowWeeks),
		"beta_window_weeks":      itoa(p.BetaWindowWeeks),
		"stale_price_days":       itoa(p.StalePriceDays),
		"use_curve":              strconv.FormatBool(p.UseCurve),
		"scenarios":              strings.Join(scs, "; "),
		"worst_window_days":      itoa(p.WorstWindowDays),
		"replays":                strings.Join(rps, "; "),
		"limits":                 strings.Join(ls, "; "),
		"drift_z_threshold":      ftoa(p.Drift.ZThreshold),
		"drift_min_history":      itoa(p.Drift.MinHistory),
		"history_days":           itoa(p.HistoryDays),
	}
}

// methodology states the models and conventions this run used.
func (r *run) methodology() Methodology {
	p := r.p
	var models []string
	add := func(format string, a ...any) { models = append(models, fmt.Sprintf(format, a...)) }

	var used []string
	for _, k := range sortedKeys(r.models) {
		used = append(used, fmt.Sprintf("%s (%d)", strings.ReplaceAll(k, "_", " "), r.models[k]))
	}
	if len(used) > 0 {
		add("Dividend discount models used: %s; a dividend is taken as just paid on the as-of date.", strings.Join(used, ", "))
	}
	if p.UseCurve {
		add("Holdings without an explicit discount rate are valued on the fitted Nelson-Siegel curve plus an equity spread beta x ERP (term-structure model).")
	} else {
		add("Holdings are valued with constant growth, or multi-stage growth where the assumptions give stages.")
	}
	add("Discount rate k = rf + beta x ERP (CAPM) unless the assumptions give an explicit rate; rf is the %d-month zero yield of the latest curve, linear in tenor between observed tenors.", p.RiskFreeTenorMonths)
	add("Growth sensitivities hold %s when growth moves.", r.opt.GrowthConvention)
	add("Betas missing from the assumptions are the OLS slope of up to %d weekly total returns (last trading day of each week) on the benchmark's.", min(p.BetaWindowWeeks, valuation.BetaWindowWeeks))
	add("Portfolio durations, convexities and beta are market-value weighted over the valued holdings and cash (cash at zero); excluded holdings take no part.")
	add("Factor durations of non-curve models are the modified duration times the Nelson-Siegel loadings (1, slope, curvature) at the risk-free tenor.")
	add("Empirical duration: minus the OLS slope of weekly total returns on weekly changes of the %d-month yield over the last %d weeks (at least %d weeks).", p.EmpiricalTenorMonths, p.EmpiricalWindowWeeks, r.minEmpiricalWeeks())
	add("The week's return is explained by a second-order Taylor expansion in k and g beside full revaluation, from the last close on or before as-of minus 7 days.")
	add("Returns are time-weighted (GIPS): revaluation at flows of %s of value or more, Modified Dietz between, sub-periods linked geometrically; flows are end of day; dividends are credited on the ex-date.", strconv.FormatFloat(p.LargeFlowFraction, 'g', -1, 64))
	add("The week is trailing: from the last close on or before as-of minus 7 days.")
	add("Benchmark: %s-weighted total-return index of every security in the store, rebased to 100 on the first day of the series.", r.in.Portfolio.BenchmarkMethod)
	add("Volatilities are sample standard deviations of daily returns, annualised with the square root of 252; EWMA with lambda %s.", strconv.FormatFloat(p.EWMALambda, 'g', -1, 64))
	add("VaR and ES: historical, normal and Cornish-Fisher from the last %d daily returns; 5-day figures scale the 1-day ones by the square root of 5.", p.VaRLookbackDays)
	add("Backtest: 99%% 1-day historical VaR re-estimated out of sample from the %d returns before each of the last %d days; Kupiec POF test and Basel traffic light.", p.VaRLookbackDays, p.BacktestDays)
	add("Stress: full revaluation beside a second-order Taylor estimate; an explicit discount rate moves with the shock's change of k like a CAPM rate; market moves pass through beta.")
	add("Historical replays apply the holdings' daily total returns to today's values; a day without a close counts as zero.")

	src := slices.Clone(r.in.Sources)
	if src == nil {
		src = []string{}
	}
	return Methodology{Parameters: p.parameters(), Models: models, DataSources: src}
}
