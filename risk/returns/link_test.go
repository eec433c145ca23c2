package returns

import (
	"errors"
	"math"
	"testing"
	"time"
)

// TestLink: +10% then -10% is -1% (common practice: 1.1·0.9 = 0.99).
// Absolute 1e-15: subtracting 1 from the growth factor.
func TestLink(t *testing.T) {
	r, err := Link([]float64{0.1, -0.1})
	if err != nil || math.Abs(r+0.01) > 1e-15 {
		t.Errorf("link = %v, %v", r, err)
	}
	if r, _ := Link(nil); r != 0 {
		t.Errorf("empty link %v", r)
	}
	if _, err := Link([]float64{0.1, -1.5}); !errors.Is(err, ErrReturn) {
		t.Errorf("below -100%%: %v", err)
	}
}

// TestUnitValueWorkedExample (hand computation): 100 units at 1.00; day 1
// the value grows to 110 (unit price 1.10); day 2 the value before the flow
// is 121 (1.21) and 110 comes in, buying 110/1.21 = 90.909 units; day 3 the
// value is 210 for 190.909 units, a unit price of 1.10. Return +10%,
// whereas the value went from 100 to 210 with 110 added.
func TestUnitValueWorkedExample(t *testing.T) {
	v := ValueSeries{
		Dates:  []time.Time{d("2024-05-01"), d("2024-05-02"), d("2024-05-03"), d("2024-05-06")},
		Values: []float64{100, 110, 231, 210},
		Flows:  []float64{0, 0, 110, 0},
	}
	r, err := UnitValueReturn(v)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r-0.1) > 1e-15 {
		t.Errorf("unit value return %v, want 0.10", r)
	}
}
