package stats

import (
	"fmt"
	"math"
)

// KupiecCritical95 is the 95% quantile of the chi-squared distribution with
// one degree of freedom, the rejection threshold of Kupiec's test at the 5%
// level.
const KupiecCritical95 = 3.841458820694124

// Zone is a Basel traffic-light zone for a VaR model's backtest.
type Zone int

const (
	Green Zone = iota
	Yellow
	Red
)

func (z Zone) String() string {
	switch z {
	case Green:
		return "green"
	case Yellow:
		return "yellow"
	case Red:
		return "red"
	}
	return fmt.Sprintf("Zone(%d)", int(z))
}

// BacktestResult summarises how often realised losses exceeded the VaR.
type BacktestResult struct {
	Observations int
	Exceptions   int     // days with loss -r_t > VaR_t
	ExpectedRate float64 // 1 - confidence
	ObservedRate float64 // Exceptions / Observations
	KupiecLR     float64 // Kupiec's proportion-of-failures likelihood ratio
	KupiecPValue float64 // P(χ²₁ >= KupiecLR)
	Reject95     bool    // KupiecLR > KupiecCritical95
	Zone         Zone    // Basel traffic light for these counts
}

// Backtest compares realised returns r_t with the VaR forecast for the same
// day var_t (a positive loss made before the day). An exception is a loss
// strictly greater than the VaR: -r_t > var_t.
func Backtest(r, vaR []float64, confidence float64) (BacktestResult, error) {
	if err := checkConfidence("backtest", confidence); err != nil {
		return BacktestResult{}, err
	}
	if len(r) != len(vaR) {
		return BacktestResult{}, fmt.Errorf("stats: backtest: %d returns, %d VaR forecasts: %w", len(r), len(vaR), ErrLength)
	}
	if len(r) == 0 {
		return BacktestResult{}, fmt.Errorf("stats: backtest: %w", ErrEmpty)
	}
	if err := checkFinite("backtest", r); err != nil {
		return BacktestResult{}, err
	}
	if err := checkFinite("backtest", vaR); err != nil {
		return BacktestResult{}, err
	}
	x := 0
	for i := range r {
		if -r[i] > vaR[i] {
			x++
		}
	}
	n := len(r)
	p := 1 - confidence
	lr, pv, err := KupiecPOF(n, x, p)
	if err != nil {
		return BacktestResult{}, err
	}
	zone, err := TrafficLight(n, x, p)
	if err != nil {
		return BacktestResult{}, err
	}
	return BacktestResult{
		Observations: n,
		Exceptions:   x,
		ExpectedRate: p,
		ObservedRate: float64(x) / float64(n),
		KupiecLR:     lr,
		KupiecPValue: pv,
		Reject95:     lr > KupiecCritical95,
		Zone:         zone,
	}, nil
}

// KupiecPOF returns Kupiec's (1995) proportion-of-failures likelihood ratio
// for x exceptions in n days when the model's exception probability is p
// (p = 1 - confidence), and its p-value from the chi-squared distribution
// with one degree of freedom:
//
//	LR = -2 ln[ (1-p)^(n-x) p^x ] + 2 ln[ (1-x/n)^(n-x) (x/n)^x ]
//	p-value = P(χ²₁ >= LR) = erfc( sqrt(LR/2) )
//
// with 0·ln 0 = 0 when x = 0 or x = n.
func KupiecPOF(n, x int, p float64) (lr, pValue float64, err error) {
	if n <= 0 || x < 0 || x > n {
		return 0, 0, fmt.Errorf("stats: kupiec: %d exceptions in %d days: %w", x, n, ErrTooShort)
	}
	if !(p > 0 && p < 1) {
		return 0, 0, fmt.Errorf("stats: kupiec: exception probability %v: %w", p, ErrConfidence)
	}
	fn, fx := float64(n), float64(x)
	phat := fx / fn
	ll0 := xlogy(fn-fx, 1-p) + xlogy(fx, p)
	ll1 := xlogy(fn-fx, 1-phat) + xlogy(fx, phat)
	lr = -2 * (ll0 - ll1)
	if lr < 0 { // rounding when phat == p
		lr = 0
	}
	return lr, math.Erfc(math.Sqrt(lr / 2)), nil
}

// xlogy returns x·ln(y) with 0·ln(0) = 0.
func xlogy(x, y float64) float64 {
	if x == 0 {
		return 0
	}
	return x * math.Log(y)
}

// TrafficLight returns the Basel Committee (1996) traffic-light zone for x
// exceptions in n days when the exception probability is p. The zones are
// set by the binomial cumulative probability B(x) = P(X <= x), X ~ Bin(n, p):
// green while B(x) < 95%, yellow while B(x) < 99.99%, red from there on.
// For n = 250 and p = 1% this gives the published table: green 0-4,
// yellow 5-9, red 10 or more.
func TrafficLight(n, x int, p float64) (Zone, error) {
	if n <= 0 || x < 0 || x > n {
		return 0, fmt.Errorf("stats: traffic light: %d exceptions in %d days: %w", x, n, ErrTooShort)
	}
	if !(p > 0 && p < 1) {
		return 0, fmt.Errorf("stats: traffic light: exception probability %v: %w", p, ErrConfidence)
	}
	b := BinomialCDF(x, n, p)
	switch {
	case b < 0.95:
		return Green, nil
	case b < 0.9999:
		return Yellow, nil
	}
	return Red, nil
}

// BinomialCDF returns P(X <= x) for X ~ Binomial(n, p), summing the
// probabilities exp(ln C(n,k) + k ln p + (n-k) ln(1-p)) for k = 0..x.
func BinomialCDF(x, n int, p float64) float64 {
	if x < 0 {
		return 0
	}
	if x >= n {
		return 1
	}
	lp, lq := math.Log(p), math.Log1p(-p)
	ln1, _ := math.Lgamma(float64(n) + 1)
	var s float64
	for k := 0; k <= x; k++ {
		lk, _ := math.Lgamma(float64(k) + 1)
		lnk, _ := math.Lgamma(float64(n-k) + 1)
		s += math.Exp(ln1 - lk - lnk + float64(k)*lp + float64(n-k)*lq)
	}
	return min(s, 1)
}

// VaRForecasts returns out-of-sample VaR forecasts for a backtest: the
// forecast for day t (t = window .. n-1) is EstimateVaR of the `window`
// returns before it, r[t-window : t], so out[k] belongs to r[window+k] and
// Backtest(r[window:], out, spec.Confidence) scores them.
func VaRForecasts(r []float64, window int, spec VaRSpec) ([]float64, error) {
	if window < 2 || window >= len(r) {
		return nil, fmt.Errorf("stats: var forecasts: window %d for %d returns: %w", window, len(r), ErrWindow)
	}
	out := make([]float64, len(r)-window)
	for k := range out {
		e, err := EstimateVaR(r[k:k+window], spec)
		if err != nil {
			return nil, fmt.Errorf("stats: var forecasts: day %d: %w", window+k, err)
		}
		out[k] = e.VaR
	}
	return out, nil
}
