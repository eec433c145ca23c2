package demo

import (
	"slices"
	"strings"
)

// scenario is the whole generated history, in memory.
type scenario struct {
	opt         Options
	cal         calendar
	crashStart  int
	actions     corporateActions
	closes      [][]float64
	rates       marketRates
	assumptions []assumption
	kLeGDay     int
	pr          pricer
	snapshots   []snapshot // by day, then portfolio
	flows       []flow     // by day, then portfolio
}

// build computes the scenario. It does no I/O.
func build(opt Options) *scenario {
	sc := &scenario{opt: opt, cal: newCalendar(opt.End, opt.Years)}
	n := sc.cal.n()
	sc.crashStart = sc.cal.atFraction(crashAt)
	sc.actions = planActions(sc.cal, sc.crashStart+crashDays, newStream(opt.Seed, streamDividends))
	sc.closes = simulateCloses(sc.cal, sc.crashStart, sc.actions, newStream(opt.Seed, streamMarket))
	sc.rates = simulateRates(sc.cal, sc.crashStart, newStream(opt.Seed, streamCurve))
	sc.assumptions, sc.kLeGDay = planAssumptions(sc.cal, sc.actions, newStream(opt.Seed, streamAssumptions))

	sc.pr = pricer{closes: sc.closes, staleDay: n - 1, securityOf: map[string]int{}}
	for k, s := range universe {
		sc.pr.securityOf[s.id] = k
		sc.pr.idOrder = append(sc.pr.idOrder, k)
	}
	slices.SortFunc(sc.pr.idOrder, func(a, b int) int { return strings.Compare(universe[a].id, universe[b].id) })
	sc.pr.staleSec = sc.pr.securityOf[staleSecurity]

	for pi := range portfolioDefs {
		snaps, flows := simulatePortfolio(pi, sc.cal, sc.actions, sc.pr, newStream(opt.Seed, streamPortfolio+uint64(pi)))
		sc.snapshots = append(sc.snapshots, snaps...)
		sc.flows = append(sc.flows, flows...)
	}
	byDayPort := func(d1, p1, d2, p2 int) int {
		if d1 != d2 {
			return d1 - d2
		}
		return strings.Compare(portfolioDefs[p1].id, portfolioDefs[p2].id)
	}
	slices.SortStableFunc(sc.snapshots, func(a, b snapshot) int { return byDayPort(a.day, a.port, b.day, b.port) })
	slices.SortStableFunc(sc.flows, func(a, b flow) int { return byDayPort(a.day, a.port, b.day, b.port) })
	return sc
}

// hasClose reports whether prices.csv has a row for security k on day t.
func (sc *scenario) hasClose(k, t int) bool {
	return !(k == sc.pr.staleSec && t == sc.pr.staleDay)
}
