package pack

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sort"
	"time"

	"plumbline/risk/returns"
)

// Dates are handled as day numbers, days since 1970-01-01 of the UTC
// calendar date, so that comparisons and lookups are integer operations.

func dayOf(t time.Time) int64 {
	_, off := t.Zone() // the calendar date in t's own location, as t.Date()
	s := t.Unix() + int64(off)
	if s < 0 && s%86400 != 0 {
		return s/86400 - 1
	}
	return s / 86400
}

func dateOf(n int64) time.Time { return time.Unix(n*86400, 0).UTC() }

func dayString(n int64) string { return dateOf(n).Format(time.DateOnly) }

// weekOf numbers the Monday-to-Sunday week holding day n (1970-01-05 was a
// Monday, day 4).
func weekOf(n int64) int64 {
	x := n - 4
	if x < 0 {
		return (x - 6) / 7
	}
	return x / 7
}

// priceSeries is one security's validated bars up to the as-of date, read
// in place from the Inputs (which Compute never modifies).
type priceSeries struct {
	id    string
	src   *PriceSeries
	days  []int64
	first int       // calendar index of the first bar
	ret   []float64 // calendar-aligned daily total returns, built on demand
	week  []float64 // weekly total returns on the run's week ends (run.weeklyOf), built on demand
}

func (s *priceSeries) close(k int) float64 { return s.src.Close[k] }

func (s *priceSeries) dividend(k int) float64 {
	if s.src.Dividend == nil {
		return 0
	}
	return s.src.Dividend[k]
}

func (s *priceSeries) split(k int) float64 {
	if s.src.Split == nil {
		return 1
	}
	return s.src.Split[k]
}

// points returns the bars from index from on as returns.PricePoint.
func (s *priceSeries) points(from int) []returns.PricePoint {
	out := make([]returns.PricePoint, len(s.days)-from)
	for i := range out {
		k := from + i
		out[i] = returns.PricePoint{Date: s.src.Dates[k], Close: s.close(k), Dividend: s.dividend(k), SplitRatio: s.split(k)}
	}
	return out
}

// lastOnOrBefore returns the index of the last bar dated on or before day,
// or -1.
func (s *priceSeries) lastOnOrBefore(day int64) int {
	return sort.Search(len(s.days), func(i int) bool { return s.days[i] > day }) - 1
}

// data is Inputs indexed for the computation: everything dated after the
// as-of date left out, series sorted, the trading calendar built once.
type data struct {
	asOf int64

	// cal is the trading calendar: every day with a bar of any security,
	// ascending, up to the as-of date. calTime holds the same days as
	// time.Time; floor[d-calMin] is the last calendar index on or before d.
	cal     []int64
	calTime []time.Time
	calMin  int64
	floor   []int32

	secs    map[string]*Security
	secIDs  []string // sorted
	prices  map[string]*priceSeries
	snaps   []Snapshot // one per date (highest revision), ascending
	flows   []DatedValue
	curves  []YieldCurve // tenors ascending, dates ascending
	prem    []DatedValue
	assump  map[string][]Assumption // per security, ascending by Effective
	finding []Finding
}

func (d *data) find(kind, id, format string, a ...any) {
	d.finding = append(d.finding, Finding{Kind: kind, ID: id, Detail: fmt.Sprintf(format, a...)})
}

// floorIdx returns the last calendar index on or before day, or -1.
func (d *data) floorIdx(day int64) int {
	switch {
	case len(d.cal) == 0 || day < d.calMin:
		return -1
	case day-d.calMin >= int64(len(d.floor)):
		return len(d.cal) - 1
	}
	return int(d.floor[day-d.calMin])
}

// last is the calendar index of the last trading day on or before as-of.
func (d *data) last() int { return len(d.cal) - 1 }

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// newData indexes the inputs. Malformed rows of one security or one date
// become findings; only the absence of every price is an error.
func newData(in *Inputs) (*data, error) {
	d := &data{
		asOf:   dayOf(in.AsOf),
		secs:   make(map[string]*Security, len(in.Securities)),
		prices: make(map[string]*priceSeries, len(in.Prices)),
		assump: map[string][]Assumption{},
	}
	for i := range in.Securities {
		s := &in.Securities[i]
		if _, dup := d.secs[s.ID]; dup || s.ID == "" {
			d.find("invalid_security", s.ID, "security listed twice or without an ID; the first listing is used")
			continue
		}
		d.secs[s.ID] = s
		d.secIDs = append(d.secIDs, s.ID)
	}
	slices.Sort(d.secIDs)

	lo, hi := int64(math.MaxInt64), int64(math.MinInt64)
	for i := range in.Prices {
		ps, err := d.priceSeries(&in.Prices[i])
		if err != nil {
			d.find("invalid_prices", in.Prices[i].SecurityID, "price history left out: %v", err)
			continue
		}
		if ps == nil {
			continue
		}
		d.prices[ps.id] = ps
		lo, hi = min(lo, ps.days[0]), max(hi, ps.days[len(ps.days)-1])
	}
	if len(d.prices) == 0 {
		return nil, fmt.Errorf("%w: no price on or before %s", ErrNoPrices, dayString(d.asOf))
	}
	d.buildCalendar(lo, hi)

	d.snapshots(in.Snapshots)
	for _, f := range in.Flows {
		if dayOf(f.Date) > d.asOf {
			continue
		}
		if !finite(f.Value) {
			d.find("invalid_flow", "", "flow on %s of %v left out", f.Date.Format(time.DateOnly), f.Value)
			continue
		}
		d.flows = append(d.flows, f)
	}
	slices.SortStableFunc(d.flows, func(a, b DatedValue) int { return cmp.Compare(dayOf(a.Date), dayOf(b.Date)) })
	d.yieldCurves(in.Yields)
	for _, p := range in.Premiums {
		if dayOf(p.Date) <= d.asOf && finite(p.Value) {
			d.prem = append(d.prem, p)
		}
	}
	slices.SortStableFunc(d.prem, func(a, b DatedValue) int { return cmp.Compare(dayOf(a.Date), dayOf(b.Date)) })
	for _, a := range in.Assumptions {
		if dayOf(a.Effective) <= d.asOf {
			d.assump[a.SecurityID] = append(d.assump[a.SecurityID], a)
		}
	}
	for _, as := range d.assump {
		slices.SortStableFunc(as, func(a, b Assumption) int { return cmp.Compare(dayOf(a.Effective), dayOf(b.Effective)) })
	}
	return d, nil
}

// priceSeries validates one security's bars up to the as-of date. A nil
// series without error means no bar on or before it.
func (d *data) priceSeries(p *PriceSeries) (*priceSeries, error) {
	if _, dup := d.prices[p.SecurityID]; dup {
		return nil, fmt.Errorf("second price history of the security")
	}
	n := len(p.Dates)
	if len(p.Close) != n || (p.Dividend != nil && len(p.Dividend) != n) || (p.Split != nil && len(p.Split) != n) {
		return nil, fmt.Errorf("%d dates, %d closes, %d dividends, %d split ratios", n, len(p.Close), len(p.Dividend), len(p.Split))
	}
	m := sort.Search(n, func(i int) bool { return dayOf(p.Dates[i]) > d.asOf })
	if m == 0 {
		return nil, nil
	}
	ps := &priceSeries{id: p.SecurityID, src: p, days: make([]int64, m)}
	for i := range m {
		ps.days[i] = dayOf(p.Dates[i])
		// The checks of returns.ValidatePrices, without its cost of
		// formatting every date.
		c, dv, sp := ps.close(i), ps.dividend(i), ps.split(i)
		switch {
		case !finite(c) || c <= 0:
			return nil, fmt.Errorf("close %v on %s: %w", c, p.Dates[i].Format(time.DateOnly), returns.ErrPrice)
		case !finite(dv) || dv < 0:
			return nil, fmt.Errorf("dividend %v on %s: %w", dv, p.Dates[i].Format(time.DateOnly), returns.ErrDividend)
		case !finite(sp) || sp <= 0:
			return nil, fmt.Errorf("split ratio %v on %s: %w", sp, p.Dates[i].Format(time.DateOnly), returns.ErrSplit)
		case i > 0 && ps.days[i] <= ps.days[i-1]:
			return nil, fmt.Errorf("%s after %s: %w", p.Dates[i].Format(time.DateOnly), p.Dates[i-1].Format(time.DateOnly), returns.ErrOrder)
		}
	}
	return ps, nil
}

// buildCalendar marks every bar's day between lo and hi.
func (d *data) buildCalendar(lo, hi int64) {
	mark := make([]bool, hi-lo+1)
	for _, ps := range d.prices {
		for _, x := range ps.days {
			mark[x-lo] = true
		}
	}
	d.calMin = lo
	d.floor = make([]int32, len(mark))
	k := int32(-1)
	for i, m := range mark {
		if m {
			k++
			d.cal = append(d.cal, lo+int64(i))
		}
		d.floor[i] = k
	}
	d.calTime = make([]time.Time, len(d.cal))
	for i, x := range d.cal {
		d.calTime[i] = dateOf(x)
	}
	for _, ps := range d.prices {
		ps.first = int(d.floor[ps.days[0]-lo])
	}
}

// snapshots keeps the snapshots on or before the as-of date, one per date
// (the highest revision), ascending, with invalid lines left out.
func (d *data) snapshots(in []Snapshot) {
	idx := make([]int, 0, len(in))
	for i := range in {
		if dayOf(in[i].AsOf) <= d.asOf {
			idx = append(idx, i)
		}
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		if c := cmp.Compare(dayOf(in[a].AsOf), dayOf(in[b].AsOf)); c != 0 {
			return c
		}
		return cmp.Compare(in[a].Revision, in[b].Revision)
	})
	for _, i := range idx {
		s := in[i]
		if n := len(d.snaps); n > 0 && dayOf(d.snaps[n-1].AsOf) == dayOf(s.AsOf) {
			d.snaps = d.snaps[:n-1]
		}
		date := s.AsOf.Format(time.DateOnly)
		if !finite(s.Cash) {
			d.find("invalid_holding", "CASH", "snapshot %s: cash %v read as 0", date, s.Cash)
			s.Cash = 0
		}
		lines := make([]Line, 0, len(s.Lines))
		for _, l := range s.Lines {
			if !finite(l.Quantity) || l.Quantity < 0 {
				d.find("invalid_holding", l.SecurityID, "snapshot %s: quantity %v left out", date, l.Quantity)
				continue
			}
			lines = append(lines, l)
		}
		s.Lines = lines
		d.snaps = append(d.snaps, s)
	}
}

// yieldCurves keeps the curves on or before the as-of date with their
// valid points sorted by tenor, ascending by date.
func (d *data) yieldCurves(in []YieldCurve) {
	for _, c := range in {
		if dayOf(c.Date) > d.asOf || len(c.Tenors) != len(c.Yields) {
			continue
		}
		out := YieldCurve{Date: c.Date}
		order := make([]int, 0, len(c.Tenors))
		for i := range c.Tenors {
			if c.Tenors[i] > 0 && finite(c.Yields[i]) && c.Yields[i] > -1 {
				order = append(order, i)
			}
		}
		slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(c.Tenors[a], c.Tenors[b]) })
		for _, i := range order {
			if n := len(out.Tenors); n > 0 && out.Tenors[n-1] == c.Tenors[i] {
				continue
			}
			out.Tenors = append(out.Tenors, c.Tenors[i])
			out.Yields = append(out.Yields, c.Yields[i])
		}
		if len(out.Tenors) > 0 {
			d.curves = append(d.curves, out)
		}
	}
	slices.SortStableFunc(d.curves, func(a, b YieldCurve) int { return cmp.Compare(dayOf(a.Date), dayOf(b.Date)) })
}

// curveAt returns the index of the latest curve dated on or before day, or -1.
func (d *data) curveAt(day int64) int {
	return sort.Search(len(d.curves), func(i int) bool { return dayOf(d.curves[i].Date) > day }) - 1
}

// premiumAt returns the latest premium dated on or before day.
func (d *data) premiumAt(day int64) (DatedValue, bool) {
	i := sort.Search(len(d.prem), func(i int) bool { return dayOf(d.prem[i].Date) > day }) - 1
	if i < 0 {
		return DatedValue{}, false
	}
	return d.prem[i], true
}

// assumptionAt returns the assumptions of id in effect on day: the latest
// effective on or before it.
func (d *data) assumptionAt(id string, day int64) (Assumption, bool) {
	as := d.assump[id]
	i := sort.Search(len(as), func(i int) bool { return dayOf(as[i].Effective) > day }) - 1
	if i < 0 {
		return Assumption{}, false
	}
	return as[i], true
}

// yieldAt returns the zero yield at tenor months, linear in tenor between
// the nearest tenors; outside the curve's range the end yield is used and
// extrapolated is true.
func yieldAt(c *YieldCurve, tenor int) (y float64, extrapolated bool) {
	n := len(c.Tenors)
	i := sort.SearchInts(c.Tenors, tenor)
	switch {
	case i < n && c.Tenors[i] == tenor:
		return c.Yields[i], false
	case i == 0:
		return c.Yields[0], true
	case i == n:
		return c.Yields[n-1], true
	}
	t0, t1 := float64(c.Tenors[i-1]), float64(c.Tenors[i])
	w := (float64(tenor) - t0) / (t1 - t0)
	return c.Yields[i-1] + w*(c.Yields[i]-c.Yields[i-1]), false
}

// calReturns returns the security's daily total returns aligned on the
// calendar, NaN on days without a bar (the move is in the next bar's
// return) and before the first bar:
//
//	r_t = s_t·(P_t + D_t)/P_prev − 1
//
// with P_prev the previous bar's close (the contract's convention).
func (d *data) calReturns(ps *priceSeries) []float64 {
	if ps.ret != nil {
		return ps.ret
	}
	r := make([]float64, len(d.cal))
	for i := range r {
		r[i] = math.NaN()
	}
	for k := 1; k < len(ps.days); k++ {
		r[d.floor[ps.days[k]-d.calMin]] = ps.split(k)*(ps.close(k)+ps.dividend(k))/ps.close(k-1) - 1
	}
	ps.ret = r
	return r
}
