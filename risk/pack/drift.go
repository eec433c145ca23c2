package pack

import (
	"math"
	"sort"
)

// DriftParams set when a change is flagged.
type DriftParams struct {
	// ZThreshold flags a metric when |z| >= ZThreshold.
	ZThreshold float64
	// MinHistory is the number of earlier changes needed before a z-score
	// is given.
	MinHistory int
}

// Drift compares each headline metric of the current run with the
// portfolio's earlier runs (history, oldest first).
//
// For a metric with values x_1..x_n in earlier runs and x in this run, the
// change is d = x - x_n and its z-score is
//
//	z = d / s,  s = sqrt( sum_i (d_i - mean(d))^2 / (m-1) )
//
// over the m = n-1 earlier changes d_i = x_{i+1} - x_i (the sample standard
// deviation; a mean change is not subtracted from d, so a steady trend
// still shows). z is absent while m < MinHistory or s = 0. Runs missing a
// metric are skipped for that metric.
func Drift(current map[string]float64, history []HistoryPoint, p DriftParams) []DriftItem {
	names := make([]string, 0, len(current))
	for k := range current {
		names = append(names, k)
	}
	sort.Strings(names)
	out := make([]DriftItem, 0, len(names))
	for _, name := range names {
		x := current[name]
		item := DriftItem{Metric: name, Value: x}
		var past []float64
		for _, h := range history {
			if v, ok := h.Metrics[name]; ok {
				past = append(past, v)
			}
		}
		if n := len(past); n > 0 {
			prev := past[n-1]
			d := x - prev
			item.Previous = ptr(prev)
			item.Change = ptr(d)
			changes := make([]float64, 0, n)
			for i := 1; i < n; i++ {
				changes = append(changes, past[i]-past[i-1])
			}
			item.History = len(changes)
			if len(changes) >= p.MinHistory && len(changes) >= 2 {
				if s := sampleStd(changes); s > 0 {
					z := d / s
					item.Z = ptr(z)
					item.Flagged = math.Abs(z) >= p.ZThreshold
				}
			}
		}
		out = append(out, item)
	}
	return out
}

func sampleStd(x []float64) float64 {
	var mean float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var ss float64
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	return math.Sqrt(ss / float64(len(x)-1))
}

func ptr(v float64) *float64 { return &v }
