package demo

import (
	"math/rand/v2"
	"time"
)

// corporateActions are the per-day corporate actions of each security,
// indexed [security][day].
type corporateActions struct {
	div   [][]float64 // cash dividend per (post-split) share going ex that day; 0 if none
	split [][]float64 // new shares per old share at the open of that day; 1 if none
	rate  [][]float64 // declared annual dividend per current share in force that day
}

// planActions places splits and dividends. Ex-dates fall on a fixed day of
// fixed months (rolled forward to a weekday); the declared rate is raised at
// the first ex-date of each calendar year and divided by the ratio on a
// split. The cut security halves its rate at its first ex-date after the
// crash.
func planActions(cal calendar, crashEnd int, rng *rand.Rand) corporateActions {
	n := cal.n()
	ca := corporateActions{
		div:   make([][]float64, len(universe)),
		split: make([][]float64, len(universe)),
		rate:  make([][]float64, len(universe)),
	}
	for k, s := range universe {
		ca.div[k] = make([]float64, n)
		ca.split[k] = make([]float64, n)
		ca.rate[k] = make([]float64, n)
		for t := range n {
			ca.split[k][t] = 1
		}
		for _, e := range splitEvents {
			if e.id == s.id {
				ca.split[k][cal.atFraction(e.at)] = e.ratio
			}
		}
		ex := exDates(cal, k, s)
		cur := s.yield0 * s.price0
		lastRaise := cal.days[0].Year()
		cut := false
		for t := range n {
			cur /= ca.split[k][t]
			if ex[t] {
				year := cal.days[t].Year()
				switch {
				case s.id == cutSecurity && !cut && t >= crashEnd:
					cur *= 0.5
					cut, lastRaise = true, year
				case year > lastRaise:
					cur *= 1 + s.divGrowth*(0.6+0.8*rng.Float64())
					lastRaise = year
				}
				ca.div[k][t] = round(cur/float64(s.freq), 4)
			}
			ca.rate[k][t] = cur
		}
	}
	return ca
}

// exDates marks the ex-dates of security k. Payment months are staggered by
// k so not every company goes ex in the same week.
func exDates(cal calendar, k int, s security) []bool {
	ex := make([]bool, cal.n())
	if s.yield0 == 0 {
		return ex
	}
	day := 4 + (k*5)%20
	first, last := cal.days[0], cal.days[cal.n()-1]
	for y := first.Year(); y <= last.Year(); y++ {
		for m := 1; m <= 12; m++ {
			var pays bool
			switch s.freq {
			case 12:
				pays = true
			case 4:
				pays = (m-1)%3 == k%3
			case 2:
				pays = (m-1)%6 == k%6
			case 1:
				pays = m == 3+k%6
			}
			if !pays {
				continue
			}
			i := cal.onOrAfter(time.Date(y, time.Month(m), day, 0, 0, 0, 0, time.UTC))
			if s.id == staleSecurity && i == cal.n()-1 {
				i-- // never ex on the day its close is missing: see Findings
			}
			if i > 0 && i < cal.n() {
				ex[i] = true
			}
		}
	}
	return ex
}
