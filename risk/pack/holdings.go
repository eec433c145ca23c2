package pack

import (
	"cmp"
	"fmt"
	"slices"
)

// position is one security held on a day.
type position struct {
	id       string
	qty      float64 // split-adjusted to the day
	price    float64 // last close on or before the day; the snapshot's price when there is none
	priceDay int64   // day of that close; -1 when there is none
	value    float64 // qty × price
}

// bookOf is the portfolio on a day: the latest snapshot on or before it,
// rolled forward.
type bookOf struct {
	day     int64
	snapDay int64
	lines   []position // sorted by ID
	cash    float64
}

// bookAt rolls the latest snapshot on or before day forward to day:
//
//	q(day)    = q(snapshot) × Π s_t                     over bars in (snapshot, day]
//	cash(day) = cash(snapshot) + Σ q_t·D_t + Σ F_t      over the same days
//
// where q_t is the quantity after the split of day t (dividends are per
// post-split share, so a split and a dividend on one day are applied in
// that order) and F_t are the external flows. This is exactly what
// returns.Valuate does, so the as-of value equals the last value of the
// daily series. A snapshot dated on day is taken as is. ok is false when
// there is no snapshot on or before day.
func (d *data) bookAt(day int64) (b bookOf, ok bool) {
	si := -1
	for i := range d.snaps {
		if dayOf(d.snaps[i].AsOf) <= day {
			si = i
		}
	}
	if si < 0 {
		return bookOf{}, false
	}
	s := &d.snaps[si]
	b = bookOf{day: day, snapDay: dayOf(s.AsOf), cash: s.Cash}
	qty := map[string]float64{}
	snapPrice := map[string]float64{}
	for _, l := range s.Lines {
		if l.SecurityID == "CASH" { // defensive: cash belongs in Snapshot.Cash
			b.cash += l.Quantity * l.Price
			continue
		}
		qty[l.SecurityID] += l.Quantity
		snapPrice[l.SecurityID] = l.Price
	}
	ids := make([]string, 0, len(qty))
	for id, q := range qty {
		if q > 0 {
			ids = append(ids, id)
		}
	}
	slices.Sort(ids)
	for _, id := range ids {
		p := position{id: id, qty: qty[id], price: snapPrice[id], priceDay: -1}
		if ps := d.prices[id]; ps != nil {
			i0 := ps.lastOnOrBefore(b.snapDay) + 1
			i1 := ps.lastOnOrBefore(day)
			for k := i0; k <= i1; k++ {
				p.qty *= ps.split(k)
				b.cash += p.qty * ps.dividend(k)
			}
			if i1 >= 0 {
				p.price, p.priceDay = ps.close(i1), ps.days[i1]
			}
		}
		p.value = p.qty * p.price
		b.lines = append(b.lines, p)
	}
	for _, f := range d.flows {
		if fd := dayOf(f.Date); fd > b.snapDay && fd <= day {
			b.cash += f.Value
		}
	}
	return b, true
}

// holdings fills Holdings, Sectors, Concentration and the value lines of
// Summary from the book on the as-of date. A holding without a close on
// the as-of date carries its last close for up to StalePriceDays calendar
// days (a stale_price finding); beyond that, or without any close, it is
// left out of every measure (a missing_price finding and an exclusion, its
// value share measured at its last known price).
func (r *run) holdings() error {
	d, doc := r.d, r.doc
	b, ok := d.bookAt(d.asOf)
	if !ok {
		return fmt.Errorf("%w: no holdings snapshot on or before %s", ErrNoHoldings, dayString(d.asOf))
	}
	r.book = b
	var priced, missing []position
	for _, p := range b.lines {
		if p.priceDay >= 0 && d.asOf-p.priceDay <= int64(r.p.StalePriceDays) {
			priced = append(priced, p)
		} else {
			missing = append(missing, p)
		}
	}
	if len(b.lines) > 0 && len(priced) == 0 {
		return fmt.Errorf("%w: none of the %d held securities has a close within %d days of %s", ErrNoPrices, len(b.lines), r.p.StalePriceDays, dayString(d.asOf))
	}
	total := b.cash
	for _, p := range priced {
		total += p.value
	}
	if !(total > 0) {
		return fmt.Errorf("%w: value on %s is %v, not positive", ErrNoHoldings, dayString(d.asOf), total)
	}
	r.total = total
	doc.Summary.Value, doc.Summary.Cash, doc.Summary.HoldingCount = total, b.cash, len(priced)

	var missingValue float64
	for _, p := range missing {
		missingValue += p.value
	}
	for _, p := range missing {
		reason := fmt.Sprintf("no close on or before %s", dayString(d.asOf))
		if p.priceDay >= 0 {
			reason = fmt.Sprintf("last close dated %s is %d days before %s, beyond the %d allowed", dayString(p.priceDay), d.asOf-p.priceDay, dayString(d.asOf), r.p.StalePriceDays)
		}
		share := p.value / (total + missingValue)
		doc.Excluded = append(doc.Excluded, Exclusion{ID: p.id, Reason: reason, ValueShare: share})
		doc.DataQuality = append(doc.DataQuality, Finding{Kind: "missing_price", ID: p.id, Detail: reason + "; left out of every measure", ValueShare: share})
	}

	doc.Holdings = make([]Holding, 0, len(priced))
	for _, p := range priced {
		h := Holding{ID: p.id, Sector: "Unknown", Quantity: p.qty, Price: p.price, PriceDate: dayString(p.priceDay), Value: p.value, Weight: p.value / total}
		if s := d.secs[p.id]; s != nil {
			h.Name, h.Sector = s.Name, s.Sector
		} else {
			r.finding("unknown_security", p.id, h.Weight, "held but missing from the securities list; sector shown as Unknown")
		}
		if age := d.asOf - p.priceDay; age > 0 {
			r.finding("stale_price", p.id, h.Weight, "no close on %s; last close dated %s, %d days old, carried forward", dayString(d.asOf), dayString(p.priceDay), age)
		}
		doc.Holdings = append(doc.Holdings, h)
	}
	r.sectors()
	r.concentration()
	return nil
}

// sectors sums holdings by sector, largest weight first (ties by name).
func (r *run) sectors() {
	doc := r.doc
	idx := map[string]int{}
	for _, h := range doc.Holdings {
		i, ok := idx[h.Sector]
		if !ok {
			i = len(doc.Sectors)
			idx[h.Sector] = i
			doc.Sectors = append(doc.Sectors, Sector{Name: h.Sector})
		}
		doc.Sectors[i].Value += h.Value
		doc.Sectors[i].Weight += h.Weight
	}
	slices.SortFunc(doc.Sectors, func(a, b Sector) int {
		if c := cmp.Compare(b.Weight, a.Weight); c != 0 {
			return c
		}
		return cmp.Compare(a.Name, b.Name)
	})
}

// concentration computes, over the securities' weights w_i of the total
// value (cash included in the total, not in the sums):
//
//	HHI = Σ w_i²,  EffectiveN = 1/HHI,  Top5 = sum of the five largest w_i
//
// and the largest name and sector (ties by ID or name) and the cash weight.
func (r *run) concentration() {
	doc := r.doc
	c := Concentration{CashWeight: r.book.cash / r.total}
	ws := make([]float64, 0, len(doc.Holdings))
	for _, h := range doc.Holdings {
		c.HHI += h.Weight * h.Weight
		ws = append(ws, h.Weight)
		if h.Weight > c.MaxSingleName || (h.Weight == c.MaxSingleName && h.ID < c.MaxSingleID) || c.MaxSingleID == "" {
			c.MaxSingleName, c.MaxSingleID = h.Weight, h.ID
		}
	}
	slices.SortFunc(ws, func(a, b float64) int { return cmp.Compare(b, a) })
	for i := 0; i < 5 && i < len(ws); i++ {
		c.Top5Weight += ws[i]
	}
	if c.HHI > 0 {
		c.EffectiveN = 1 / c.HHI
	}
	if len(doc.Sectors) > 0 {
		c.MaxSector, c.MaxSectorName = doc.Sectors[0].Weight, doc.Sectors[0].Name
	}
	doc.Concentration = c
}
