package pack

import (
	"math"

	"plumbline/risk/valuation"
)

// weeks marks the last trading day of every Monday-to-Sunday week of the
// calendar (the Friday close in a normal week); the as-of date ends the
// last, possibly partial, week.
func (r *run) weeks() {
	cal := r.d.cal
	for t := range cal {
		if t == len(cal)-1 || weekOf(cal[t+1]) != weekOf(cal[t]) {
			r.weekEnds = append(r.weekEnds, t)
		}
	}
	r.weekBase = r.d.floorIdx(r.d.asOf - 7)
}

// weekly compounds calendar-aligned daily returns into weekly returns,
// one per week end (element 0 is NaN):
//
//	R_k = Π_{t ∈ (e_{k−1}, e_k]} (1 + r_t) − 1
//
// with NaN days counted as zero (a missing close moves into the next
// return, so nothing is lost). A week is NaN when the series did not exist
// at its start (first > e_{k−1}) or has no return inside it.
func (r *run) weekly(daily []float64, first int) []float64 {
	we := r.weekEnds
	out := make([]float64, len(we))
	out[0] = math.NaN()
	for k := 1; k < len(we); k++ {
		out[k] = math.NaN()
		if we[k-1] < first {
			continue
		}
		g, any := 1.0, false
		for t := we[k-1] + 1; t <= we[k]; t++ {
			if x := daily[t]; !math.IsNaN(x) {
				g *= 1 + x
				any = true
			}
		}
		if any {
			out[k] = g - 1
		}
	}
	return out
}

// weeklyOf returns a security's weekly total returns, the weekly
// compounding of its calendar-aligned daily returns from its first bar
// on. Built once per security: the beta and the empirical duration both
// read it.
func (r *run) weeklyOf(ps *priceSeries) []float64 {
	if ps.week == nil {
		ps.week = r.weekly(r.d.calReturns(ps), ps.first)
	}
	return ps.week
}

// pairs returns the weeks of the last `window` weeks where both series
// have a value.
func (r *run) pairs(y, x []float64, window int) (ys, xs []float64) {
	n := len(r.weekEnds)
	for k := max(1, n-window); k < n; k++ {
		if !math.IsNaN(y[k]) && !math.IsNaN(x[k]) {
			ys = append(ys, y[k])
			xs = append(xs, x[k])
		}
	}
	return ys, xs
}

// betaEstimate is a security's estimated beta, or why there is none.
type betaEstimate struct {
	reg valuation.Regression
	err error
}

// errNoHistory reports a beta or regression without the data it needs.
type errNoHistory struct{ what string }

func (e errNoHistory) Error() string { return e.what }

// betaOf estimates a security's beta (valuation.EstimateBeta) from its
// weekly total returns on the benchmark's over the last BetaWindowWeeks
// weeks, weeks missing either side left out. Estimates are cached.
func (r *run) betaOf(id string) betaEstimate {
	if be, ok := r.betas[id]; ok {
		return be
	}
	var be betaEstimate
	ps := r.d.prices[id]
	switch {
	case r.benchWeek == nil:
		be.err = errNoHistory{"no benchmark to estimate a beta against"}
	case ps == nil:
		be.err = errNoHistory{"no price history to estimate a beta from"}
	default:
		y, x := r.pairs(r.weeklyOf(ps), r.benchWeek, r.p.BetaWindowWeeks)
		be.reg, be.err = valuation.EstimateBeta(y, x)
	}
	r.betas[id] = be
	return be
}
