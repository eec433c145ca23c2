package pack

import (
	"fmt"
	"math"

	"plumbline/risk/limits"
	"plumbline/risk/stats"
)

// limitValues returns the measured value of every limit metric
// (limits.Metrics) this run has, and each scenario's loss −PnLPct.
// Volatilities over 21, 63 and 252 days are computed for the limits
// whatever the configured rolling windows; VaR and ES are the historical
// figures.
func (r *run) limitValues() limits.Values {
	doc := r.doc
	s := &doc.Summary
	m := map[string]float64{}
	put := func(name string, v *float64) {
		if v != nil {
			m[name] = *v
		}
	}
	put("duration_modified", s.ModifiedDuration)
	put("convexity", s.Convexity)
	put("growth_duration", s.GrowthDuration)
	if s.Empirical != nil {
		m["duration_empirical"] = s.Empirical.Value
	}
	put("beta", s.Beta)
	for _, w := range []int{21, 63, 252} {
		if n := len(r.port); n >= w {
			if sd, err := stats.StdDev(r.port[n-w:]); err == nil {
				m[fmt.Sprintf("volatility_ann_%dd", w)] = sd * math.Sqrt(stats.TradingDaysPerYear)
			}
		}
	}
	put("volatility_ewma_ann", s.EWMAVolatility)
	put("tracking_error_ann", s.TrackingError)
	if v := varFigure(doc, "historical", 0.95, 1); v != nil {
		m["var_95_1d"] = v.VaR
	}
	if v := varFigure(doc, "historical", 0.99, 1); v != nil {
		m["var_99_1d"] = v.VaR
	}
	if v := varFigure(doc, "historical", 0.975, 1); v != nil {
		m["es_975_1d"] = v.ES
	}
	m["cash_weight"] = doc.Concentration.CashWeight
	if len(doc.Holdings) > 0 {
		m["max_single_name_weight"] = doc.Concentration.MaxSingleName
		m["max_sector_weight"] = doc.Concentration.MaxSector
	}
	put("worst_window_loss", r.worstLoss)
	sc := map[string]float64{}
	for _, x := range doc.Stress {
		sc[x.Name] = -x.PnLPct
	}
	return limits.Values{Metrics: m, ScenarioLoss: sc}
}

// limits evaluates the limits (limits.Evaluate) in the order given.
func (r *run) limits() error {
	if len(r.p.Limits) == 0 {
		return nil
	}
	st, err := limits.Evaluate(r.p.Limits, r.limitValues())
	if err != nil {
		return fmt.Errorf("limits: %w", err)
	}
	for _, x := range st {
		ls := LimitStatus{Name: x.Name, Metric: x.Metric, Scenario: x.Scenario, Status: string(x.Status), Level: ptr(x.Level)}
		if x.Status == limits.StateNoData {
			ls.Status = "no_data"
		} else {
			ls.Value, ls.Headroom = ptr(x.Value), ptr(x.Headroom)
		}
		r.doc.Limits = append(r.doc.Limits, ls)
	}
	return nil
}
