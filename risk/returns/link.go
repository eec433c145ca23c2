package returns

import (
	"fmt"
	"time"
)

// Link compounds consecutive period returns geometrically:
//
//	R = Π (1 + r_i) - 1
//
// Each r_i must be at least -1 (a total loss); the empty product gives 0.
func Link(r []float64) (float64, error) {
	g := 1.0
	for i, v := range r {
		if !isFinite(v) {
			return 0, fmt.Errorf("returns: link: return %d is %v: %w", i, v, ErrNonFinite)
		}
		if v < -1 {
			return 0, fmt.Errorf("returns: link: return %d is %v: %w", i, v, ErrReturn)
		}
		g *= 1 + v
	}
	return g - 1, nil
}

// UnitValueReturn returns the time-weighted return of a value series by the
// unit-value (unitised fund) method: the portfolio starts with V_0 units
// priced at 1; each day the unit price is the value before that day's flow
// divided by the units in issue,
//
//	U_t = (V_t - F_t) / N_{t-1},   N_t = N_{t-1} + F_t / U_t
//
// and flows buy or redeem units at that price. The return is U_T / U_0 - 1.
// It equals the linked daily returns (DailyReturns, Link) and the GIPS
// time-weighted return with revaluation at every flow.
func UnitValueReturn(v ValueSeries) (float64, error) {
	if err := v.check("unit value"); err != nil {
		return 0, err
	}
	if v.Values[0] <= 0 {
		return 0, fmt.Errorf("returns: unit value: starting value %v: %w", v.Values[0], ErrValue)
	}
	units, price := v.Values[0], 1.0
	for t := 1; t < len(v.Values); t++ {
		price = (v.Values[t] - v.Flows[t]) / units
		if price <= 0 {
			return 0, fmt.Errorf("returns: unit value: unit price %v on %s: %w", price, v.Dates[t].Format(time.DateOnly), ErrValue)
		}
		units += v.Flows[t] / price
	}
	return price - 1, nil
}
