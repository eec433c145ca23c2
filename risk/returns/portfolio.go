package returns

import (
	"fmt"
	"slices"
	"sort"
	"time"
)

// Snapshot is a portfolio's holdings at the close of Date.
type Snapshot struct {
	Date       time.Time
	Quantities map[string]float64 // shares per security ID, >= 0
	Cash       float64            // base currency; negative for an overdraft
}

// Flow is an external cash flow, end-of-day: positive in, negative out.
type Flow struct {
	Date   time.Time
	Amount float64
}

// Book is what a portfolio's valuation needs: its holdings snapshots, the
// price histories of the securities it holds, and its external flows.
type Book struct {
	Snapshots []Snapshot
	Prices    map[string][]PricePoint // by security ID, each ascending by date
	Flows     []Flow
}

// ValueSeries is a portfolio's daily closing values and external flows.
type ValueSeries struct {
	Dates  []time.Time
	Values []float64 // V_t: closing value, including F_t
	Flows  []float64 // F_t: net external flow dated in (Dates[t-1], Dates[t]]; for t = 0, dated Dates[0]
}

// Valuate computes the portfolio value at the close of each day in days
// (strictly increasing, none before the first snapshot):
//
//	V_t = Σ_i q_i(t) P_i(t) + cash(t)
//
// The holdings of day t are those of the latest snapshot on or before t,
// carried forward. Between snapshots, events dated after the snapshot day and
// on or before t are applied: a split with ratio s multiplies the quantity by
// s; a dividend D going ex credits q·D (q after that day's split) to cash; an
// external flow is added to cash. A snapshot is taken as complete on its own
// date: events on that date are already in it. P_i(t) is the close on t, or
// the latest close before t when the security has no price that day (stale
// price). A held security with no price on or before t is an error.
//
// A flow dated on a day that is not in days counts on the next valuation day
// (it is in that day's close).
func Valuate(b Book, days []time.Time) (ValueSeries, error) {
	if len(days) == 0 {
		return ValueSeries{}, fmt.Errorf("returns: valuation: no days: %w", ErrEmpty)
	}
	if len(b.Snapshots) == 0 {
		return ValueSeries{}, fmt.Errorf("returns: valuation: no snapshots: %w", ErrNoSnapshot)
	}
	// Dates become day numbers once; the loops below compare integers.
	dd, err := dayNumbers("valuation days", days)
	if err != nil {
		return ValueSeries{}, err
	}
	snaps := slices.Clone(b.Snapshots)
	slices.SortStableFunc(snaps, func(a, c Snapshot) int { return int(day(a.Date) - day(c.Date)) })
	sd, err := dayNumbers("snapshots", snapDates(snaps))
	if err != nil {
		return ValueSeries{}, err
	}
	flows := slices.Clone(b.Flows)
	slices.SortStableFunc(flows, func(a, c Flow) int { return int(day(a.Date) - day(c.Date)) })
	fd := make([]int64, len(flows))
	for i, f := range flows {
		if !isFinite(f.Amount) {
			return ValueSeries{}, fmt.Errorf("returns: valuation: flow %s: amount %v: %w", f.Date.Format(time.DateOnly), f.Amount, ErrNonFinite)
		}
		fd[i] = day(f.Date)
	}

	// Each security held in any snapshot gets a dense number k and a price
	// cursor cur[k], so the daily loop indexes slices instead of maps.
	index := map[string]int{}
	var cur []priceCursor
	for _, s := range snaps {
		if !isFinite(s.Cash) {
			return ValueSeries{}, fmt.Errorf("returns: valuation: snapshot %s: cash %v: %w", s.Date.Format(time.DateOnly), s.Cash, ErrNonFinite)
		}
		for id, q := range s.Quantities {
			if !isFinite(q) || q < 0 {
				return ValueSeries{}, fmt.Errorf("returns: valuation: snapshot %s: %s quantity %v: %w", s.Date.Format(time.DateOnly), id, q, ErrQuantity)
			}
			if _, ok := index[id]; ok {
				continue
			}
			c, err := newPriceCursor(b.Prices[id])
			if err != nil {
				return ValueSeries{}, fmt.Errorf("returns: valuation: %s: %w", id, err)
			}
			index[id] = len(cur)
			cur = append(cur, c)
		}
	}

	vs := ValueSeries{
		Dates:  slices.Clone(days),
		Values: make([]float64, len(days)),
		Flows:  make([]float64, len(days)),
	}
	// Flows reported per valuation day.
	fi := sort.Search(len(flows), func(i int) bool { return fd[i] >= dd[0] })
	for t, d := range dd {
		for fi < len(flows) && fd[fi] <= d {
			if t > 0 || fd[fi] == d {
				vs.Flows[t] += flows[fi].Amount
			}
			fi++
		}
	}

	var (
		si    = -1      // active snapshot
		ids   []string  // its securities, sorted
		held  []int     // held[j]: dense number of ids[j]
		qty   []float64 // qty[j]: shares of ids[j]
		cash  float64
		fNext int // next flow to credit to cash
	)
	for t, d := range dd {
		// Switch to the latest snapshot on or before d.
		ns := si
		for ns+1 < len(snaps) && sd[ns+1] <= d {
			ns++
		}
		if ns < 0 {
			return ValueSeries{}, fmt.Errorf("returns: valuation: %s: %w", days[t].Format(time.DateOnly), ErrNoSnapshot)
		}
		if ns != si {
			si = ns
			s := snaps[si]
			ids = ids[:0]
			for id := range s.Quantities {
				ids = append(ids, id)
			}
			slices.Sort(ids)
			held, qty = held[:0], qty[:0]
			for _, id := range ids {
				k := index[id]
				held = append(held, k)
				qty = append(qty, s.Quantities[id])
				cur[k].reset(sd[si])
			}
			cash = s.Cash
			fNext = sort.Search(len(flows), func(i int) bool { return fd[i] > sd[si] })
		}
		for fNext < len(flows) && fd[fNext] <= d {
			cash += flows[fNext].Amount
			fNext++
		}
		var v float64
		for j, k := range held {
			c := &cur[k]
			for c.due(d) {
				p := c.pass()
				qty[j] *= p.Split()
				cash += qty[j] * p.Dividend
			}
			if !(c.close > 0) {
				if qty[j] == 0 {
					continue
				}
				return ValueSeries{}, fmt.Errorf("returns: valuation: %s on %s: %w", ids[j], days[t].Format(time.DateOnly), ErrMissingPrice)
			}
			v += qty[j] * c.close
		}
		vs.Values[t] = v + cash
	}
	return vs, nil
}

func snapDates(s []Snapshot) []time.Time {
	d := make([]time.Time, len(s))
	for i := range s {
		d[i] = s[i].Date
	}
	return d
}

// DailyReturns returns the flow-neutral daily returns of a value series, one
// per day after the first:
//
//	r_t = (V_t - F_t) / V_{t-1} - 1
//
// (end-of-day flows earn nothing on their day). Linked, they give the true
// time-weighted return. V_{t-1} must be positive.
func DailyReturns(v ValueSeries) ([]float64, error) {
	if err := v.check("daily returns"); err != nil {
		return nil, err
	}
	r := make([]float64, len(v.Values)-1)
	for t := 1; t < len(v.Values); t++ {
		if v.Values[t-1] <= 0 {
			return nil, fmt.Errorf("returns: daily returns: value %v on %s: %w", v.Values[t-1], v.Dates[t-1].Format(time.DateOnly), ErrValue)
		}
		r[t-1] = (v.Values[t]-v.Flows[t])/v.Values[t-1] - 1
	}
	return r, nil
}

// check verifies the shape of a value series: equal lengths, at least two
// days, increasing dates, finite numbers.
func (v ValueSeries) check(op string) error {
	if len(v.Dates) != len(v.Values) || len(v.Dates) != len(v.Flows) {
		return fmt.Errorf("returns: %s: %d dates, %d values, %d flows: %w", op, len(v.Dates), len(v.Values), len(v.Flows), ErrLength)
	}
	if len(v.Dates) < 2 {
		return fmt.Errorf("returns: %s: %d values, need 2: %w", op, len(v.Dates), ErrEmpty)
	}
	if err := checkDates(op, v.Dates); err != nil {
		return err
	}
	if err := checkFinite(op, v.Values); err != nil {
		return err
	}
	return checkFinite(op, v.Flows)
}

// Slice returns the part of v from the close of from to the close of to,
// both of which must be valuation dates. The flow of the first day is set to
// zero: it is already in the starting value.
func (v ValueSeries) Slice(from, to time.Time) (ValueSeries, error) {
	i, j := v.index(from), v.index(to)
	if i < 0 || j < 0 || j < i {
		return ValueSeries{}, fmt.Errorf("returns: slice %s to %s: not valuation dates in order: %w",
			from.Format(time.DateOnly), to.Format(time.DateOnly), ErrDate)
	}
	s := ValueSeries{
		Dates:  slices.Clone(v.Dates[i : j+1]),
		Values: slices.Clone(v.Values[i : j+1]),
		Flows:  slices.Clone(v.Flows[i : j+1]),
	}
	s.Flows[0] = 0
	return s, nil
}

// index returns the position of date d in v.Dates, or -1.
func (v ValueSeries) index(d time.Time) int {
	k := sort.Search(len(v.Dates), func(i int) bool { return day(v.Dates[i]) >= day(d) })
	if k < len(v.Dates) && day(v.Dates[k]) == day(d) {
		return k
	}
	return -1
}
