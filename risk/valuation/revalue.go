package valuation

// Shock is a set of additive changes to a holding's market and model
// inputs, all decimal. The zero value changes nothing.
type Shock struct {
	// Rate moves every discount rate: an explicit DiscountRate, every
	// explicit stage rate, the CAPM rate, and (term structure) every zero
	// yield. It matches the shift behind ModifiedDuration.
	Rate float64
	// RiskFree, ERP and Beta move the CAPM inputs. They change k only where
	// k is the CAPM rate; an explicit DiscountRate and explicit stage rates
	// stay put. In the term-structure model RiskFree shifts the curve level.
	RiskFree, ERP, Beta float64
	// Growth moves every growth rate: every stage, the terminal growth, and
	// the growth curve level. It matches the shift behind GrowthDuration
	// (with the trailing dividend D0 held fixed).
	Growth float64
	// NSLevel, NSSlope and NSCurvature move the discount curve's factors
	// (term-structure model only).
	NSLevel, NSSlope, NSCurvature float64
}

// Revalue returns the model value per share after the shock, by full
// revaluation under the same model-selection rule as Analyze. A shock that
// makes the inputs nonsensical (for example k ≤ g) returns the typed error.
func Revalue(a Assumptions, mkt Market, opt Options, s Shock) (float64, error) {
	var z Analyzer
	return z.Revalue(a, mkt, opt, s)
}

// Value returns the model value per share without any shock.
func Value(a Assumptions, mkt Market, opt Options) (float64, error) {
	return Revalue(a, mkt, opt, Shock{})
}

// Revalue is Revalue reusing the Analyzer's scratch space (it still copies
// the stages when the shock moves them).
func (z *Analyzer) Revalue(a Assumptions, mkt Market, opt Options, s Shock) (float64, error) {
	for _, p := range [...]struct {
		name string
		v    float64
	}{{"shock rate", s.Rate}, {"shock risk-free", s.RiskFree}, {"shock ERP", s.ERP}, {"shock beta", s.Beta},
		{"shock growth", s.Growth}, {"shock NS level", s.NSLevel}, {"shock NS slope", s.NSSlope}, {"shock NS curvature", s.NSCurvature}} {
		if !finite(p.v) {
			return 0, inputErr(p.name, p.v, ErrNotFinite)
		}
	}
	// Only the shocked copies below are modified; the caller's values are not.
	mkt.RiskFree += s.Rate + s.RiskFree
	mkt.ERP += s.ERP
	if a.Beta != nil && s.Beta != 0 {
		b := *a.Beta + s.Beta
		a.Beta = &b
	}
	if a.DiscountRate != nil && s.Rate != 0 {
		k := *a.DiscountRate + s.Rate
		a.DiscountRate = &k
	}
	a.Growth += s.Growth
	if len(a.Stages) > 0 && (s.Rate != 0 || s.Growth != 0) {
		st := make([]Stage, len(a.Stages))
		rates := make([]float64, len(a.Stages))
		for i, x := range a.Stages {
			st[i] = x
			st[i].Growth += s.Growth
			if x.Rate != nil {
				rates[i] = *x.Rate + s.Rate
				st[i].Rate = &rates[i]
			}
		}
		a.Stages = st
	}
	if a.GrowthCurve != nil && s.Growth != 0 {
		gc := *a.GrowthCurve
		gc.Level += s.Growth
		a.GrowthCurve = &gc
	}
	if mkt.Curve != nil {
		c := *mkt.Curve
		c.Level += s.Rate + s.RiskFree + s.NSLevel
		c.Slope += s.NSSlope
		c.Curvature += s.NSCurvature
		mkt.Curve = &c
	}
	// Growth shocks hold D0 fixed; the convention only matters for
	// derivatives, not for a revaluation from explicit inputs.
	opt.GrowthConvention = D0Fixed
	md := &z.m
	if err := md.build(a, mkt, opt); err != nil {
		return 0, err
	}
	sh := shifts{stage: -1}
	v := md.value(&sh)
	if !finite(v) {
		return 0, inputErr("model value", v, ErrNumerical)
	}
	return v, nil
}
