package jobs

import (
	"errors"
	"math"
	"testing"
	"time"

	"plumbline/risk/returns"
)

// A five-day history worked by hand: a 10% rise, a 10% fall, a 2-for-1
// split on day four and a dividend of 1 on day five. Daily total returns
// by the contract's rule r_t = s_t·(P_t + D_t)/P_{t−1} − 1:
//
//	110/100 − 1 = 0.10, 99/110 − 1 = −0.10, 2·50/99 − 1 = 1/99, (49+1)/50 − 1 = 0
//
// and the total-return index 1, 1.1, 0.99, 1, 1.
func TestComputeSecurityStatsWorkedExample(t *testing.T) {
	day := func(d int) time.Time { return time.Date(2026, 3, d, 0, 0, 0, 0, time.UTC) }
	pts := []returns.PricePoint{
		{Date: day(2), Close: 100},
		{Date: day(3), Close: 110},
		{Date: day(4), Close: 99},
		{Date: day(5), Close: 50, SplitRatio: 2},
		{Date: day(6), Close: 49, Dividend: 1},
	}
	st, err := ComputeSecurityStats(pts, []int{2, 21}, 0.94)
	if err != nil {
		t.Fatal(err)
	}
	r := []float64{0.10, -0.10, 1.0 / 99, 0}
	// Closed forms evaluated in a few floating-point operations: 1e-12
	// absolute covers their rounding.
	const tol = 1e-12
	near := func(name string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > tol {
			t.Errorf("%s = %.15g, want %.15g", name, got, want)
		}
	}
	// 1.1 · 0.9 · 100/99 = 1: the history ends where it began.
	near("total return", st.TotalReturn, 0)
	near("total log return", st.TotalLogReturn, 0)
	near("last return", st.LastReturn, 0)
	// Arithmetic mean (0.1 − 0.1 + 1/99 + 0)/4 = 1/396; the geometric mean
	// of returns linking to 0 is 0 (the geometric mean return is the
	// constant rate with the same growth; Bacon, Practical Portfolio
	// Performance Measurement and Attribution, 2nd ed., ch. 2, from memory).
	near("mean daily", st.MeanDaily, 1.0/396)
	near("mean daily geometric", st.MeanDailyGeometric, 0)
	near("mean annualised", st.MeanAnnualised, 252.0/396)
	near("mean annualised geometric", st.MeanAnnualisedGeometric, 0)
	// Sample standard deviation with the n−1 divisor, ×√252 (contract:
	// 252 trading days). Of two values a, b it is |a − b|/√2.
	if len(st.Volatility) != 3 {
		t.Fatalf("volatility windows %+v, want 2, 21 and the whole period", st.Volatility)
	}
	w2 := st.Volatility[0]
	if w2.WindowDays != 2 || w2.Discrete == nil || w2.Log == nil {
		t.Fatalf("window 2: %+v", w2)
	}
	near("vol 2d discrete", *w2.Discrete, (1.0/99)/math.Sqrt2*math.Sqrt(252))
	near("vol 2d log", *w2.Log, math.Log(100.0/99)/math.Sqrt2*math.Sqrt(252))
	if v := st.Volatility[1]; v.WindowDays != 21 || v.Discrete != nil || v.Log != nil {
		t.Errorf("a 21-day window on 4 returns must be absent, got %+v", v)
	}
	mean := 1.0 / 396
	var ss float64
	for _, x := range r {
		ss += (x - mean) * (x - mean)
	}
	if v := st.Volatility[2]; v.WindowDays != 4 || v.Discrete == nil {
		t.Fatalf("whole period: %+v", v)
	} else {
		near("vol whole period", *v.Discrete, math.Sqrt(ss/3)*math.Sqrt(252))
	}
	// EWMA (RiskMetrics Technical Document, 1996, with the first squared
	// return as seed as in pandas ewm(adjust=False)): s = 0.01, 0.01,
	// 0.94·0.01 + 0.06/99², then ×0.94 for the zero return.
	s := 0.94 * (0.94*0.01 + 0.06/(99*99))
	near("ewma volatility", *st.EWMAVolatility, math.Sqrt(s)*math.Sqrt(252))
	// Drawdown D_t = I_t / max I − 1 (common practice): the worst is
	// 0.99/1.1 − 1 = −0.1 from day 3 to day 4, not regained; at the end
	// 1/1.1 − 1.
	near("max drawdown", st.MaxDrawdown, -0.1)
	near("current drawdown", st.CurrentDrawdown, 1/1.1-1)
	if st.DrawdownPeak != "2026-03-03" || st.DrawdownTrough != "2026-03-04" || st.DrawdownRecover != "" {
		t.Errorf("drawdown dates %q to %q, recovered %q", st.DrawdownPeak, st.DrawdownTrough, st.DrawdownRecover)
	}
	if st.From != "2026-03-02" || st.To != "2026-03-06" || st.Prices != 5 || st.Returns != 4 {
		t.Errorf("period %s to %s, %d prices, %d returns", st.From, st.To, st.Prices, st.Returns)
	}
}

// One price gives no return: a typed error, not a row of NaN.
func TestComputeSecurityStatsTooShort(t *testing.T) {
	_, err := ComputeSecurityStats([]returns.PricePoint{{Date: time.Date(2026, 3, 2, 0, 0, 0, 0, time.UTC), Close: 10}}, []int{21}, 0.94)
	if !errors.Is(err, returns.ErrEmpty) {
		t.Fatalf("err = %v, want returns.ErrEmpty", err)
	}
}
