package returns

import "slices"

// priceCursor walks forward through a validated price history, applying the
// corporate actions dated after a starting day and carrying the last close
// forward over days without a price. Days are day numbers (see day), held
// beside the prices so that the walk compares integers.
type priceCursor struct {
	prices []PricePoint
	days   []int64 // day(prices[i].Date), strictly increasing
	next   int     // first price point not yet passed
	close  float64 // last close passed; 0 if none yet
}

// newPriceCursor validates prices (ValidatePrices) and returns a cursor
// before the first of them.
func newPriceCursor(prices []PricePoint) (priceCursor, error) {
	days, err := priceDays(prices)
	if err != nil {
		return priceCursor{}, err
	}
	return priceCursor{prices: prices, days: days}, nil
}

// reset positions the cursor just after the last price point on or before
// day from: its close is current and its corporate actions count as done.
func (c *priceCursor) reset(from int64) {
	i, found := slices.BinarySearch(c.days, from)
	if found {
		i++
	}
	c.next = i
	c.close = 0
	if c.next > 0 {
		c.close = c.prices[c.next-1].Close
	}
}

// due reports whether the next price point is dated on or before day to.
func (c *priceCursor) due(to int64) bool { return c.next < len(c.days) && c.days[c.next] <= to }

// pass moves past the next price point, making its close current, and
// returns it for its corporate actions.
func (c *priceCursor) pass() *PricePoint {
	p := &c.prices[c.next]
	c.close = p.Close
	c.next++
	return p
}
