package valuation

// ReturnExplanation splits a holding's (or portfolio's) return between two
// dates into the second-order Taylor terms in the changes of k and g, the
// full-revaluation return, and what the expansion leaves unexplained.
type ReturnExplanation struct {
	DK, DG float64 // Δk and Δg, decimal

	RateTerm            float64 // −D·Δk
	RateConvexityTerm   float64 // ½·C·Δk²
	GrowthTerm          float64 // Dg·Δg
	GrowthConvexityTerm float64 // ½·Cg·Δg²
	CrossTerm           float64 // X·Δk·Δg
	Taylor              float64 // sum of the five terms

	Revaluation float64 // V1/V0 − 1 by full revaluation
	Unexplained float64 // Revaluation − Taylor
}

// ExplainMove explains the return from value V0 = s.Value to v1 when k and
// g move by dk and dg:
//
//	ΔV/V ≈ −D·Δk + ½·C·Δk² + Dg·Δg + ½·Cg·Δg² + X·Δk·Δg
//
// with D, C, Dg, Cg, X the holding's modified duration, convexity, growth
// duration, growth convexity and cross term. The expansion treats Δk and Δg
// as parallel moves of every rate and growth. When only k and g moved, the
// unexplained remainder is the third-order error, O(|Δ|³); otherwise it also
// holds the effect of everything else that changed.
func ExplainMove(s Sensitivities, dk, dg, v1 float64) (ReturnExplanation, error) {
	for _, p := range [...]struct {
		name string
		v    float64
	}{{"dk", dk}, {"dg", dg}, {"value after", v1}, {"value before", s.Value}} {
		if !finite(p.v) {
			return ReturnExplanation{}, inputErr(p.name, p.v, ErrNotFinite)
		}
	}
	if !(s.Value > 0) {
		return ReturnExplanation{}, inputErr("value before", s.Value, ErrNoSensitivities)
	}
	e := ReturnExplanation{
		DK:                  dk,
		DG:                  dg,
		RateTerm:            -s.ModifiedDuration * dk,
		RateConvexityTerm:   0.5 * s.Convexity * dk * dk,
		GrowthTerm:          s.GrowthDuration * dg,
		GrowthConvexityTerm: 0.5 * s.GrowthConvexity * dg * dg,
		CrossTerm:           s.CrossKG * dk * dg,
		Revaluation:         v1/s.Value - 1,
	}
	e.Taylor = e.RateTerm + e.RateConvexityTerm + e.GrowthTerm + e.GrowthConvexityTerm + e.CrossTerm
	e.Unexplained = e.Revaluation - e.Taylor
	return e, nil
}

// ExplainBetween explains a holding's model return between two dates: it
// analyses the first date, revalues at the second, and uses Δk = k1 − k0 and
// Δg = g1 − g0 (terminal rate and growth as reported in Sensitivities.K and
// .G). It returns the first date's sensitivities too.
func ExplainBetween(a0 Assumptions, m0 Market, a1 Assumptions, m1 Market, opt Options) (ReturnExplanation, Sensitivities, error) {
	var z Analyzer
	var s0, s1 Sensitivities
	if err := z.Analyze(&s0, a0, m0, opt); err != nil {
		return ReturnExplanation{}, s0, err
	}
	// The second date needs only k, g and the value: skip its derivatives.
	if err := z.m.build(a1, m1, opt); err != nil {
		return ReturnExplanation{}, s0, err
	}
	sh := shifts{stage: -1}
	s1.Value, s1.K, s1.G = z.m.value(&sh), z.m.k, z.m.g
	e, err := ExplainMove(s0, s1.K-s0.K, s1.G-s0.G, s1.Value)
	return e, s0, err
}

// ExplainPosition is one portfolio line for ExplainPortfolio.
type ExplainPosition struct {
	ID, Sector  string
	MarketValue float64 // at the first date, base currency
	Cash        bool    // cash: every term and the revaluation return are zero
	Explanation ReturnExplanation
	Err         error // non-nil: excluded with this reason
}

// PortfolioExplanation is the market-value-weighted explanation of a
// portfolio's return. Each term is Σ_i w_i·term_i with w_i = MV_i / included
// value at the first date, cash included at zero return.
type PortfolioExplanation struct {
	ReturnExplanation // DK and DG are left zero: holdings may move differently
	TotalValue        float64
	IncludedValue     float64
	Excluded          []Exclusion
}

// ExplainPortfolio weights holding explanations by market value. Excluded
// holdings are listed with their share of total value; ErrNoValue is returned
// when the included value is not positive.
func ExplainPortfolio(ps []ExplainPosition) (PortfolioExplanation, error) {
	var p PortfolioExplanation
	for _, x := range ps {
		if !finite(x.MarketValue) {
			return PortfolioExplanation{}, inputErr("market value", x.MarketValue, ErrPosition)
		}
		p.TotalValue += x.MarketValue
		if !x.Cash && x.Err == nil && x.MarketValue < 0 {
			x.Err = inputErr("market value", x.MarketValue, ErrPosition)
		}
		if !x.Cash && x.Err != nil {
			p.Excluded = append(p.Excluded, Exclusion{ID: x.ID, Sector: x.Sector, MarketValue: x.MarketValue, Reason: x.Err.Error(), Err: x.Err})
			continue
		}
		p.IncludedValue += x.MarketValue
	}
	if !(p.IncludedValue > 0) {
		return PortfolioExplanation{}, inputErr("included market value", p.IncludedValue, ErrNoValue)
	}
	for i := range p.Excluded {
		if p.TotalValue != 0 {
			p.Excluded[i].Share = p.Excluded[i].MarketValue / p.TotalValue
		}
	}
	for _, x := range ps {
		if x.Cash || x.Err != nil || x.MarketValue < 0 {
			continue
		}
		w := x.MarketValue / p.IncludedValue
		e := &x.Explanation
		p.RateTerm += w * e.RateTerm
		p.RateConvexityTerm += w * e.RateConvexityTerm
		p.GrowthTerm += w * e.GrowthTerm
		p.GrowthConvexityTerm += w * e.GrowthConvexityTerm
		p.CrossTerm += w * e.CrossTerm
		p.Taylor += w * e.Taylor
		p.Revaluation += w * e.Revaluation
	}
	p.Unexplained = p.Revaluation - p.Taylor
	return p, nil
}
