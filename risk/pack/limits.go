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
	put(MetricDurModified, s.ModifiedDuration)
	put(MetricConvexity, s.Convexity)
	put(MetricGrowthDuration, s.GrowthDuration)
	if s.Empirical != nil {
		m[MetricDurEmpirical] = s.Empirical.Value
	}
	put(MetricBeta, s.Beta)
	for _, w := range []int{21, 63, 252} {
		if n := len(r.port); n >= w {
			if sd, err := stats.StdDev(r.port[n-w:]); err == nil {
				m[VolatilityMetric(w)] = sd * math.Sqrt(stats.TradingDaysPerYear)
			}
		}
	}
	put(MetricEWMA, s.EWMAVolatility)
	put(MetricTrackingError, s.TrackingError)
	if v := FindVaR(doc, "historical", 0.95, 1); v != nil {
		m[LossMetric("var", v)] = v.VaR
	}
	if v := FindVaR(doc, "historical", 0.99, 1); v != nil {
		m[LossMetric("var", v)] = v.VaR
	}
	if v := FindVaR(doc, "historical", 0.975, 1); v != nil {
		m[LossMetric("es", v)] = v.ES
	}
	m[MetricCashWeight] = doc.Concentration.CashWeight
	if len(doc.Holdings) > 0 {
		m[MetricMaxSingleName] = doc.Concentration.MaxSingleName
		m[MetricMaxSector] = doc.Concentration.MaxSector
	}
	put(MetricWorstWindowLoss, r.worstLoss)
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
		ls := LimitStatus{Name: x.Name, Metric: x.Metric, Scenario: x.Scenario, Status: string(x.Status), Side: string(x.Side), Level: ptr(x.Level)}
		if x.Status == limits.StateNoData {
			ls.Status = "no_data"
		} else {
			ls.Value, ls.Headroom = ptr(x.Value), ptr(x.Headroom)
		}
		r.doc.Limits = append(r.doc.Limits, ls)
	}
	return nil
}
