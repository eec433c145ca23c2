package stats

import (
	"errors"
	"math"
	"testing"
)

// TestEWMAVarianceAgainstPandas: pandas 1.5
// Series(r**2).ewm(alpha=1-λ, adjust=False).mean() runs the same recursion
// with the same seed. Tolerance 1e-11 relative (the JSON keeps 12 digits; the
// recursion itself is stable, errors do not grow).
func TestEWMAVarianceAgainstPandas(t *testing.T) {
	ref := loadReference(t)
	asset, _ := assetReturns(t)
	for key, lambda := range map[string]float64{"0.94": 0.94, "0.97": 0.97} {
		got, err := EWMAVariance(asset, lambda)
		if err != nil {
			t.Fatal(err)
		}
		want := ref.EWMA[key]
		if len(got) != len(want) {
			t.Fatalf("λ=%s: %d values, pandas %d", key, len(got), len(want))
		}
		for i := range got {
			if !closeTo(got[i], want[i], 1e-11, 0) {
				t.Errorf("λ=%s: s[%d] = %v, pandas %v", key, i, got[i], want[i])
			}
		}
	}
}

// TestEWMAClosedForms checks the recursion against closed forms.
func TestEWMAClosedForms(t *testing.T) {
	// A constant return r gives s_t = r² at every t (the weights sum to 1).
	c := []float64{0.02, 0.02, 0.02, 0.02, 0.02}
	s, err := EWMAVariance(c, RiskMetricsLambda)
	if err != nil {
		t.Fatal(err)
	}
	for i, v := range s {
		if !closeTo(v, 0.0004, 1e-14, 0) {
			t.Errorf("constant returns: s[%d] = %v, want 4e-4", i, v)
		}
	}
	// One shock of 0.1 after zeros, seeded at 0: s_k = (1-λ) λ^k · 0.01
	// (RiskMetrics Technical Document 1996, the recursion unrolled).
	r := []float64{0.1, 0, 0, 0}
	s, err = EWMAVarianceSeeded(r, 0.94, 0, false)
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range s {
		want := 0.06 * math.Pow(0.94, float64(k)) * 0.01
		if !closeTo(v, want, 1e-14, 0) {
			t.Errorf("shock: s[%d] = %v, want %v", k, v, want)
		}
	}
	// With keepSeed the seed comes first.
	s, _ = EWMAVarianceSeeded(r, 0.94, 0.5, true)
	if len(s) != 5 || s[0] != 0.5 || !closeTo(s[1], 0.94*0.5+0.06*0.01, 1e-15, 0) {
		t.Errorf("keepSeed: %v", s)
	}
	vol, _ := EWMAVolatility(c, 0.94)
	if !closeTo(vol[4], 0.02, 1e-14, 0) {
		t.Errorf("volatility %v, want 0.02", vol[4])
	}
}

func TestEWMAErrors(t *testing.T) {
	r := []float64{0.01, -0.02}
	for _, lambda := range []float64{0, 1, -0.5, 1.2, math.NaN()} {
		if _, err := EWMAVariance(r, lambda); !errors.Is(err, ErrLambda) {
			t.Errorf("λ=%v: error %v, want ErrLambda", lambda, err)
		}
	}
	if _, err := EWMAVariance(nil, 0.94); !errors.Is(err, ErrEmpty) {
		t.Errorf("empty: %v", err)
	}
	if _, err := EWMAVariance([]float64{0.1, math.NaN()}, 0.94); !errors.Is(err, ErrNonFinite) {
		t.Errorf("NaN: %v", err)
	}
	if _, err := EWMAVarianceSeeded(r, 0.94, -1, false); !errors.Is(err, ErrNonPositive) {
		t.Errorf("negative seed: %v", err)
	}
}

func BenchmarkEWMAVariance10M(b *testing.B) {
	x := benchSeries(10_000_000)
	b.ResetTimer()
	for range b.N {
		if _, err := EWMAVariance(x, RiskMetricsLambda); err != nil {
			b.Fatal(err)
		}
	}
}
