package returns

import (
	"errors"
	"math"
	"testing"
	"time"
)

func refConstituents(t *testing.T) ([]Constituent, []time.Time) {
	prices, days := refPrices(t)
	var cons []Constituent
	for _, r := range readCSV(t, "securities.csv") {
		cons = append(cons, Constituent{ID: r[0], Prices: prices[r[0]], SharesOutstanding: num(t, r[1])})
	}
	return cons, days
}

// TestIndexAgainstReference: levels evaluated with numpy/pandas by the level
// formulas — Σ N_t P_t / Σ N_{t-1} P_{t-1} with share counts rebuilt from the
// current ones and later splits, a divisor recursion adjusted at splits,
// pandas means and scipy gmean of growth factors — on prices.csv, for price
// and total-return indices. Tolerance 1e-11 relative (12-digit JSON, 80
// compounding steps).
func TestIndexAgainstReference(t *testing.T) {
	ref := loadReference(t)
	cons, days := refConstituents(t)
	for _, total := range []bool{false, true} {
		want := ref.IndexPrice
		if total {
			want = ref.IndexTotal
		}
		for _, m := range []IndexMethod{ValueWeighted, PriceWeighted, EqualWeighted, EqualGeometric} {
			ix, err := BuildIndex(m, cons, days, IndexOptions{TotalReturn: total})
			if err != nil {
				t.Fatal(err)
			}
			w := want[m.String()]
			if len(w) != len(ix.Levels) {
				t.Fatalf("%v total=%v: %d levels, reference %d", m, total, len(ix.Levels), len(w))
			}
			for i := range w {
				if !closeTo(ix.Levels[i], w[i], 1e-11, 0) {
					t.Errorf("%v total=%v: level[%d] = %v, reference %v", m, total, i, ix.Levels[i], w[i])
					break
				}
			}
		}
	}
}

// TestPriceWeightedDivisor (common practice for price-weighted averages):
// two stocks at 50 and 150 sum to 200; base 100 gives divisor 2. When the
// second splits 3-for-1 and opens at 50, the sum drops to 100 and the
// divisor is cut to 1 so that the level stays 100. Without a split the
// divisor of a price index does not move.
func TestPriceWeightedDivisor(t *testing.T) {
	cons := []Constituent{
		{ID: "P", Prices: []PricePoint{{Date: d("2024-06-03"), Close: 50}, {Date: d("2024-06-04"), Close: 50}, {Date: d("2024-06-05"), Close: 55}}},
		{ID: "Q", Prices: []PricePoint{{Date: d("2024-06-03"), Close: 150}, {Date: d("2024-06-04"), Close: 50, SplitRatio: 3}, {Date: d("2024-06-05"), Close: 52}}},
	}
	days := []time.Time{d("2024-06-03"), d("2024-06-04"), d("2024-06-05")}
	ix, err := BuildIndex(PriceWeighted, cons, days, IndexOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// Day 3: (55 + 52) / 1 = 107.
	want := []float64{100, 100, 107}
	wantD := []float64{2, 1, 1}
	for i := range want {
		if !closeTo(ix.Levels[i], want[i], 1e-14, 0) || !closeTo(ix.Divisor[i], wantD[i], 1e-14, 0) {
			t.Errorf("day %d: level %v divisor %v, want %v %v", i, ix.Levels[i], ix.Divisor[i], want[i], wantD[i])
		}
	}
	// Value weighted: 10 and 1 shares now (Q has 1 share after its split,
	// so 1/3 before). Caps 500 + 50 = 550, then 500 + 50, then 550 + 52:
	// levels 100, 100, 100·602/550.
	cons[0].SharesOutstanding, cons[1].SharesOutstanding = 10, 1
	vw, err := BuildIndex(ValueWeighted, cons, days, IndexOptions{Base: 1000})
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(vw.Levels[1], 1000, 1e-14, 0) || !closeTo(vw.Levels[2], 1000*602.0/550, 1e-14, 0) {
		t.Errorf("value weighted %v", vw.Levels)
	}
	// Equal weighted arithmetic vs geometric on day 3: returns +10% and +4%.
	ew, _ := BuildIndex(EqualWeighted, cons, days, IndexOptions{})
	eg, _ := BuildIndex(EqualGeometric, cons, days, IndexOptions{})
	if !closeTo(ew.Returns[2], 0.07, 1e-14, 0) || !closeTo(eg.Returns[2], math.Sqrt(1.1*1.04)-1, 1e-14, 0) {
		t.Errorf("equal %v geometric %v", ew.Returns[2], eg.Returns[2])
	}
}

func TestParseIndexMethod(t *testing.T) {
	for _, m := range []IndexMethod{ValueWeighted, PriceWeighted, EqualWeighted, EqualGeometric} {
		got, err := ParseIndexMethod(m.String())
		if err != nil || got != m {
			t.Errorf("%v: %v %v", m, got, err)
		}
	}
	if _, err := ParseIndexMethod("cap"); !errors.Is(err, ErrMethod) {
		t.Errorf("unknown: %v", err)
	}
}

func TestIndexErrors(t *testing.T) {
	cons, days := refConstituents(t)
	late := []Constituent{{ID: "Z", Prices: []PricePoint{{Date: days[5], Close: 3}}}}
	if _, err := BuildIndex(EqualWeighted, late, days, IndexOptions{}); !errors.Is(err, ErrMissingPrice) {
		t.Errorf("no price on the first day: %v", err)
	}
	noShares := append([]Constituent(nil), cons...)
	noShares[0].SharesOutstanding = 0
	if _, err := BuildIndex(ValueWeighted, noShares, days, IndexOptions{}); !errors.Is(err, ErrNonPositive) {
		t.Errorf("no shares: %v", err)
	}
	if _, err := BuildIndex(IndexMethod(7), cons, days, IndexOptions{}); !errors.Is(err, ErrMethod) {
		t.Errorf("method: %v", err)
	}
	if _, err := BuildIndex(EqualWeighted, nil, days, IndexOptions{}); !errors.Is(err, ErrEmpty) {
		t.Errorf("no constituents: %v", err)
	}
}
