package stats

import (
	"errors"
	"math"
	"testing"
)

// TestKupiecAgainstScipy: LR = -2[ln L(p) - ln L(x/n)] with the binomial
// log-likelihoods from scipy 1.10 scipy.stats.binom.logpmf and the p-value
// scipy.stats.chi2.sf(LR, 1). Tolerance 1e-10 relative (12-digit JSON; the
// log-likelihoods are differences of logs of moderate size).
func TestKupiecAgainstScipy(t *testing.T) {
	ref := loadReference(t)
	if len(ref.Kupiec) == 0 {
		t.Fatal("no Kupiec reference cases")
	}
	for _, c := range ref.Kupiec {
		lr, pv, err := KupiecPOF(c.N, c.X, c.P)
		if err != nil {
			t.Fatal(err)
		}
		if !closeTo(lr, c.LR, 1e-10, 1e-12) || !closeTo(pv, c.PValue, 1e-10, 1e-15) {
			t.Errorf("n=%d x=%d p=%v: LR %v p %v, scipy %v %v", c.N, c.X, c.P, lr, pv, c.LR, c.PValue)
		}
	}
}

// TestKupiecCriticalValue: the 95% quantile of χ² with 1 degree of freedom
// is 3.841 in printed chi-squared tables (common practice; 3 decimals), and
// scipy.stats.chi2.ppf(0.95, 1) to 1e-11. At that LR the p-value is 5%.
func TestKupiecCriticalValue(t *testing.T) {
	ref := loadReference(t)
	if math.Abs(KupiecCritical95-3.841) > 5e-4 || !closeTo(KupiecCritical95, ref.Chi2PPF095, 1e-11, 0) {
		t.Errorf("critical value %v, table 3.841, scipy %v", KupiecCritical95, ref.Chi2PPF095)
	}
	if p := math.Erfc(math.Sqrt(KupiecCritical95 / 2)); !closeTo(p, 0.05, 1e-12, 0) {
		t.Errorf("p-value at the critical value %v, want 0.05", p)
	}
	// Zero exceptions in 250 days at 99%: LR = -2·250·ln(0.99) = 5.025…
	// (closed form) > 3.841, so even a perfect record rejects the model at
	// 5% — a known property of the test on short samples.
	lr, _, _ := KupiecPOF(250, 0, 0.01)
	if !closeTo(lr, -500*math.Log(0.99), 1e-14, 0) || lr <= KupiecCritical95 {
		t.Errorf("LR(0 of 250) = %v", lr)
	}
}

// TestTrafficLight: Basel Committee on Banking Supervision (1996),
// "Supervisory framework for the use of backtesting in conjunction with the
// internal models approach to market risk capital requirements", Table 2,
// for 250 observations at 99%: green 0-4 exceptions, yellow 5-9, red 10 or
// more. The cumulative probabilities printed there (from memory) are
// 89.22% at 4, 95.88% at 5, 99.97% at 9 and 99.99% at 10 (2 decimals:
// tolerance 5e-5); scipy.stats.binom.cdf to 1e-11 for 0..12.
func TestTrafficLight(t *testing.T) {
	ref := loadReference(t)
	for x := 0; x <= 12; x++ {
		want := Green
		switch {
		case x >= 10:
			want = Red
		case x >= 5:
			want = Yellow
		}
		got, err := TrafficLight(250, x, 0.01)
		if err != nil || got != want {
			t.Errorf("%d exceptions: %v %v, want %v", x, got, err, want)
		}
		if b := BinomialCDF(x, 250, 0.01); !closeTo(b, ref.BinomCDF250[x], 1e-11, 0) {
			t.Errorf("P(X<=%d) = %v, scipy %v", x, b, ref.BinomCDF250[x])
		}
	}
	for x, pct := range map[int]float64{4: 0.8922, 5: 0.9588, 9: 0.9997, 10: 0.9999} {
		if b := BinomialCDF(x, 250, 0.01); math.Abs(b-pct) > 5e-5 {
			t.Errorf("P(X<=%d) = %.6f, Basel table %.4f", x, b, pct)
		}
	}
}

// TestBacktest: 250 days of returns against a constant 1-day VaR of 2%,
// with six losses beyond it and one loss exactly equal to it (not an
// exception: the definition is a loss strictly greater than VaR).
func TestBacktest(t *testing.T) {
	r := make([]float64, 250)
	v := make([]float64, 250)
	for i := range r {
		r[i] = 0.001 * float64(i%9-4)
		v[i] = 0.02
	}
	for _, i := range []int{10, 50, 90, 130, 170, 210} {
		r[i] = -0.025
	}
	r[240] = -0.02
	conf := 0.99
	res, err := Backtest(r, v, conf)
	if err != nil {
		t.Fatal(err)
	}
	lr, pv, _ := KupiecPOF(250, 6, 1-conf) // the same float64 p as Backtest uses
	if res.Exceptions != 6 || res.Observations != 250 || res.Zone != Yellow ||
		res.KupiecLR != lr || res.KupiecPValue != pv || res.Reject95 != (lr > KupiecCritical95) ||
		!closeTo(res.ObservedRate, 0.024, 1e-15, 0) || !closeTo(res.ExpectedRate, 0.01, 1e-15, 0) {
		t.Errorf("%+v", res)
	}
}

func TestBacktestErrors(t *testing.T) {
	if _, err := Backtest([]float64{0.1}, []float64{0.1, 0.2}, 0.99); !errors.Is(err, ErrLength) {
		t.Errorf("length: %v", err)
	}
	if _, err := Backtest(nil, nil, 0.99); !errors.Is(err, ErrEmpty) {
		t.Errorf("empty: %v", err)
	}
	if _, _, err := KupiecPOF(10, 11, 0.01); !errors.Is(err, ErrTooShort) {
		t.Errorf("x > n: %v", err)
	}
	if _, err := TrafficLight(250, 3, 1.5); !errors.Is(err, ErrConfidence) {
		t.Errorf("p: %v", err)
	}
}

// TestVaRForecasts: each forecast is the VaR of the window just before its
// day (definition), and the backtest of the asset returns at 99% with a
// 250-day historical window counts the days whose loss exceeds it.
func TestVaRForecasts(t *testing.T) {
	asset, _ := assetReturns(t)
	spec := VaRSpec{Method: Historical, Confidence: 0.99}
	f, err := VaRForecasts(asset, 250, spec)
	if err != nil {
		t.Fatal(err)
	}
	if len(f) != len(asset)-250 {
		t.Fatalf("%d forecasts", len(f))
	}
	x := 0
	for k, v := range f {
		e, _ := HistoricalVaR(asset[k:k+250], 0.99)
		if v != e.VaR {
			t.Fatalf("forecast %d = %v, VaR of its window %v", k, v, e.VaR)
		}
		if -asset[250+k] > v {
			x++
		}
	}
	res, err := Backtest(asset[250:], f, 0.99)
	if err != nil || res.Exceptions != x {
		t.Errorf("backtest %+v %v, counted %d exceptions", res, err, x)
	}
	if _, err := VaRForecasts(asset, len(asset), spec); !errors.Is(err, ErrWindow) {
		t.Errorf("window = n: %v", err)
	}
}
