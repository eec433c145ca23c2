package returns

import (
	"errors"
	"math"
	"testing"
	"time"
)

// valuationBook is a hand-made book over 2024-04-01 .. 2024-04-08:
//
//	snapshot 04-01: 10 A, 5 B, cash 100
//	A: 20, 21, 11 (2-for-1 split on 04-03), 11.5, 12, 12
//	B: 50, 50, (no price 04-03), 49 (ex 1.00 dividend 04-04), 50, 51
//	flows: -50 on 04-02; +500 on Saturday 04-06 (counts on Monday 04-08)
//	snapshot 04-05: 20 A, 8 B, cash -95 (bought 3 B at 50)
func valuationBook() (Book, []time.Time) {
	b := Book{
		Snapshots: []Snapshot{
			{Date: d("2024-04-05"), Quantities: map[string]float64{"A": 20, "B": 8}, Cash: -95},
			{Date: d("2024-04-01"), Quantities: map[string]float64{"A": 10, "B": 5}, Cash: 100},
		},
		Prices: map[string][]PricePoint{
			"A": {
				{Date: d("2024-04-01"), Close: 20}, {Date: d("2024-04-02"), Close: 21},
				{Date: d("2024-04-03"), Close: 11, SplitRatio: 2}, {Date: d("2024-04-04"), Close: 11.5},
				{Date: d("2024-04-05"), Close: 12}, {Date: d("2024-04-08"), Close: 12},
			},
			"B": {
				{Date: d("2024-04-01"), Close: 50}, {Date: d("2024-04-02"), Close: 50},
				{Date: d("2024-04-04"), Close: 49, Dividend: 1}, {Date: d("2024-04-05"), Close: 50},
				{Date: d("2024-04-08"), Close: 51},
			},
		},
		Flows: []Flow{{Date: d("2024-04-06"), Amount: 500}, {Date: d("2024-04-02"), Amount: -50}},
	}
	days := []time.Time{d("2024-04-01"), d("2024-04-02"), d("2024-04-03"), d("2024-04-04"), d("2024-04-05"), d("2024-04-08")}
	return b, days
}

// TestValuateWorkedExample checks the hand computation of valuationBook:
//
//	04-01: 10·20 + 5·50 + 100                  = 550
//	04-02: 10·21 + 5·50 + (100-50)             = 510   flow -50
//	04-03: 20·11 + 5·50 (stale) + 50           = 520   split: 10 → 20 A
//	04-04: 20·11.5 + 5·49 + (50 + 5·1.00)      = 530   dividend to cash
//	04-05: 20·12 + 8·50 - 95                   = 545   new snapshot
//	04-08: 20·12 + 8·51 + (-95 + 500)          = 1053  Saturday's flow
//
// All amounts are exact in binary or nearly so: 1e-12 relative.
func TestValuateWorkedExample(t *testing.T) {
	b, days := valuationBook()
	v, err := Valuate(b, days)
	if err != nil {
		t.Fatal(err)
	}
	wantV := []float64{550, 510, 520, 530, 545, 1053}
	wantF := []float64{0, -50, 0, 0, 0, 500}
	for i := range wantV {
		if !closeTo(v.Values[i], wantV[i], 1e-12, 0) || v.Flows[i] != wantF[i] {
			t.Errorf("%s: value %v flow %v, want %v %v", days[i].Format(time.DateOnly), v.Values[i], v.Flows[i], wantV[i], wantF[i])
		}
	}
	// Flow-neutral daily returns r_t = (V_t - F_t)/V_{t-1} - 1.
	r, err := DailyReturns(v)
	if err != nil {
		t.Fatal(err)
	}
	wantR := []float64{560.0/550 - 1, 520.0/510 - 1, 530.0/520 - 1, 545.0/530 - 1, 553.0/545 - 1}
	for i := range wantR {
		if math.Abs(r[i]-wantR[i]) > 1e-15 {
			t.Errorf("r[%d] = %v, want %v", i, r[i], wantR[i])
		}
	}
}

func TestValuateErrors(t *testing.T) {
	b, days := valuationBook()
	early := append([]time.Time{d("2024-03-29")}, days...)
	if _, err := Valuate(b, early); !errors.Is(err, ErrNoSnapshot) {
		t.Errorf("day before first snapshot: %v", err)
	}
	b2, _ := valuationBook()
	b2.Snapshots[1].Quantities["C"] = 4 // no prices for C
	if _, err := Valuate(b2, days); !errors.Is(err, ErrMissingPrice) {
		t.Errorf("no price: %v", err)
	}
	b3, _ := valuationBook()
	b3.Snapshots[0].Quantities["A"] = -1
	if _, err := Valuate(b3, days); !errors.Is(err, ErrQuantity) {
		t.Errorf("negative quantity: %v", err)
	}
	if _, err := Valuate(b, []time.Time{days[2], days[1]}); !errors.Is(err, ErrOrder) {
		t.Errorf("unsorted days: %v", err)
	}
	b4, _ := valuationBook()
	b4.Prices["B"][1].Close = -3
	if _, err := Valuate(b4, days); !errors.Is(err, ErrPrice) {
		t.Errorf("negative price: %v", err)
	}
	if _, err := DailyReturns(ValueSeries{Dates: days[:2], Values: []float64{0, 1}, Flows: []float64{0, 0}}); !errors.Is(err, ErrValue) {
		t.Errorf("zero value: %v", err)
	}
}
