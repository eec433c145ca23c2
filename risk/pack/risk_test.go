package pack

import (
	"math"
	"testing"

	"plumbline/risk/stats"
)

// The backtest is out of sample (Basel Committee 1996, "Supervisory
// framework for the use of backtesting"): the 99% one-day VaR of each of
// the last BacktestDays days comes from the VaRLookbackDays returns
// before that day, and an exception is a loss above it, −r_t > VaR_t.
// The forecasts are rebuilt here one day at a time with
// stats.HistoricalVaR (checked against published order statistics in
// risk/stats); Kupiec's (1995) likelihood ratio for x exceptions in n
// days is written out from its formula,
//
//	LR = −2 ln[(1−p)^(n−x) p^x] + 2 ln[(1−x/n)^(n−x) (x/n)^x].
//
// Counts are exact; the ratio agrees to 1e-12 relative (the same
// logarithms summed in another order). The single-holding book is used
// because it has exceptions.
func TestBacktestIsOutOfSample(t *testing.T) {
	p := fxParams()
	doc := mustCompute(t, fxSingle(), p)
	port := doc.Series.Discrete // the whole history: HistoryDays exceeds it
	if len(port) >= p.HistoryDays {
		t.Fatalf("%d returns: the series is cut, not the whole history", len(port))
	}
	b := doc.Backtest
	if b == nil {
		t.Fatal("no backtest")
	}
	n, L := len(port), p.VaRLookbackDays
	x := 0
	for t0 := n - p.BacktestDays; t0 < n; t0++ {
		e, err := stats.HistoricalVaR(port[t0-L:t0], 0.99)
		if err != nil {
			t.Fatal(err)
		}
		if -port[t0] > e.VaR {
			x++
		}
	}
	if x == 0 {
		t.Fatal("the fixture has no exception: the check would not bite")
	}
	if b.Days != p.BacktestDays || b.Exceptions != x || b.Confidence != 0.99 {
		t.Errorf("backtest %d days, %d exceptions at %v; want %d, %d at 0.99", b.Days, b.Exceptions, b.Confidence, p.BacktestDays, x)
	}
	pr, fn, fx := 0.01, float64(b.Days), float64(x)
	lr := -2*((fn-fx)*math.Log(1-pr)+fx*math.Log(pr)) + 2*((fn-fx)*math.Log(1-fx/fn)+fx*math.Log(fx/fn))
	if !relClose(b.KupiecLR, lr, 1e-12) {
		t.Errorf("Kupiec LR %v, want %v", b.KupiecLR, lr)
	}
}

// FindVaR returns the Document's own figure of a method, confidence and
// horizon, and nil for one the Document does not have (97.5% is computed
// for the historical method only: risk.go's varSpecs).
func TestFindVaR(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	for _, tc := range []struct {
		method string
		conf   float64
		h      int
		found  bool
	}{
		{"historical", 0.99, 1, true},
		{"historical", 0.975, 1, true},
		{"normal", 0.95, 5, true},
		{"cornish_fisher", 0.99, 5, true},
		{"normal", 0.975, 1, false},
		{"historical", 0.99, 10, false},
		{"monte_carlo", 0.99, 1, false},
	} {
		v := FindVaR(doc, tc.method, tc.conf, tc.h)
		if (v != nil) != tc.found {
			t.Errorf("FindVaR(%s, %v, %d) = %+v, want found %v", tc.method, tc.conf, tc.h, v, tc.found)
			continue
		}
		if v == nil {
			continue
		}
		if v.Method != tc.method || v.Confidence != tc.conf || v.HorizonDays != tc.h {
			t.Errorf("FindVaR(%s, %v, %d) = %+v", tc.method, tc.conf, tc.h, v)
		}
		own := false
		for i := range doc.VaR {
			own = own || v == &doc.VaR[i]
		}
		if !own {
			t.Errorf("FindVaR(%s, %v, %d) is a copy, not the document's figure", tc.method, tc.conf, tc.h)
		}
	}
}
