package returns

import (
	"fmt"
	"math"
	"time"
)

// PricePoint is one trading day of a security's history.
type PricePoint struct {
	Date       time.Time
	Close      float64 // unadjusted close, > 0, base currency
	Dividend   float64 // cash dividend per post-split share going ex on Date; 0 if none
	SplitRatio float64 // new shares per old share, effective at the open of Date; 0 or 1 if none
}

// Split returns the split ratio of the day, 1 when SplitRatio is unset.
func (p PricePoint) Split() float64 {
	if p.SplitRatio == 0 {
		return 1
	}
	return p.SplitRatio
}

// ValidatePrices checks a price history: dates strictly increasing, closes
// positive, dividends non-negative, split ratios positive (or 0 for none),
// all finite.
func ValidatePrices(prices []PricePoint) error { return checkPrices(prices, nil) }

// priceDays validates prices as ValidatePrices does and returns the day
// number of each point.
func priceDays(prices []PricePoint) ([]int64, error) {
	days := make([]int64, len(prices))
	if err := checkPrices(prices, days); err != nil {
		return nil, err
	}
	return days, nil
}

// checkPrices is ValidatePrices, also storing day(prices[i].Date) in
// days[i] when days is not nil. Dates are formatted only for an error:
// formatting every one cost more than all the checks.
func checkPrices(prices []PricePoint, days []int64) error {
	var prev int64
	for i := range prices {
		p := &prices[i]
		d := day(p.Date)
		if days != nil {
			days[i] = d
		}
		switch {
		case !isFinite(p.Close) || p.Close <= 0:
			return fmt.Errorf("returns: price %s: close %v: %w", p.Date.Format(time.DateOnly), p.Close, ErrPrice)
		case !isFinite(p.Dividend) || p.Dividend < 0:
			return fmt.Errorf("returns: price %s: dividend %v: %w", p.Date.Format(time.DateOnly), p.Dividend, ErrDividend)
		case !isFinite(p.SplitRatio) || p.SplitRatio < 0:
			return fmt.Errorf("returns: price %s: split ratio %v: %w", p.Date.Format(time.DateOnly), p.SplitRatio, ErrSplit)
		case i > 0 && d <= prev:
			return fmt.Errorf("returns: price %s after %s: %w", p.Date.Format(time.DateOnly), prices[i-1].Date.Format(time.DateOnly), ErrOrder)
		}
		prev = d
	}
	return nil
}

// SecurityReturns holds the daily return series of one security. Element i
// is the return of day Dates[i] (the close of the previous price point to the
// close of this one).
type SecurityReturns struct {
	Dates []time.Time
	// Discrete total return, dividends reinvested at the ex-date close:
	//	r_t = s_t (P_t + D_t) / P_{t-1} - 1
	Discrete []float64
	// Log (continuously compounded) total return: ln( s_t (P_t + D_t) / P_{t-1} ).
	Log []float64
	// Dollar change of one share held from the previous close, dividend
	// included, in base currency: s_t (P_t + D_t) - P_{t-1}.
	Dollar []float64
	// Price return without dividends: s_t P_t / P_{t-1} - 1.
	Price []float64
}

// SecurityReturnSeries computes the return series of a security from its
// price history (at least two points).
func SecurityReturnSeries(prices []PricePoint) (SecurityReturns, error) {
	if len(prices) < 2 {
		return SecurityReturns{}, fmt.Errorf("returns: security returns: %d prices, need 2: %w", len(prices), ErrEmpty)
	}
	if err := ValidatePrices(prices); err != nil {
		return SecurityReturns{}, err
	}
	n := len(prices) - 1
	sr := SecurityReturns{
		Dates:    make([]time.Time, n),
		Discrete: make([]float64, n),
		Log:      make([]float64, n),
		Dollar:   make([]float64, n),
		Price:    make([]float64, n),
	}
	for i := 1; i < len(prices); i++ {
		p0, p := prices[i-1].Close, prices[i]
		s := p.Split()
		g := s * (p.Close + p.Dividend) / p0
		sr.Dates[i-1] = p.Date
		sr.Discrete[i-1] = g - 1
		sr.Log[i-1] = math.Log(g)
		sr.Dollar[i-1] = s*(p.Close+p.Dividend) - p0
		sr.Price[i-1] = s*p.Close/p0 - 1
	}
	return sr, nil
}

// TotalReturnIndex returns the total-return index of a security, one level
// per price point:
//
//	I_0 = base,   I_t = I_{t-1} (1 + r_t) = I_{t-1} s_t (P_t + D_t) / P_{t-1}
//
// It equals the value of a holding worth base at the first close whose
// dividends buy more shares at the ex-date close (D_t/P_t shares per share)
// and whose share count follows the splits. base must be positive.
func TotalReturnIndex(prices []PricePoint, base float64) ([]float64, error) {
	if !isFinite(base) || base <= 0 {
		return nil, fmt.Errorf("returns: total return index: base %v: %w", base, ErrNonPositive)
	}
	if len(prices) == 0 {
		return nil, fmt.Errorf("returns: total return index: %w", ErrEmpty)
	}
	if err := ValidatePrices(prices); err != nil {
		return nil, err
	}
	idx := make([]float64, len(prices))
	idx[0] = base
	for i := 1; i < len(prices); i++ {
		p := prices[i]
		idx[i] = idx[i-1] * p.Split() * (p.Close + p.Dividend) / prices[i-1].Close
	}
	return idx, nil
}
