package stress

import (
	"fmt"
	"math"
)

// ReplayResult is a window of history replayed on the current holdings.
type ReplayResult struct {
	// Start and End are the first and last day of the window, inclusive
	// indexes into the history; the caller maps them to dates.
	Start, End int
	// PnL is Σ V_i·R_i, base currency, with R_i the holding's compound
	// total return over the window; PnLPct = PnL/total value.
	PnL    float64
	PnLPct float64
	// PerHolding lists every position in input order (Taylor fields zero).
	PerHolding []HoldingPnL
	// Top is the five largest |PnL|, as in Result.Top.
	Top []HoldingPnL
	// Missing lists holdings with days of no return inside the window.
	Missing []Missing
}

// Missing is a holding with Days days of no return in a replay window.
// Those days count as a zero return: the holding is held flat.
type Missing struct {
	ID   string
	Days int
}

// Replay applies the daily total returns of days start..end (inclusive) to
// the current holdings, weights fixed at today's values:
//
//	PnL = Σ_i V_i·(Π_{t=start}^{end} (1 + r_{i,t}) − 1)
//
// returns[i] is the daily history of positions[i]; every non-nil row has
// the same length, day t of one row is day t of every other. A NaN return
// is a missing day and counts as zero, as does every day of a nil row; a
// nil row is how cash is given (it is not reported missing when the
// position's Revalue is nil). A return at or below -1 or infinite is
// refused (ErrHistory), as is a window outside the history (ErrWindow).
func Replay(positions []Position, returns [][]float64, start, end int) (ReplayResult, error) {
	total, n, err := checkHistory(positions, returns)
	if err != nil {
		return ReplayResult{}, err
	}
	if start < 0 || end < start || end >= n {
		return ReplayResult{}, fmt.Errorf("%w: days %d..%d in a history of %d days", ErrWindow, start, end, n)
	}
	return replay(positions, returns, start, end, total), nil
}

// WorstWindow finds the window of `days` consecutive days whose replay on
// the current holdings loses most (the lowest Σ_i V_i·R_i; the earliest on
// a tie) and returns its replay. It takes O(n·m) time for n days and m
// holdings: with prefix sums of log returns
//
//	L_i[t] = Σ_{u<t} log(1 + r_{i,u}),   R_i(s) = exp(L_i[s+days] − L_i[s]) − 1
//
// every window costs one subtraction per holding instead of a product over
// its days. Missing days count as zero, as in Replay.
func WorstWindow(positions []Position, returns [][]float64, days int) (ReplayResult, error) {
	total, n, err := checkHistory(positions, returns)
	if err != nil {
		return ReplayResult{}, err
	}
	if days < 1 || days > n {
		return ReplayResult{}, fmt.Errorf("%w: %d-day window in a history of %d days", ErrWindow, days, n)
	}
	windows := n - days + 1
	pnl := make([]float64, windows)
	pre := make([]float64, n+1)
	for i, row := range returns {
		v := positions[i].Value
		if row == nil || v == 0 {
			continue
		}
		for t, r := range row {
			if math.IsNaN(r) {
				r = 0
			}
			pre[t+1] = pre[t] + math.Log1p(r)
		}
		for s := range pnl {
			pnl[s] += v * math.Expm1(pre[s+days]-pre[s])
		}
	}
	worst := 0
	for s := 1; s < windows; s++ {
		if pnl[s] < pnl[worst] {
			worst = s
		}
	}
	return replay(positions, returns, worst, worst+days-1, total), nil
}

// checkHistory validates positions and returns and gives the total value
// and the number of days.
func checkHistory(positions []Position, returns [][]float64) (total float64, n int, err error) {
	total, err = checkPositions(positions)
	if err != nil {
		return 0, 0, err
	}
	if len(returns) != len(positions) {
		return 0, 0, fmt.Errorf("%w: %d return rows for %d positions", ErrHistory, len(returns), len(positions))
	}
	n = -1
	for i, row := range returns {
		if row == nil {
			continue
		}
		if n < 0 {
			n = len(row)
		} else if len(row) != n {
			return 0, 0, fmt.Errorf("%w: row %s has %d days, earlier rows %d", ErrHistory, positions[i].ID, len(row), n)
		}
		for t, r := range row {
			if math.IsInf(r, 0) || r <= -1 {
				return 0, 0, fmt.Errorf("%w: %s day %d: return %v", ErrHistory, positions[i].ID, t, r)
			}
		}
	}
	if n <= 0 {
		return 0, 0, fmt.Errorf("%w: no days", ErrHistory)
	}
	return total, n, nil
}

func replay(positions []Position, returns [][]float64, start, end int, total float64) ReplayResult {
	res := ReplayResult{Start: start, End: end, PerHolding: make([]HoldingPnL, len(positions))}
	for i, p := range positions {
		h := HoldingPnL{ID: p.ID, Name: p.Name, Sector: p.Sector, Value: p.Value}
		row := returns[i]
		missing := 0
		if row == nil {
			if p.Revalue != nil {
				missing = end - start + 1
			}
		} else {
			g := 1.0
			for _, r := range row[start : end+1] {
				if math.IsNaN(r) {
					missing++
					continue
				}
				g *= 1 + r
			}
			h.Pct = g - 1
			h.PnL = p.Value * h.Pct
		}
		if missing > 0 {
			res.Missing = append(res.Missing, Missing{ID: p.ID, Days: missing})
		}
		res.PnL += h.PnL
		res.PerHolding[i] = h
	}
	res.PnLPct = res.PnL / total
	res.Top = top(res.PerHolding, TopN)
	return res
}
