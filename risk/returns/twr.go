package returns

import (
	"fmt"
	"math"
	"time"
)

// DefaultLargeFlow is a common large-flow threshold: a flow of 10% or more of
// the portfolio's value triggers a revaluation.
const DefaultLargeFlow = 0.10

// SubPeriod is one piece of a time-weighted return: from the close of Start
// to the close of End, valued at both ends.
type SubPeriod struct {
	Start, End           time.Time
	StartValue, EndValue float64
	NetFlow              float64 // external flows dated in (Start, End]
	Return               float64 // Modified Dietz return of the sub-period
	LargeFlow            bool    // End was chosen because of a large flow on it
}

// TWR is a time-weighted return with the sub-periods it links.
type TWR struct {
	Return     float64
	SubPeriods []SubPeriod
}

// TimeWeightedReturn returns the time-weighted return of v from the close of
// its first day to the close of its last, the GIPS way:
//
//	R = Π_k (1 + R_k) - 1
//
// where the sub-periods k end at every large flow, at the last valuation day
// of every calendar month, and at the last day, and R_k is the Modified Dietz
// return of sub-period k (ModifiedDietz, end-of-day flows, daily weights).
// A flow F_t is large when |F_t| >= largeFlow · (V_t - F_t), the portfolio's
// value just before the flow (any flow into a portfolio worth nothing is
// large). Since flows are end-of-day, a sub-period ending on a large flow
// gives that flow weight 0: the portfolio is revalued just before it, which
// makes the result a true time-weighted return at that flow.
//
// largeFlow is a fraction of value (DefaultLargeFlow is 0.10); 0 revalues at
// every flow, which gives exactly the unit-value and linked daily returns.
// The flow on the first day is ignored: it is in the starting value.
func TimeWeightedReturn(v ValueSeries, largeFlow float64) (TWR, error) {
	if !isFinite(largeFlow) || largeFlow < 0 {
		return TWR{}, fmt.Errorf("returns: time-weighted return: threshold %v: %w", largeFlow, ErrThreshold)
	}
	if err := v.check("time-weighted return"); err != nil {
		return TWR{}, err
	}
	var res TWR
	g := 1.0
	start := 0
	var flows []Flow
	last := len(v.Dates) - 1
	for t := 1; t <= last; t++ {
		f := v.Flows[t]
		if f != 0 {
			flows = append(flows, Flow{Date: v.Dates[t], Amount: f})
		}
		large := f != 0 && math.Abs(f) >= largeFlow*(v.Values[t]-f)
		monthEnd := t < last && v.Dates[t].Month() != v.Dates[t+1].Month()
		if !large && !monthEnd && t < last {
			continue
		}
		r, err := ModifiedDietz(v.Dates[start], v.Dates[t], v.Values[start], v.Values[t], flows)
		if err != nil {
			return TWR{}, fmt.Errorf("returns: time-weighted return: %w", err)
		}
		sp := SubPeriod{
			Start: v.Dates[start], End: v.Dates[t],
			StartValue: v.Values[start], EndValue: v.Values[t],
			Return: r, LargeFlow: large,
		}
		for _, fl := range flows {
			sp.NetFlow += fl.Amount
		}
		res.SubPeriods = append(res.SubPeriods, sp)
		g *= 1 + r
		start, flows = t, flows[:0]
	}
	res.Return = g - 1
	return res, nil
}
