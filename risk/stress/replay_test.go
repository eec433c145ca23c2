package stress

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

// bruteWorst is the reference search: every window, every holding, the
// product of (1 + r) over the window's days, missing days skipped. O(n·m·k).
func bruteWorst(ps []Position, returns [][]float64, days int) (start int, pnl float64) {
	n := 0
	for _, row := range returns {
		if row != nil {
			n = len(row)
		}
	}
	pnl = math.Inf(1)
	for s := 0; s+days <= n; s++ {
		var sum float64
		for i, row := range returns {
			if row == nil {
				continue
			}
			g := 1.0
			for _, r := range row[s : s+days] {
				if !math.IsNaN(r) {
					g *= 1 + r
				}
			}
			sum += ps[i].Value * (g - 1)
		}
		if sum < pnl {
			start, pnl = s, sum
		}
	}
	return start, pnl
}

// randomBook builds m holdings (one nil row, one cash line, one of zero
// value) with n days of returns, about 2% of them missing.
func randomBook(rng *rand.Rand, n, m int) ([]Position, [][]float64) {
	one := func(Shock) (float64, error) { return 1, nil }
	ps := make([]Position, m)
	rets := make([][]float64, m)
	for i := range ps {
		ps[i] = Position{ID: string(rune('A'+i%26)) + string(rune('a'+i/26)), Value: 1000 * rng.Float64(), Revalue: one}
		row := make([]float64, n)
		for t := range row {
			row[t] = 0.02 * rng.NormFloat64()
			if rng.Float64() < 0.02 {
				row[t] = math.NaN()
			}
		}
		rets[i] = row
	}
	rets[0] = nil                     // a holding with no history
	ps[1].Revalue, rets[1] = nil, nil // cash
	ps[2].Value = 0
	return ps, rets
}

// TestWorstWindowMatchesBruteForce: the prefix-sum search and the direct
// search pick the same window with the same P&L. The two differ only by
// rounding in log1p/expm1 against a product of ≤ n factors; 1e-12 of the
// portfolio value bounds that for n ≤ 300 and daily moves near 2%.
func TestWorstWindowMatchesBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, c := range []struct{ n, m int }{{1, 4}, {30, 5}, {120, 12}, {300, 40}} {
		ps, rets := randomBook(rng, c.n, c.m)
		var total float64
		for _, p := range ps {
			total += p.Value
		}
		for _, days := range []int{1, 2, 5, 10, c.n} {
			if days > c.n {
				continue
			}
			got, err := WorstWindow(ps, rets, days)
			if err != nil {
				t.Fatal(err)
			}
			start, pnl := bruteWorst(ps, rets, days)
			if got.Start != start || got.End != start+days-1 {
				t.Errorf("n=%d m=%d days=%d: window %d..%d, brute force %d..%d", c.n, c.m, days, got.Start, got.End, start, start+days-1)
			}
			if math.Abs(got.PnL-pnl) > 1e-12*total {
				t.Errorf("n=%d m=%d days=%d: PnL %.15g, brute force %.15g", c.n, c.m, days, got.PnL, pnl)
			}
		}
	}
}

// TestReplayHandWorked: a three-line book worked by hand.
//
//	A 600: +10%, -10%, +5%, missing    B 300: -5%, +2%, 0%, +1%   cash 100
//
// Days 1..3: A 0.90·1.05 − 1 = −5.5% (one day missing) → −33;
// B 1.02·1.00·1.01 − 1 = +3.02% → +9.06; total −23.94 of 1000.
// Two-day windows: days 0-1 −6 − 9.3 = −15.3, days 1-2 −33 + 6 = −27,
// days 2-3 +30 + 3 = +33, so the worst is days 1-2.
// Tolerance 1e-12 relative: a few products of decimals.
func TestReplayHandWorked(t *testing.T) {
	one := func(Shock) (float64, error) { return 1, nil }
	ps := []Position{
		{ID: "A", Value: 600, Revalue: one},
		{ID: "B", Value: 300, Revalue: one},
		{ID: "CASH", Value: 100},
	}
	rets := [][]float64{{0.10, -0.10, 0.05, math.NaN()}, {-0.05, 0.02, 0, 0.01}, nil}
	r, err := Replay(ps, rets, 1, 3)
	if err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		name      string
		got, want float64
	}{
		{"A pct", r.PerHolding[0].Pct, -0.055}, {"A PnL", r.PerHolding[0].PnL, -33},
		{"B pct", r.PerHolding[1].Pct, 0.0302}, {"B PnL", r.PerHolding[1].PnL, 9.06},
		{"PnL", r.PnL, -23.94}, {"PnLPct", r.PnLPct, -0.02394},
	}
	for _, c := range checks {
		if !relClose(c.got, c.want, 1e-12) {
			t.Errorf("%s = %.15g, want %v", c.name, c.got, c.want)
		}
	}
	if len(r.Missing) != 1 || r.Missing[0] != (Missing{ID: "A", Days: 1}) {
		t.Errorf("Missing = %+v, want A 1 day", r.Missing)
	}
	w, err := WorstWindow(ps, rets, 2)
	if err != nil {
		t.Fatal(err)
	}
	if w.Start != 1 || w.End != 2 || !relClose(w.PnL, -27, 1e-12) {
		t.Errorf("worst 2-day window %d..%d PnL %v, want 1..2 PnL -27", w.Start, w.End, w.PnL)
	}
	if len(w.Missing) != 0 {
		t.Errorf("worst window Missing = %+v, want none", w.Missing)
	}
}

// TestReplayNoHistoryIsMissing: a priced holding without a return row is
// held flat and listed, cash without one is not (documented convention).
func TestReplayNoHistoryIsMissing(t *testing.T) {
	one := func(Shock) (float64, error) { return 1, nil }
	ps := []Position{{ID: "A", Value: 10, Revalue: one}, {ID: "B", Value: 10, Revalue: one}, {ID: "CASH", Value: 5}}
	r, err := Replay(ps, [][]float64{{0.01, 0.02, 0.03}, nil, nil}, 0, 2)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Missing) != 1 || r.Missing[0] != (Missing{ID: "B", Days: 3}) {
		t.Errorf("Missing = %+v, want B 3 days", r.Missing)
	}
}

// TestReplayRefusesNonsense: typed errors for histories and windows that
// make no sense.
func TestReplayRefusesNonsense(t *testing.T) {
	one := func(Shock) (float64, error) { return 1, nil }
	ps := []Position{{ID: "A", Value: 10, Revalue: one}, {ID: "B", Value: 10, Revalue: one}}
	ok := [][]float64{{0.01, 0.02, 0.03}, {0, 0, 0}}
	cases := []struct {
		name       string
		rets       [][]float64
		start, end int // Replay window
		days       int // WorstWindow length
		want       error
	}{
		{"row count", [][]float64{{0.01}}, 0, 0, 1, ErrHistory},
		{"ragged", [][]float64{{0.01, 0.02}, {0}}, 0, 0, 1, ErrHistory},
		{"total loss", [][]float64{{-1, 0}, {0, 0}}, 0, 0, 1, ErrHistory},
		{"infinite", [][]float64{{math.Inf(1), 0}, {0, 0}}, 0, 0, 1, ErrHistory},
		{"no rows", [][]float64{nil, nil}, 0, 0, 1, ErrHistory},
		{"window past end", ok, 1, 3, 4, ErrWindow},
		{"reversed / empty", ok, 2, 1, 0, ErrWindow},
		{"negative start", ok, -1, 1, -1, ErrWindow},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if _, err := Replay(ps, c.rets, c.start, c.end); !errors.Is(err, c.want) {
				t.Errorf("Replay err = %v, want %v", err, c.want)
			}
			if _, err := WorstWindow(ps, c.rets, c.days); !errors.Is(err, c.want) {
				t.Errorf("WorstWindow err = %v, want %v", err, c.want)
			}
		})
	}
}
