package demo

import (
	"math"
	"math/rand/v2"
	"slices"
)

// Portfolio management rules.
const (
	lotSize         = 100
	cashTarget      = 0.02  // cash left after a rebalance, fraction of value
	cashLow         = 0.005 // rebalance when cash falls below ...
	cashHigh        = 0.05  // ... or rises above this fraction of value
	rebalanceWeeks  = 13    // scheduled rebalance every quarter
	minTradeFrac    = 0.004 // skip trades smaller than this fraction of value
	smallFlowsMin   = 5
	smallFlowsExtra = 3 // up to this many more
)

// holding is one line of a snapshot. sec is -1 for the cash line, whose
// quantity is in cents.
type holding struct {
	sec        int
	qty        int64
	priceCents int64
}

// snapshot is one portfolio's holdings at the close of a day.
type snapshot struct {
	day  int
	port int
	rows []holding // securities in id order, then cash
}

// flow is an external cash flow, end of day, in cents.
type flow struct {
	day   int
	port  int
	cents int64
}

// plannedFlow is a flow whose amount is fixed only when it happens, as a
// fraction of the portfolio value at the previous snapshot.
type plannedFlow struct {
	day   int
	frac  float64
	step  float64 // amounts are rounded to this many base-currency units
	large bool
}

// pricer gives the price used in the holdings file for security k on day t:
// the close, except for the planted stale price.
type pricer struct {
	closes     [][]float64
	staleSec   int
	staleDay   int
	idOrder    []int // security indexes sorted by id
	securityOf map[string]int
}

func (p pricer) cents(k, t int) int64 {
	if k == p.staleSec && t == p.staleDay {
		t-- // the custodian carried the previous close: see Findings
	}
	return int64(math.Round(p.closes[k][t] * 100))
}

// simulatePortfolio runs portfolio pi from its inception (the first
// snapshot day) to the end of the history.
func simulatePortfolio(pi int, cal calendar, ca corporateActions, pr pricer, rng *rand.Rand) ([]snapshot, []flow) {
	def := portfolioDefs[pi]
	n := cal.n()
	snapDays := cal.snapshotDays()
	isSnap := make([]bool, n)
	for _, d := range snapDays {
		isSnap[d] = true
	}
	inception := snapDays[0]

	members := make([]bool, len(universe))
	weights := make([]float64, len(universe))
	for _, id := range def.members {
		k := pr.securityOf[id]
		members[k] = true
		weights[k] = 0.7 + 0.6*rng.Float64()
	}
	sell, buy := pr.securityOf[def.sell], pr.securityOf[def.buy]
	swapDay := cal.atFraction(def.swapAt)

	var planned []plannedFlow
	taken := map[int]bool{inception: true}
	for range smallFlowsMin + rng.IntN(smallFlowsExtra+1) {
		f := plannedFlow{day: cal.atFraction(0.05 + 0.93*rng.Float64()), frac: 0.004 + 0.026*rng.Float64(), step: 1000}
		if rng.Float64() >= 0.65 {
			f.frac = -f.frac
		}
		for taken[f.day] || f.day <= inception {
			f.day++
		}
		if f.day < n {
			taken[f.day] = true
			planned = append(planned, f)
		}
	}
	if def.largeFlow {
		d := cal.atFraction(largeFlowAt)
		for taken[d] {
			d++
		}
		planned = append(planned, plannedFlow{day: d, frac: largeFlowPct, step: 10000, large: true})
	}
	slices.SortFunc(planned, func(a, b plannedFlow) int { return a.day - b.day })

	qty := make([]int64, len(universe))
	cash := int64(math.Round(def.value0 * 100))
	value := func(t int) int64 {
		v := cash
		for k, q := range qty {
			if q != 0 {
				v += q * pr.cents(k, t)
			}
		}
		return v
	}
	rebalance(qty, &cash, members, weights, pr, inception, value(inception))

	var snaps []snapshot
	var flows []flow
	record := func(t int) {
		s := snapshot{day: t, port: pi}
		for _, k := range pr.idOrder {
			if qty[k] != 0 {
				s.rows = append(s.rows, holding{sec: k, qty: qty[k], priceCents: pr.cents(k, t)})
			}
		}
		s.rows = append(s.rows, holding{sec: -1, qty: cash, priceCents: 100})
		snaps = append(snaps, s)
	}
	record(inception)
	lastValue := value(inception)
	week, next := 0, 0
	swapped := false
	for t := inception + 1; t < n; t++ {
		for k := range qty {
			if r := ca.split[k][t]; r != 1 && qty[k] != 0 {
				q := float64(qty[k]) * r
				if q != math.Trunc(q) {
					panic("demo: split left a fractional share") // lots of 100 make this impossible
				}
				qty[k] = int64(q)
			}
			if d := ca.div[k][t]; d != 0 && qty[k] != 0 {
				cash += int64(math.Round(float64(qty[k]) * d * 100))
			}
		}
		for next < len(planned) && planned[next].day == t {
			f := planned[next]
			amt := int64(math.Round(f.frac*float64(lastValue)/100/f.step)) * int64(f.step) * 100
			if amt != 0 {
				cash += amt
				flows = append(flows, flow{day: t, port: pi, cents: amt})
			}
			next++
		}
		if !isSnap[t] {
			continue
		}
		week++
		v := value(t)
		trade := week%rebalanceWeeks == 0 || float64(cash) < cashLow*float64(v) || float64(cash) > cashHigh*float64(v)
		if !swapped && t >= swapDay {
			members[sell], members[buy] = false, true
			weights[buy] = weights[sell]
			swapped, trade = true, true
		}
		if trade {
			rebalance(qty, &cash, members, weights, pr, t, v)
		}
		record(t)
		lastValue = value(t)
	}
	return snaps, flows
}

// rebalance trades whole lots at day t's prices towards the target weights
// with cashTarget left in cash, selling non-members. Trades smaller than
// minTradeFrac of the value are skipped, and so is a security whose price is
// stale (nobody trades on a price that is not today's).
func rebalance(qty []int64, cash *int64, members []bool, weights []float64, pr pricer, t int, v int64) {
	wsum := 0.0
	for k, m := range members {
		if m {
			wsum += weights[k]
		}
	}
	for _, k := range pr.idOrder {
		if k == pr.staleSec && t == pr.staleDay {
			continue
		}
		p := pr.cents(k, t)
		var target int64
		if members[k] {
			shares := weights[k] / wsum * float64(v) * (1 - cashTarget) / float64(p)
			target = int64(shares/lotSize) * lotSize
		}
		dq := target - qty[k]
		if dq == 0 {
			continue
		}
		if members[k] && qty[k] > 0 && math.Abs(float64(dq*p)) < minTradeFrac*float64(v) {
			continue
		}
		*cash -= dq * p
		qty[k] = target
	}
}
