package valuation

import "math"

// GordonValue returns the constant-growth (Gordon) value
//
//	V = D1 / (k − g)
//
// of a dividend D1 paid in one year and growing at g forever after,
// discounted at k (decimal annual rates). It refuses k ≤ g, D1 ≤ 0, g ≤ −1,
// k ≤ 0 and non-finite inputs.
func GordonValue(d1, k, g float64) (float64, error) {
	if !finite(d1) {
		return 0, inputErr("dividend D1", d1, ErrNotFinite)
	}
	if d1 < 0 {
		return 0, inputErr("dividend D1", d1, ErrNegativeDividend)
	}
	if d1 == 0 {
		return 0, inputErr("dividend D1", d1, ErrNoDividend)
	}
	if err := checkRateGrowth("discount rate", k, "growth", g); err != nil {
		return 0, err
	}
	if k <= g {
		return 0, inputErr("k - g", k-g, ErrGrowthNotBelowRate)
	}
	return d1 / (k - g), nil
}

// GordonValueD0 returns the constant-growth value from the trailing dividend:
//
//	V = D0·(1+g) / (k − g)
func GordonValueD0(d0, k, g float64) (float64, error) {
	if !finite(d0) {
		return 0, inputErr("dividend D0", d0, ErrNotFinite)
	}
	if d0 < 0 {
		return 0, inputErr("dividend D0", d0, ErrNegativeDividend)
	}
	if !finite(g) {
		return 0, inputErr("growth", g, ErrNotFinite)
	}
	return GordonValue(d0*(1+g), k, g)
}

// ConstantGrowth is the constant-growth model with m payments a year and a
// stub. On the payment clock (years since the last payment) payment j ≥ 1 is
// at τ_j = j/m and pays (D0/m)(1+g)^{τ_j}; the valuation date is
// stub = StubFraction/m years after the last payment. With r = (1+g)/(1+k)
// and q = r^{1/m}:
//
//	V = (1+k)^{stub} · (D0/m) · q / (1 − q)
//
// For m = 1 and StubFraction = 0 this is Gordon's V = D0(1+g)/(k−g).
type ConstantGrowth struct {
	D0           float64 // trailing annual dividend per share
	K, G         float64 // annual discount rate and growth, decimal, K > G
	Frequency    int     // 1, 2, 4 or 12; 0 means 1
	StubFraction float64 // in [0, 1)
}

// Measures are closed-form constant-growth measures.
type Measures struct {
	Value            float64 // per share
	ModifiedDuration float64 // −(1/V) dV/dk
	MacaulayDuration float64 // Σ t·PV / V, years
	Convexity        float64 // (1/V) d²V/dk²
	GrowthDuration   float64 // (1/V) dV/dg
	GrowthConvexity  float64 // (1/V) d²V/dg²
	CrossKG          float64 // (1/V) d²V/(dk dg)
}

// Value returns the model value per share.
func (c ConstantGrowth) Value() (float64, error) {
	m, err := c.Measures(D0Fixed)
	return m.Value, err
}

// Measures returns the closed-form value and sensitivities. Write x = ln r,
// M0 = (1/m)/(1−q) (Macaulay duration measured from the last payment),
// M = M0 − stub (Macaulay duration from the valuation date) and
// W = q/(m²(1−q)²) (the variance of payment times under PV weights). Then
//
//	modified duration  M/(1+k)
//	Macaulay duration  M
//	convexity          (M² + W + M)/(1+k)²
//	growth duration    M0/(1+g)                       D0 fixed
//	                   (M0 − 1)/(1+g)                  D1 fixed
//	growth convexity   (M0² + W − M0)/(1+g)²           D0 fixed
//	                   ((M0−1)² + W − (M0−1))/(1+g)²   D1 fixed
//	cross term        −(W + M·M0)/((1+k)(1+g))         D0 fixed
//	                  −(W + M·(M0−1))/((1+k)(1+g))     D1 fixed
//
// For m = 1 and no stub these are the textbook forms: modified 1/(k−g),
// Macaulay (1+k)/(k−g), convexity 2/(k−g)², growth duration
// 1/(k−g) + 1/(1+g) (D0 fixed) or 1/(k−g) (D1 fixed), and cross term
// −(2+k+g)/((1+g)(k−g)²) (D0 fixed) or −2/(k−g)² (D1 fixed).
func (c ConstantGrowth) Measures(conv GrowthConvention) (Measures, error) {
	var md model
	if err := md.buildStages(c.D0, c.Frequency, c.StubFraction, nil, c.K, c.G, false, conv == D1Fixed); err != nil {
		return Measures{}, err
	}
	return md.closedForm(), nil
}

// closedForm evaluates the formulas of ConstantGrowth.Measures on a built
// constant-growth model.
func (md *model) closedForm() Measures {
	k, g, m := md.k, md.g, md.m
	x := math.Log1p(g) - math.Log1p(k)
	lq := x / m
	q := math.Exp(lq)
	omq := -math.Expm1(lq) // 1 − q without cancellation
	m0 := 1 / (m * omq)
	mac := m0 - md.stub
	w := q / (m * m * omq * omq)
	v := math.Exp(md.stub*math.Log1p(k)) * md.d0 / m * q / omq
	out := Measures{
		Value:            v,
		ModifiedDuration: mac / (1 + k),
		MacaulayDuration: mac,
		Convexity:        (mac*mac + w + mac) / ((1 + k) * (1 + k)),
	}
	gd := m0 // growth clock runs from the last payment
	if md.d1Fixed {
		gd = m0 - 1
	}
	out.GrowthDuration = gd / (1 + g)
	out.GrowthConvexity = (gd*gd + w - gd) / ((1 + g) * (1 + g))
	out.CrossKG = -(w + mac*gd) / ((1 + k) * (1 + g))
	return out
}
