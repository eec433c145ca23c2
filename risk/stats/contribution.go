package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// RiskContribution splits portfolio volatility among holdings (Euler
// allocation; volatility is homogeneous of degree one in the weights):
//
//	σ_p = sqrt(wᵀ Σ w)
//	Marginal_i  = ∂σ_p/∂w_i = (Σ w)_i / σ_p
//	Component_i = w_i · Marginal_i,   Σ_i Component_i = σ_p
//	Percent_i   = Component_i / σ_p,  Σ_i Percent_i = 1
//
// Units follow the covariance matrix: a daily covariance gives daily
// volatility contributions.
type RiskContribution struct {
	Volatility float64
	Marginal   []float64
	Component  []float64
	Percent    []float64
}

// PortfolioVolatility returns σ_p = sqrt(wᵀ Σ w) for weights w (decimal
// fractions of portfolio value; they need not sum to 1, for example with
// cash or leverage) and covariance matrix Σ.
func PortfolioVolatility(cov mat.Symmetric, w []float64) (float64, error) {
	v, _, err := quadForm("portfolio volatility", cov, w)
	if err != nil {
		return 0, err
	}
	return math.Sqrt(v), nil
}

// Contributions returns the RiskContribution of each holding. A portfolio
// with zero variance has no marginal contributions and is refused with
// ErrZeroVariance.
func Contributions(cov mat.Symmetric, w []float64) (RiskContribution, error) {
	v, sw, err := quadForm("risk contributions", cov, w)
	if err != nil {
		return RiskContribution{}, err
	}
	if v == 0 {
		return RiskContribution{}, fmt.Errorf("stats: risk contributions: portfolio variance is 0: %w", ErrZeroVariance)
	}
	sigma := math.Sqrt(v)
	rc := RiskContribution{
		Volatility: sigma,
		Marginal:   make([]float64, len(w)),
		Component:  make([]float64, len(w)),
		Percent:    make([]float64, len(w)),
	}
	for i := range w {
		rc.Marginal[i] = sw[i] / sigma
		rc.Component[i] = w[i] * rc.Marginal[i]
		rc.Percent[i] = rc.Component[i] / sigma
	}
	return rc, nil
}

// quadForm returns wᵀΣw and Σw after checking shapes and values. A slightly
// negative wᵀΣw from rounding of a singular matrix is refused rather than
// clipped: the matrix is then not a usable covariance.
func quadForm(op string, cov mat.Symmetric, w []float64) (float64, []float64, error) {
	if cov == nil || len(w) == 0 {
		return 0, nil, fmt.Errorf("stats: %s: %w", op, ErrEmpty)
	}
	n := cov.SymmetricDim()
	if n != len(w) {
		return 0, nil, fmt.Errorf("stats: %s: %d weights for a %d×%d covariance: %w", op, len(w), n, n, ErrLength)
	}
	if err := checkFinite(op, w); err != nil {
		return 0, nil, err
	}
	for i := 0; i < n; i++ {
		if d := cov.At(i, i); d < 0 || math.IsNaN(d) || math.IsInf(d, 0) {
			return 0, nil, fmt.Errorf("stats: %s: variance %d is %v: %w", op, i, d, ErrNonFinite)
		}
	}
	wv := mat.NewVecDense(n, append([]float64(nil), w...))
	var sv mat.VecDense
	sv.MulVec(cov, wv)
	v := mat.Dot(wv, &sv)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, nil, fmt.Errorf("stats: %s: variance %v: %w", op, v, ErrNonFinite)
	}
	if v < 0 {
		return 0, nil, fmt.Errorf("stats: %s: variance %v < 0, covariance not positive semi-definite: %w", op, v, ErrNonPositive)
	}
	return v, sv.RawVector().Data, nil
}
