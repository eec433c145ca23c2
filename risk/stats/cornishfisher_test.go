package stats

import (
	"errors"
	"testing"
)

// TestCornishFisherReducesToNormal: with zero skewness and excess kurtosis
// the expansion is the normal quantile itself (Cornish and Fisher, 1937;
// every correction term has a factor S or K).
func TestCornishFisherReducesToNormal(t *testing.T) {
	for _, z := range []float64{-2.3263478740408408, -1.6448536269514729, 0, 1.2} {
		if got := CornishFisherQuantile(z, 0, 0); got != z {
			t.Errorf("z_cf(%v, 0, 0) = %v", z, got)
		}
	}
	// Hand computation at z = -2, S = -0.5, K = 3:
	// -2 + 3·(-0.5)/6 + (-8+6)·3/24 - (-16+10)·0.25/36
	// = -2 - 0.25 - 0.25 + 1/24.
	if got, want := CornishFisherQuantile(-2, -0.5, 3), -2.5+1.0/24; !closeTo(got, want, 1e-15, 0) {
		t.Errorf("z_cf = %v, want %v", got, want)
	}
}

// TestCornishFisherAgainstScipy checks the expanded quantile itself against
// the reference (scipy skew/kurtosis, bias=False, and norm.ppf), 1e-10.
func TestCornishFisherAgainstScipy(t *testing.T) {
	ref := loadReference(t)
	asset, _ := assetReturns(t)
	s, _ := Skewness(asset)
	k, _ := ExcessKurtosis(asset)
	for key, c := range map[string]float64{"0.95": 0.95, "0.99": 0.99} {
		z := -ref.NormPPF[key]
		if got, want := CornishFisherQuantile(z, s, k), ref.VaR[key]["cornish_fisher"].ZCF; !closeTo(got, want, 1e-10, 0) {
			t.Errorf("%v: z_cf %v, reference %v", c, got, want)
		}
	}
}

// TestCornishFisherDomain: one large gain among 99 zeros has skewness near
// 10 and excess kurtosis near 100; the expansion then decreases at the 1%
// quantile and is refused.
func TestCornishFisherDomain(t *testing.T) {
	r := make([]float64, 100)
	r[0] = 0.5
	if _, err := CornishFisherVaR(r, 0.99); !errors.Is(err, ErrDomain) {
		t.Errorf("error %v, want ErrDomain", err)
	}
	if _, err := CornishFisherVaR([]float64{0.01, 0.02, 0.03}, 0.99); !errors.Is(err, ErrTooShort) {
		t.Errorf("3 returns: %v", err)
	}
	if _, err := CornishFisherVaR([]float64{0.01, 0.01, 0.01, 0.01, 0.01}, 0.99); !errors.Is(err, ErrZeroVariance) {
		t.Errorf("constant: %v", err)
	}
}
