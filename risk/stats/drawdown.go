package stats

import (
	"fmt"
	"math"
)

// Drawdown describes the drawdowns of a value (or index level) series V:
//
//	D_t = V_t / max_{s<=t} V_s - 1   (<= 0)
//
// Lengths are counted in periods (observations), not calendar days.
type Drawdown struct {
	Series []float64 // D_t for every observation

	Max      float64 // min_t D_t, the maximum drawdown as a non-positive decimal
	Peak     int     // index of the running maximum before the maximum drawdown
	Trough   int     // index of the maximum drawdown (first one if tied)
	Recovery int     // first index after Trough with V >= V[Peak]; -1 if not recovered

	Current       float64 // D at the last observation
	CurrentLength int     // periods since the last running maximum (0 at a new high)
	LongestLength int     // longest spell, in periods, from a peak to its recovery (or to the end)
}

// Length returns the number of periods from the peak to the trough of the
// maximum drawdown.
func (d Drawdown) Length() int { return d.Trough - d.Peak }

// RecoveryLength returns the number of periods from the trough of the maximum
// drawdown back to the previous peak's level, or -1 if it has not recovered.
func (d Drawdown) RecoveryLength() int {
	if d.Recovery < 0 {
		return -1
	}
	return d.Recovery - d.Trough
}

// Drawdowns computes the Drawdown of a series of strictly positive values.
// A new running maximum needs V_t >= the previous maximum (ties count as a
// recovery).
func Drawdowns(values []float64) (Drawdown, error) {
	if len(values) == 0 {
		return Drawdown{}, fmt.Errorf("stats: drawdowns: %w", ErrEmpty)
	}
	if err := checkFinite("drawdowns", values); err != nil {
		return Drawdown{}, err
	}
	for i, v := range values {
		if v <= 0 {
			return Drawdown{}, fmt.Errorf("stats: drawdowns: value %d is %v: %w", i, v, ErrNonPositive)
		}
	}
	d := Drawdown{Series: make([]float64, len(values)), Recovery: -1}
	peak, peakIdx := values[0], 0
	for t, v := range values {
		if v >= peak {
			// A spell below the peak ends here if the previous value was below.
			if t-peakIdx > 1 && t-peakIdx > d.LongestLength {
				d.LongestLength = t - peakIdx
			}
			peak, peakIdx = v, t
			d.Series[t] = 0
			continue
		}
		dd := v/peak - 1
		d.Series[t] = dd
		if dd < d.Max {
			d.Max, d.Peak, d.Trough = dd, peakIdx, t
		}
	}
	last := len(values) - 1
	if last-peakIdx > d.LongestLength {
		d.LongestLength = last - peakIdx
	}
	d.Current = d.Series[last]
	d.CurrentLength = last - peakIdx
	if d.Max < 0 {
		for t := d.Trough + 1; t <= last; t++ {
			if values[t] >= values[d.Peak] {
				d.Recovery = t
				break
			}
		}
	}
	return d, nil
}

// DrawdownsFromReturns builds the value series V_0 = 1, V_t = V_{t-1}(1+r_t)
// (len(r)+1 values, the first being the starting value) and returns its
// Drawdowns. Returns must be greater than -1.
func DrawdownsFromReturns(r []float64) (Drawdown, error) {
	if len(r) == 0 {
		return Drawdown{}, fmt.Errorf("stats: drawdowns from returns: %w", ErrEmpty)
	}
	v := make([]float64, len(r)+1)
	v[0] = 1
	for i, x := range r {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return Drawdown{}, fmt.Errorf("stats: drawdowns from returns: return %d is %v: %w", i, x, ErrNonFinite)
		}
		if x <= -1 {
			return Drawdown{}, fmt.Errorf("stats: drawdowns from returns: return %d is %v: %w", i, x, ErrNonPositive)
		}
		v[i+1] = v[i] * (1 + x)
	}
	return Drawdowns(v)
}
