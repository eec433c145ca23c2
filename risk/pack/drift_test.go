package pack

import (
	"math"
	"testing"
)

func hist(vals ...float64) []HistoryPoint {
	h := make([]HistoryPoint, len(vals))
	for i, v := range vals {
		h[i] = HistoryPoint{AsOf: "", Metrics: map[string]float64{"m": v}}
	}
	return h
}

// The z-score is the change over the sample standard deviation of earlier
// changes (sample standard deviation with n-1, common practice).
func TestDrift(t *testing.T) {
	// Earlier values 1,2,4,5,7: changes 1,2,1,2 -> mean 1.5, sample var
	// (4 x 0.25)/3 = 1/3, s = 0.57735. Current 10: change 3, z = 5.19615.
	items := Drift(map[string]float64{"m": 10}, hist(1, 2, 4, 5, 7), DriftParams{ZThreshold: 2.5, MinHistory: 4})
	if len(items) != 1 {
		t.Fatal(items)
	}
	it := items[0]
	if *it.Previous != 7 || *it.Change != 3 || it.History != 4 {
		t.Fatalf("got %+v", it)
	}
	if math.Abs(*it.Z-3/math.Sqrt(1.0/3)) > 1e-12 || !it.Flagged {
		t.Fatalf("z = %v flagged %v", *it.Z, it.Flagged)
	}
	// Too little history: no z, not flagged.
	it = Drift(map[string]float64{"m": 10}, hist(1, 2, 4), DriftParams{ZThreshold: 2.5, MinHistory: 4})[0]
	if it.Z != nil || it.Flagged || it.Change == nil {
		t.Fatalf("got %+v", it)
	}
	// No history at all: value only.
	it = Drift(map[string]float64{"m": 10}, nil, DriftParams{ZThreshold: 2.5, MinHistory: 4})[0]
	if it.Previous != nil || it.Change != nil {
		t.Fatalf("got %+v", it)
	}
	// Below the threshold is not flagged; a fall is flagged like a rise.
	it = Drift(map[string]float64{"m": 7 + 2.4*math.Sqrt(1.0/3)}, hist(1, 2, 4, 5, 7), DriftParams{ZThreshold: 2.5, MinHistory: 4})[0]
	if it.Flagged {
		t.Fatalf("z %v flagged", *it.Z)
	}
	it = Drift(map[string]float64{"m": 4}, hist(1, 2, 4, 5, 7), DriftParams{ZThreshold: 2.5, MinHistory: 4})[0]
	if !it.Flagged || *it.Z > -2.5 {
		t.Fatalf("fall of 3: z %v flagged %v", *it.Z, it.Flagged)
	}
}
