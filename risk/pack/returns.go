package pack

import (
	"math"
	"slices"
	"strings"
	"time"

	"plumbline/risk/returns"
	"plumbline/risk/stats"
)

// valueSeries values the portfolio at every trading day from its first
// snapshot to the as-of date (returns.Valuate: snapshots carried forward,
// splits, dividends to cash, end-of-day flows) and takes its flow-neutral
// daily returns (returns.DailyReturns). A held security without any close
// on or before a snapshot's date is valued at the snapshot's own price
// (the close of that day by the input contract) until its first close.
func (r *run) valueSeries() {
	d := r.d
	first := dayOf(d.snaps[0].AsOf)
	start := d.floorIdx(first-1) + 1
	end := d.last()
	if start >= end {
		r.finding("returns_unavailable", "", 0, "fewer than two trading days from the first holdings snapshot (%s) to %s: no returns", dayString(first), dayString(d.asOf))
		return
	}
	book := returns.Book{Prices: map[string][]returns.PricePoint{}}
	firstHeld := map[string]int64{}
	snapPrice := map[string]float64{}
	for _, s := range d.snaps {
		rs := returns.Snapshot{Date: s.AsOf, Cash: s.Cash, Quantities: map[string]float64{}}
		for _, l := range s.Lines {
			if l.SecurityID == "CASH" {
				rs.Cash += l.Quantity * l.Price
				continue
			}
			rs.Quantities[l.SecurityID] += l.Quantity
			if _, ok := firstHeld[l.SecurityID]; !ok && l.Quantity > 0 {
				firstHeld[l.SecurityID], snapPrice[l.SecurityID] = dayOf(s.AsOf), l.Price
			}
		}
		book.Snapshots = append(book.Snapshots, rs)
	}
	var unpriced []string
	for _, id := range sortedKeys(firstHeld) {
		sd := firstHeld[id]
		ps := d.prices[id]
		if ps != nil && ps.days[0] <= sd {
			// Bars before the last one on or before the first snapshot
			// play no part in the values.
			book.Prices[id] = ps.points(max(0, ps.lastOnOrBefore(first)))
			continue
		}
		if p := snapPrice[id]; finite(p) && p > 0 {
			pts := []returns.PricePoint{{Date: dateOf(sd), Close: p, SplitRatio: 1}}
			if ps != nil {
				pts = append(pts, ps.points(0)...)
			}
			book.Prices[id] = pts
			r.finding("price_from_snapshot", id, r.weight(id), "no close on or before %s, when first held: the snapshot's price is used until the first close", dayString(sd))
			continue
		}
		unpriced = append(unpriced, id)
		for i := range book.Snapshots {
			delete(book.Snapshots[i].Quantities, id)
		}
	}
	if len(unpriced) > 0 {
		r.finding("returns_partial", "", r.share(unpriced), "held without any price, so left out of the value series: %s", strings.Join(unpriced, ", "))
	}
	for _, f := range d.flows {
		book.Flows = append(book.Flows, returns.Flow{Date: f.Date, Amount: f.Value})
	}
	vs, err := returns.Valuate(book, d.calTime[start:end+1])
	if err != nil {
		r.finding("returns_unavailable", "", 0, "value series: %v", err)
		return
	}
	port, err := returns.DailyReturns(vs)
	if err != nil {
		r.finding("returns_unavailable", "", 0, "daily returns: %v", err)
		return
	}
	r.vs, r.vsStart, r.port = &vs, start, port
}

// portCal returns the portfolio's daily returns aligned on the calendar
// (NaN up to the first valuation day).
func (r *run) portCal() []float64 {
	out := make([]float64, len(r.d.cal))
	for i := range out {
		out[i] = math.NaN()
	}
	copy(out[r.vsStart+1:], r.port)
	return out
}

// benchmark builds the portfolio's benchmark: a total-return index (each
// constituent's dividends reinvested at the ex-date close) of every
// security of the store, weighted by Portfolio.BenchmarkMethod
// (returns.BuildIndex), from the earliest day any measure needs. A
// security without a close on that day cannot join the index and is left
// out (a finding).
func (r *run) benchmark() {
	d := r.d
	method, err := returns.ParseIndexMethod(r.in.Portfolio.BenchmarkMethod)
	if err != nil {
		r.finding("benchmark_unavailable", "", 0, "benchmark method %q: %v", r.in.Portfolio.BenchmarkMethod, err)
		return
	}
	end := d.last()
	y, _, _ := dateOf(d.asOf).Date()
	need := []int{
		end - r.p.HistoryDays - 1,
		end - r.p.VaRLookbackDays - 1,
		d.floorIdx(dayOf(time.Date(y, time.January, 1, 0, 0, 0, 0, time.UTC)) - 1),
		d.floorIdx(d.asOf - 7),
		r.weekEnds[max(0, len(r.weekEnds)-1-max(r.p.BetaWindowWeeks, r.p.EmpiricalWindowWeeks))],
	}
	ns := max(0, slices.Min(need))
	var cons []returns.Constituent
	var late, noShares []string
	for _, id := range d.secIDs {
		ps := d.prices[id]
		switch {
		case ps == nil:
			continue
		case ps.first > ns:
			late = append(late, id)
			continue
		case method == returns.ValueWeighted && !(d.secs[id].SharesOutstanding > 0 && finite(d.secs[id].SharesOutstanding)):
			noShares = append(noShares, id)
			continue
		}
		// Bars before the last one on or before the first day play no
		// part in the index (splits after it still set the shares).
		from := max(0, ps.lastOnOrBefore(d.cal[ns]))
		cons = append(cons, returns.Constituent{ID: id, Prices: ps.points(from), SharesOutstanding: d.secs[id].SharesOutstanding})
	}
	if len(late) > 0 {
		r.finding("benchmark_partial", "", 0, "no close on or before %s, when the benchmark starts, so left out of it: %s", dayString(d.cal[ns]), strings.Join(late, ", "))
	}
	if len(noShares) > 0 {
		r.finding("benchmark_partial", "", 0, "no valid shares outstanding for the value-weighted benchmark, so left out of it: %s", strings.Join(noShares, ", "))
	}
	if len(cons) == 0 {
		r.finding("benchmark_unavailable", "", 0, "no security can form the benchmark")
		return
	}
	ix, err := returns.BuildIndex(method, cons, d.calTime[ns:end+1], returns.IndexOptions{TotalReturn: true})
	if err != nil {
		r.finding("benchmark_unavailable", "", 0, "benchmark: %v", err)
		return
	}
	r.bench, r.benchAt = &ix, ns
	r.benchWeek = r.weekly(r.benchCal(), ns)
}

// benchCal returns the benchmark's daily returns aligned on the calendar.
func (r *run) benchCal() []float64 {
	out := make([]float64, len(r.d.cal))
	for i := range out {
		out[i] = math.NaN()
	}
	copy(out[r.benchAt+1:], r.bench.Returns[1:])
	return out
}

// benchLevel is the benchmark level at a calendar index, false before it starts.
func (r *run) benchLevel(t int) (float64, bool) {
	if r.bench == nil || t < r.benchAt {
		return 0, false
	}
	return r.bench.Levels[t-r.benchAt], true
}

// returnsSection fills Summary.Returns, Series, the volatilities,
// drawdowns, benchmark beta and tracking error from the value series.
func (r *run) returnsSection() {
	if r.vs == nil {
		return
	}
	d, s := r.d, &r.doc.Summary
	end := d.last()
	vs0 := d.cal[r.vsStart]
	inc := vs0
	if t, err := time.Parse(time.DateOnly, r.in.Portfolio.Inception); err != nil {
		r.finding("inception_unknown", "", 0, "inception date %q unreadable: returns start on the first valuation day %s", r.in.Portfolio.Inception, dayString(vs0))
	} else if inc = dayOf(t); inc < vs0 {
		r.finding("inception_before_holdings", "", 0, "inception %s is before the first holdings snapshot: returns since inception start on %s", r.in.Portfolio.Inception, dayString(vs0))
		inc = vs0
	}
	firstIdx := d.floorIdx(inc-1) + 1
	if firstIdx > end {
		r.finding("returns_unavailable", "", 0, "inception %s is after the last trading day", dayString(inc))
		return
	}
	s.Returns.InceptionDate = dayString(d.cal[firstIdx])
	prs, err := returns.PeriodReturns(*r.vs, r.in.AsOf, dateOf(inc), r.p.LargeFlowFraction)
	if err != nil {
		r.finding("returns_unavailable", "", 0, "period returns: %v", err)
	}
	for _, pr := range prs {
		if !pr.Base.Before(pr.End) {
			continue
		}
		x := ptr(pr.Return)
		switch pr.Period {
		case returns.MonthToDate:
			s.Returns.MonthToDate = x
		case returns.QuarterToDate:
			s.Returns.QuarterToDate = x
		case returns.YearToDate:
			s.Returns.YearToDate = x
			s.Returns.BenchmarkYearToDate = r.benchReturn(d.floorIdx(dayOf(pr.Base)), end)
		case returns.SinceInception:
			s.Returns.SinceInception = x
			if pr.IsAnnualized {
				s.Returns.SinceInceptionAnn = ptr(pr.Annualized)
			}
		}
	}
	// The week is trailing: from the close of the last trading day on or
	// before as-of minus 7 days (a Friday-to-Friday week for a Friday
	// as-of), the same days as the week's return explanation.
	if t0 := r.weekBase; t0 >= 0 {
		base := max(t0, firstIdx)
		if base < end {
			if sub, err := r.vs.Slice(d.calTime[base], d.calTime[end]); err == nil {
				if twr, err := returns.TimeWeightedReturn(sub, r.p.LargeFlowFraction); err == nil {
					s.Returns.Week = ptr(twr.Return)
				}
			}
			s.Returns.BenchmarkWeek = r.benchReturn(base, end)
		}
	}
	r.series()
	r.volatility()
}

// benchReturn is the benchmark's return from the close of calendar day a
// to that of b.
func (r *run) benchReturn(a, b int) *float64 {
	la, ok := r.benchLevel(a)
	lb, ok2 := r.benchLevel(b)
	if !ok || !ok2 || a < 0 || a >= b {
		return nil
	}
	return ptr(lb/la - 1)
}

// series keeps the last HistoryDays days with a return: values, discrete,
// log and flow-adjusted dollar returns, the benchmark level rebased to 100
// on the first day kept, and the rolling standard deviations.
func (r *run) series() {
	vs, port := r.vs, r.port
	n := len(port)
	h := min(r.p.HistoryDays, n)
	logs := make([]float64, n)
	dollars := make([]float64, n)
	for i, x := range port {
		logs[i] = math.Log1p(x)
		dollars[i] = vs.Values[i+1] - vs.Flows[i+1] - vs.Values[i]
	}
	sr := Series{
		Dates:    make([]string, h),
		Value:    make([]float64, h),
		Discrete: slices.Clone(port[n-h:]),
		Log:      slices.Clone(logs[n-h:]),
		Dollar:   slices.Clone(dollars[n-h:]),
		Rolling:  []RollingSeries{},
	}
	cal0 := r.vsStart + 1 + n - h // calendar index of the first day kept
	for j := range h {
		sr.Dates[j] = dayString(r.d.cal[cal0+j])
		sr.Value[j] = vs.Values[n-h+j+1]
	}
	if l0, ok := r.benchLevel(cal0); ok {
		sr.Benchmark = make([]float64, h)
		for j := range h {
			l, _ := r.benchLevel(cal0 + j)
			sr.Benchmark[j] = 100 * l / l0
		}
	}
	ann := math.Sqrt(stats.TradingDaysPerYear)
	for _, w := range r.p.RollingWindows {
		for _, k := range []struct {
			kind, stat string
			x          []float64
			scale      float64
		}{{"discrete", "std_ann", port, ann}, {"log", "std_ann", logs, ann}, {"dollar", "std", dollars, 1}} {
			rs := RollingSeries{WindowDays: w, Kind: k.kind, Stat: k.stat, Values: make([]*float64, h)}
			if std, err := stats.RollingStd(k.x, w); err == nil {
				for j := range h {
					// std[i] ends at observation i+w−1.
					if i := n - h + j - w + 1; i >= 0 {
						rs.Values[j] = ptr(std[i] * k.scale)
					}
				}
			}
			sr.Rolling = append(sr.Rolling, rs)
		}
	}
	r.doc.Series = sr
}

// volatility fills the latest rolling volatilities, EWMA volatility,
// drawdowns, benchmark beta and tracking error.
func (r *run) volatility() {
	s, port, sr := &r.doc.Summary, r.port, &r.doc.Series
	s.Volatility = []WindowVol{}
	for _, w := range r.p.RollingWindows {
		wv := WindowVol{WindowDays: w}
		for _, rs := range sr.Rolling {
			if rs.WindowDays != w || len(rs.Values) == 0 {
				continue
			}
			last := rs.Values[len(rs.Values)-1]
			switch rs.Kind {
			case "discrete":
				wv.Discrete = last
			case "log":
				wv.Log = last
			case "dollar":
				wv.Dollar = last
			}
		}
		s.Volatility = append(s.Volatility, wv)
	}
	if ew, err := stats.EWMAVolatility(port, r.p.EWMALambda); err == nil {
		s.EWMAVolatility = ptr(ew[len(ew)-1] * math.Sqrt(stats.TradingDaysPerYear))
	}
	if dd, err := stats.DrawdownsFromReturns(port); err == nil {
		s.MaxDrawdown, s.CurrentDrawdown = ptr(dd.Max), ptr(dd.Current)
	}
	if r.bench == nil {
		return
	}
	bc := r.benchCal()
	var pr, br []float64
	for t := max(r.vsStart, r.benchAt) + 1; t < len(r.d.cal); t++ {
		pr = append(pr, port[t-r.vsStart-1])
		br = append(br, bc[t])
	}
	if k := len(pr) - r.p.VaRLookbackDays; k > 0 {
		pr, br = pr[k:], br[k:]
	}
	if b, err := stats.Beta(pr, br); err == nil {
		s.BenchmarkBeta = ptr(b)
	}
	if te, err := stats.TrackingError(pr, br); err == nil {
		s.TrackingError = ptr(te * math.Sqrt(stats.TradingDaysPerYear))
	}
}
