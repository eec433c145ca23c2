package stats

import (
	"fmt"

	"gonum.org/v1/gonum/stat/distuv"
)

// CornishFisherQuantile returns the Cornish-Fisher expansion of the standard
// normal quantile z for skewness s and excess kurtosis k:
//
//	z_cf = z + (z²-1) s/6 + (z³-3z) k/24 - (2z³-5z) s²/36
func CornishFisherQuantile(z, s, k float64) float64 {
	z2 := z * z
	z3 := z2 * z
	return z + (z2-1)*s/6 + (z3-3*z)*k/24 - (2*z3-5*z)*s*s/36
}

// CornishFisherVaR returns VaR and ES at confidence c from the sample mean μ,
// sample standard deviation σ (n-1), bias-corrected skewness S (Skewness) and
// excess kurtosis K (ExcessKurtosis) of the returns r:
//
//	VaR = -(μ + z_cf σ),   z_cf = CornishFisherQuantile(Φ⁻¹(1-c), S, K)
//	ES  = -(μ + σ E),      E = (1/α) ∫_0^α z_cf(Φ⁻¹(u)) du,  α = 1-c
//
// ES is the tail average of the expanded quantile function, integrated in
// closed form with the normal partial moments M_j = ∫_{-∞}^{q} x^j φ(x) dx
// (M0 = α, M1 = -φ(q), M2 = α - qφ(q), M3 = -(q²+2)φ(q), q = Φ⁻¹(α)):
//
//	E = [M1 + (M2-M0) S/6 + (M3-3M1) K/24 - (2M3-5M1) S²/36] / α
//
// With S = K = 0 both reduce to NormalVaR. The expansion is only a valid
// quantile where it increases with z; if dz_cf/dz <= 0 at the VaR quantile
// (extreme skewness or kurtosis) the estimate is refused with ErrDomain.
// Needs at least 4 returns.
func CornishFisherVaR(r []float64, c float64) (VaREstimate, error) {
	if err := checkConfidence("cornish-fisher var", c); err != nil {
		return VaREstimate{}, err
	}
	mu, sigma, err := meanStd("cornish-fisher var", r)
	if err != nil {
		return VaREstimate{}, err
	}
	s, err := Skewness(r)
	if err != nil {
		return VaREstimate{}, fmt.Errorf("stats: cornish-fisher var: %w", err)
	}
	k, err := ExcessKurtosis(r)
	if err != nil {
		return VaREstimate{}, fmt.Errorf("stats: cornish-fisher var: %w", err)
	}
	alpha := 1 - c
	q := distuv.UnitNormal.Quantile(alpha)
	q2 := q * q
	if d := 1 + q*s/3 + (q2-1)*k/8 - (6*q2-5)*s*s/36; d <= 0 {
		return VaREstimate{}, fmt.Errorf("stats: cornish-fisher var: skewness %.3g, excess kurtosis %.3g: expansion decreasing at the %v quantile: %w", s, k, alpha, ErrDomain)
	}
	zcf := CornishFisherQuantile(q, s, k)
	phi := distuv.UnitNormal.Prob(q)
	m0, m1, m2, m3 := alpha, -phi, alpha-q*phi, -(q2+2)*phi
	e := (m1 + (m2-m0)*s/6 + (m3-3*m1)*k/24 - (2*m3-5*m1)*s*s/36) / alpha
	return VaREstimate{
		VaR:          -(mu + zcf*sigma),
		ES:           -(mu + e*sigma),
		Observations: len(r),
	}, nil
}
