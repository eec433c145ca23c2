package demo

import (
	"fmt"
	"math/rand/v2"
	"slices"
)

// assumption is one row of assumptions.csv.
type assumption struct {
	sec      int
	day      int
	d0       float64 // trailing annual dividend per share
	freq     int
	growth   float64 // long-run growth, decimal
	beta     float64
	hasBeta  bool
	discount float64 // 0 = empty (CAPM)
	stages   string
}

// revisionsAt are the fractions of the history at which analysts review
// each security (jittered by up to four weeks; the later ones are skipped at
// random).
var revisionsAt = []float64{0.24, 0.49, 0.74, 0.90}

// planAssumptions writes a first row at the start of the history, rows at
// the reviews and a row on each split day (D0 restated per new share). It
// returns the rows in (security, date) order and the day of the k <= g row.
func planAssumptions(cal calendar, ca corporateActions, rng *rand.Rand) ([]assumption, int) {
	n := cal.n()
	kLeGDay := n - 1 - kLeGDaysAhead
	var rows []assumption
	for k, s := range universe {
		days := []int{0}
		for j, f := range revisionsAt {
			d := min(max(cal.atFraction(f)+rng.IntN(41)-20, 1), n-1)
			if j == 0 || rng.Float64() < 0.75 {
				days = append(days, d)
			}
		}
		for t := range n {
			if ca.split[k][t] != 1 {
				days = append(days, t)
			}
		}
		if s.id == kLeGSecurity {
			days = slices.DeleteFunc(days, func(d int) bool { return d >= kLeGDay })
			days = append(days, kLeGDay)
		}
		slices.Sort(days)
		days = slices.Compact(days)

		y1, g1 := 2+rng.IntN(4), roundTo(0.08+0.07*rng.Float64(), 0.005)
		y2, g2 := 2+rng.IntN(2), roundTo(0.05+0.03*rng.Float64(), 0.005)
		stageRate := roundTo(0.085+0.02*rng.Float64(), 0.005)
		g := s.growth
		for i, d := range days {
			if i > 0 {
				g = min(max(roundTo(g+0.002*rng.NormFloat64(), 0.0025), s.growth-0.005), s.growth+0.005)
				g1 = max(roundTo(g1-0.01*rng.Float64(), 0.005), 0.06)
			}
			a := assumption{sec: k, day: d, d0: trailingDividend(cal, ca, k, d), freq: s.freq, growth: round(g, 4)}
			if !s.noBeta {
				b := min(max(s.beta+0.07*rng.NormFloat64(), s.beta-0.15, 0.45), s.beta+0.15)
				a.beta, a.hasBeta = round(b, 2), true
			}
			if s.id == fixedKSecurity {
				a.discount = fixedK
			}
			if s.stages {
				if s.id == stageRateSec {
					a.stages = fmt.Sprintf("%d:%s:%s;%d:%s", y1, fmtDec(g1), fmtDec(stageRate), y2, fmtDec(g2))
				} else {
					a.stages = fmt.Sprintf("%d:%s;%d:%s", y1, fmtDec(g1), y2, fmtDec(g2))
				}
			}
			// The planted problem: an analyst override puts the discount
			// rate (6.8%) below long-run growth (7%), so k <= g and the
			// constant-growth terminal value does not exist. The pack must
			// exclude VRDT from then on and say why.
			if s.id == kLeGSecurity && d == kLeGDay {
				a.discount, a.growth, a.stages = kLeGDiscount, kLeGGrowth, kLeGStages
			}
			rows = append(rows, a)
		}
	}
	return rows, kLeGDay
}

// trailingDividend is D0 on day d: the dividends that went ex in the year
// ending on d, restated per current share for splits since their ex-date.
// Within the first year of the history it is the declared annual rate.
func trailingDividend(cal calendar, ca corporateActions, k, d int) float64 {
	if cal.days[d].AddDate(-1, 0, 0).Before(cal.days[0]) {
		return round(ca.rate[k][d], 4)
	}
	sum, factor := 0.0, 1.0
	for e := d; e >= cal.yearBefore(d); e-- {
		sum += ca.div[k][e] / factor
		factor *= ca.split[k][e]
	}
	return round(sum, 4)
}
