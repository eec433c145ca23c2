package pack

import (
	"math"
	"strings"

	"plumbline/risk/valuation"
)

// minEmpiricalWeeks is the fewest weekly pairs an empirical duration is
// reported from: half the window (a regression on fewer weeks than that
// says more about its noise than about rates).
func (r *run) minEmpiricalWeeks() int { return max(3, (r.p.EmpiricalWindowWeeks+1)/2) }

// weeklyYieldChanges returns, per week end, the change of the zero yield
// at tenor months since the previous week end (NaN where either week has
// no curve on or before it), the yield read from the latest curve on or
// before each week end.
func (r *run) weeklyYieldChanges(tenor int) []float64 {
	d, we := r.d, r.weekEnds
	y := make([]float64, len(we))
	ci := -1
	for k, t := range we {
		for ci+1 < len(d.curves) && dayOf(d.curves[ci+1].Date) <= d.cal[t] {
			ci++
		}
		y[k] = math.NaN()
		if ci >= 0 {
			y[k], _ = yieldAt(&d.curves[ci], tenor)
		}
	}
	dy := make([]float64, len(we))
	dy[0] = math.NaN()
	for k := 1; k < len(we); k++ {
		dy[k] = y[k] - y[k-1]
	}
	return dy
}

// empirical fills the empirical durations (valuation.EmpiricalDuration):
// minus the OLS slope of weekly total returns on weekly changes of the
// EmpiricalTenorMonths yield over the last EmpiricalWindowWeeks weeks,
// per holding and for the portfolio (its weekly time-weighted returns).
func (r *run) empirical() {
	dy := r.weeklyYieldChanges(r.p.EmpiricalTenorMonths)
	fit := func(weekly []float64) *Regression {
		y, x := r.pairs(weekly, dy, r.p.EmpiricalWindowWeeks)
		if len(y) < r.minEmpiricalWeeks() {
			return nil
		}
		rs, err := valuation.EmpiricalDuration(y, x)
		if err != nil {
			return nil
		}
		return &Regression{Value: rs.EmpiricalDuration, StdErr: rs.SlopeStdErr, R2: rs.RSquared, N: rs.N}
	}
	var none []string
	for i := range r.doc.Holdings {
		h := &r.doc.Holdings[i]
		ps := r.d.prices[h.ID]
		if h.Empirical = fit(r.weeklyOf(ps)); h.Empirical == nil {
			none = append(none, h.ID)
		}
	}
	if len(none) > 0 {
		r.finding("empirical_unavailable", "", r.share(none), "fewer than %d weeks of returns and %d-month yield changes in the last %d weeks, no empirical duration: %s", r.minEmpiricalWeeks(), r.p.EmpiricalTenorMonths, r.p.EmpiricalWindowWeeks, strings.Join(none, ", "))
	}
	if r.vs != nil {
		if r.doc.Summary.Empirical = fit(r.weekly(r.portCal(), r.vsStart)); r.doc.Summary.Empirical == nil {
			r.finding("empirical_unavailable", "", 1, "fewer than %d weeks of portfolio returns and yield changes in the last %d weeks: no portfolio empirical duration", r.minEmpiricalWeeks(), r.p.EmpiricalWindowWeeks)
		}
	}
}
