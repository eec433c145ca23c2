package stats

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestContributionsAgainstNumpy: σ_p = sqrt(wᵀCw), marginal Cw/σ_p and
// component w·Cw/σ_p evaluated by numpy 1.24 on numpy.cov of assets.csv.
// Tolerance 1e-10 relative to σ_p (12-digit JSON, one matrix product).
func TestContributionsAgainstNumpy(t *testing.T) {
	ref := loadReference(t)
	c, err := SampleCovariance(assetsMatrix(t))
	if err != nil {
		t.Fatal(err)
	}
	rc, err := Contributions(c, ref.Contrib.Weights)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(rc.Volatility, ref.Contrib.Vol, 1e-10, 0) {
		t.Errorf("volatility %v, numpy %v", rc.Volatility, ref.Contrib.Vol)
	}
	var sum, pct float64
	for i := range rc.Component {
		if !closeTo(rc.Marginal[i], ref.Contrib.Marginal[i], 1e-10, ref.Contrib.Vol) {
			t.Errorf("marginal %d = %v, numpy %v", i, rc.Marginal[i], ref.Contrib.Marginal[i])
		}
		if !closeTo(rc.Component[i], ref.Contrib.Component[i], 1e-10, ref.Contrib.Vol) {
			t.Errorf("component %d = %v, numpy %v", i, rc.Component[i], ref.Contrib.Component[i])
		}
		sum += rc.Component[i]
		pct += rc.Percent[i]
	}
	// Euler's theorem for a function homogeneous of degree one: the
	// components add up to the total. Exact identity; 1e-14 relative.
	if !closeTo(sum, rc.Volatility, 1e-14, 0) || !closeTo(pct, 1, 1e-14, 0) {
		t.Errorf("components sum to %v (total %v), percents to %v", sum, rc.Volatility, pct)
	}
	// The marginal contribution is the derivative ∂σ_p/∂w_i: central
	// difference with step 1e-6, truncation error O(h²) ≈ 1e-12 and rounding
	// about ε·σ/h ≈ 1e-12 relative, so 1e-8 relative is safe.
	w := append([]float64(nil), ref.Contrib.Weights...)
	const h = 1e-6
	for i := range w {
		w[i] += h
		up, _ := PortfolioVolatility(c, w)
		w[i] -= 2 * h
		down, _ := PortfolioVolatility(c, w)
		w[i] += h
		if d := (up - down) / (2 * h); !closeTo(rc.Marginal[i], d, 1e-8, 0) {
			t.Errorf("marginal %d = %v, finite difference %v", i, rc.Marginal[i], d)
		}
	}
}

// TestContributionsTwoAssets: two uncorrelated holdings with volatilities
// 0.2 and 0.1, weights 0.5 each: σ_p² = 0.25·0.04 + 0.25·0.01 = 0.0125;
// components w_i² σ_i² / σ_p = 0.01/σ_p and 0.0025/σ_p, i.e. 80% and 20%
// (hand computation).
func TestContributionsTwoAssets(t *testing.T) {
	c := mat.NewSymDense(2, []float64{0.04, 0, 0, 0.01})
	rc, err := Contributions(c, []float64{0.5, 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(rc.Volatility, math.Sqrt(0.0125), 1e-15, 0) ||
		!closeTo(rc.Percent[0], 0.8, 1e-14, 0) || !closeTo(rc.Percent[1], 0.2, 1e-14, 0) {
		t.Errorf("got %+v", rc)
	}
}

func TestContributionsErrors(t *testing.T) {
	c := mat.NewSymDense(2, []float64{0.04, 0, 0, 0.01})
	if _, err := Contributions(c, []float64{1}); !errors.Is(err, ErrLength) {
		t.Errorf("length: %v", err)
	}
	if _, err := Contributions(c, []float64{0, 0}); !errors.Is(err, ErrZeroVariance) {
		t.Errorf("zero weights: %v", err)
	}
	if _, err := PortfolioVolatility(c, []float64{math.NaN(), 0}); !errors.Is(err, ErrNonFinite) {
		t.Errorf("NaN weight: %v", err)
	}
	bad := mat.NewSymDense(2, []float64{0.01, 0.05, 0.05, 0.01}) // correlation 5: not PSD
	if _, err := PortfolioVolatility(bad, []float64{1, -1}); !errors.Is(err, ErrNonPositive) {
		t.Errorf("not PSD: %v", err)
	}
}
