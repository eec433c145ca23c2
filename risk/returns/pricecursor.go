package returns

import (
	"sort"
	"time"
)

// priceCursor walks forward through a validated price history, applying the
// corporate actions dated after a starting day and carrying the last close
// forward over days without a price.
type priceCursor struct {
	prices []PricePoint
	next   int     // first price point not yet passed
	close  float64 // last close passed; 0 if none yet
}

// reset positions the cursor just after the last price point on or before
// from: its close is current and its corporate actions count as done.
func (c *priceCursor) reset(from time.Time) {
	d := day(from)
	c.next = sort.Search(len(c.prices), func(i int) bool { return day(c.prices[i].Date) > d })
	c.close = 0
	if c.next > 0 {
		c.close = c.prices[c.next-1].Close
	}
}

// advance passes every price point dated on or before to, calling event (if
// not nil) for each one, and reports whether a close is known.
func (c *priceCursor) advance(to time.Time, event func(PricePoint)) bool {
	d := day(to)
	for c.next < len(c.prices) && day(c.prices[c.next].Date) <= d {
		p := c.prices[c.next]
		if event != nil {
			event(p)
		}
		c.close = p.Close
		c.next++
	}
	return c.close > 0
}
