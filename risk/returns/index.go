package returns

import (
	"fmt"
	"math"
	"slices"
	"time"
)

// IndexMethod is how an index weights its constituents.
type IndexMethod int

const (
	// ValueWeighted weights each constituent by its market value, shares
	// outstanding × price.
	ValueWeighted IndexMethod = iota
	// PriceWeighted sums one share of each constituent and divides by a
	// divisor that is adjusted at splits so that a split moves no level.
	PriceWeighted
	// EqualWeighted gives each constituent the same weight every day (the
	// arithmetic average of their returns).
	EqualWeighted
	// EqualGeometric uses the geometric average of the constituents' growth
	// factors.
	EqualGeometric
)

var indexMethodNames = []string{"value", "price", "equal", "equal_geometric"}

func (m IndexMethod) String() string {
	if m >= 0 && int(m) < len(indexMethodNames) {
		return indexMethodNames[m]
	}
	return fmt.Sprintf("IndexMethod(%d)", int(m))
}

// ParseIndexMethod parses a benchmark method name: value, price, equal or
// equal_geometric.
func ParseIndexMethod(s string) (IndexMethod, error) {
	if i := slices.Index(indexMethodNames, s); i >= 0 {
		return IndexMethod(i), nil
	}
	return 0, fmt.Errorf("returns: index method %q: %w", s, ErrMethod)
}

// Constituent is one member of an index.
type Constituent struct {
	ID     string
	Prices []PricePoint
	// SharesOutstanding is the current share count (after every split in
	// Prices), > 0; needed by ValueWeighted only. The count on an earlier day
	// is this divided by the split ratios dated after that day.
	SharesOutstanding float64
}

// IndexOptions tunes BuildIndex. The zero value gives a price index based at
// 100.
type IndexOptions struct {
	Base        float64 // level on the first day; 0 means 100
	TotalReturn bool    // include dividends, reinvested at the ex-date close
}

// Index is an index level series.
type Index struct {
	Dates   []time.Time
	Levels  []float64
	Returns []float64 // Returns[t] = Levels[t]/Levels[t-1] - 1; Returns[0] = 0
	// Divisor (PriceWeighted only): D_t = Σ_i P_i,t / I_t. For a price index
	// it changes only on split days.
	Divisor []float64
}

// BuildIndex computes an index on the given days (strictly increasing) from
// its constituents, every one of which needs a price on or before the first
// day. With g_i,t the growth factor of constituent i from the close of day
// t-1 to the close of day t (s P_t / P_{t-1} for a price index,
// s (P_t + D_t) / P_{t-1} with TotalReturn, compounded over any price points
// in between; 1 when it has no price on day t, the last close being carried
// forward), the level is I_0 = Base, I_t = I_{t-1} (1 + R_t) with
//
//	ValueWeighted:  R_t = Σ N_i,t-1 P_i,t-1 (g_i,t - 1) / Σ N_i,t-1 P_i,t-1
//	                (price index: Σ N_i,t P_i,t / Σ N_i,t-1 P_i,t-1 - 1)
//	PriceWeighted:  R_t = Σ P'_i (g_i,t - 1) / Σ P'_i,  P'_i = P_i,t-1 / s_i,t
//	                (price index: Σ P_i,t / D_t with D_t = D_t-1 Σ P'_i / Σ P_i,t-1)
//	EqualWeighted:  R_t = (1/n) Σ (g_i,t - 1)
//	EqualGeometric: 1 + R_t = ( Π g_i,t )^(1/n)
func BuildIndex(method IndexMethod, cons []Constituent, days []time.Time, opt IndexOptions) (Index, error) {
	if method < ValueWeighted || method > EqualGeometric {
		return Index{}, fmt.Errorf("returns: index: %v: %w", method, ErrMethod)
	}
	if len(cons) == 0 || len(days) == 0 {
		return Index{}, fmt.Errorf("returns: index: %d constituents, %d days: %w", len(cons), len(days), ErrEmpty)
	}
	dd, err := dayNumbers("index days", days)
	if err != nil {
		return Index{}, err
	}
	base := opt.Base
	if base == 0 {
		base = 100
	}
	if !isFinite(base) || base < 0 {
		return Index{}, fmt.Errorf("returns: index: base %v: %w", base, ErrNonPositive)
	}
	n := len(cons)
	cur := make([]priceCursor, n)
	shares := make([]float64, n)
	for i, c := range cons {
		var err error
		if cur[i], err = newPriceCursor(c.Prices); err != nil {
			return Index{}, fmt.Errorf("returns: index: %s: %w", c.ID, err)
		}
		cur[i].reset(dd[0])
		if cur[i].close == 0 {
			return Index{}, fmt.Errorf("returns: index: %s on %s: %w", c.ID, days[0].Format(time.DateOnly), ErrMissingPrice)
		}
		if method == ValueWeighted {
			if !isFinite(c.SharesOutstanding) || c.SharesOutstanding <= 0 {
				return Index{}, fmt.Errorf("returns: index: %s: shares outstanding %v: %w", c.ID, c.SharesOutstanding, ErrNonPositive)
			}
			// Shares on the first day: undo the splits after it.
			shares[i] = c.SharesOutstanding
			for _, p := range c.Prices[cur[i].next:] {
				shares[i] /= p.Split()
			}
		}
	}

	ix := Index{
		Dates:   slices.Clone(days),
		Levels:  make([]float64, len(days)),
		Returns: make([]float64, len(days)),
	}
	ix.Levels[0] = base
	if method == PriceWeighted {
		ix.Divisor = make([]float64, len(days))
		ix.Divisor[0] = sumCloses(cur) / base
	}
	g := make([]float64, n)     // growth factors of the day
	split := make([]float64, n) // split factor of the day
	prev := make([]float64, n)  // previous closes
	for t := 1; t < len(days); t++ {
		d := dd[t]
		for i := range cur {
			c := &cur[i]
			p0 := c.close
			prev[i] = p0
			gi, si := 1.0, 1.0
			last := p0
			for c.due(d) {
				p := c.pass()
				s := p.Split()
				num := p.Close
				if opt.TotalReturn {
					num += p.Dividend
				}
				gi *= s * num / last
				si *= s
				last = p.Close
			}
			g[i], split[i] = gi, si
		}
		var r float64
		switch method {
		case ValueWeighted:
			var num, den float64
			for i := range g {
				mv := shares[i] * prev[i]
				num += mv * (g[i] - 1)
				den += mv
				shares[i] *= split[i]
			}
			r = num / den
		case PriceWeighted:
			var num, den float64
			for i := range g {
				adj := prev[i] / split[i]
				num += adj * (g[i] - 1)
				den += adj
			}
			r = num / den
		case EqualWeighted:
			for i := range g {
				r += g[i] - 1
			}
			r /= float64(n)
		case EqualGeometric:
			var s float64
			for i := range g {
				s += math.Log(g[i])
			}
			r = math.Expm1(s / float64(n))
		}
		ix.Returns[t] = r
		ix.Levels[t] = ix.Levels[t-1] * (1 + r)
		if method == PriceWeighted {
			ix.Divisor[t] = sumCloses(cur) / ix.Levels[t]
		}
	}
	return ix, nil
}

func sumCloses(cur []priceCursor) float64 {
	var s float64
	for i := range cur {
		s += cur[i].close
	}
	return s
}
