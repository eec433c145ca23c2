package valuation

import (
	"fmt"

	"plumbline/risk/curve"
)

// Stage is one finite stage of a multi-stage dividend forecast.
type Stage struct {
	Years  float64  // length in years on the payment clock, > 0
	Growth float64  // annual dividend growth during the stage, decimal, > −1
	Rate   *float64 // annual discount rate during the stage, decimal, > 0; nil = the holding's k
}

// Assumptions are the analyst's per-security inputs in effect on the valuation date.
type Assumptions struct {
	D0           float64  // trailing annual dividend per share, base currency, ≥ 0 (0 is refused with ErrNoDividend)
	Frequency    int      // payments per year: 1, 2, 4 or 12; 0 means 1
	Growth       float64  // long-run (terminal) annual growth, decimal, > −1
	Beta         *float64 // CAPM beta; nil = not given (the caller estimates it with EstimateBeta)
	DiscountRate *float64 // explicit annual discount rate k, decimal, > 0; overrides CAPM
	Stages       []Stage  // finite stages before the terminal stage, in order
	// StubFraction is the fraction of the current payment period already
	// elapsed at the valuation date, in [0, 1): the next payment is
	// (1 − StubFraction)/Frequency years away. 0 means a payment was just made.
	StubFraction float64
	// GrowthCurve optionally shapes dividend growth in the term-structure
	// model: γ(τ) is the average annual growth over the first τ months of the
	// payment clock, so the dividend index is (1 + γ(12τ))^τ. Its Level is the
	// long-run growth. Ignored by the other models.
	GrowthCurve *curve.NelsonSiegel
}

// Market holds the market inputs of the valuation date.
type Market struct {
	RiskFree float64             // risk-free rate rf for CAPM, decimal annually compounded
	ERP      float64             // equity risk premium, decimal
	Curve    *curve.NelsonSiegel // the day's fitted zero curve; nil when none
}

// GrowthConvention says which dividend is held fixed when growth moves.
type GrowthConvention int

const (
	// D0Fixed holds the trailing dividend fixed, so a growth change also
	// changes the next year's dividend D1 = D0(1+g). The default.
	D0Fixed GrowthConvention = iota
	// D1Fixed holds next year's dividend D1 fixed (D1 = D0 × growth over the
	// first payment-clock year).
	D1Fixed
)

func (c GrowthConvention) String() string {
	switch c {
	case D0Fixed:
		return "D0 fixed"
	case D1Fixed:
		return "D1 fixed"
	}
	return fmt.Sprintf("GrowthConvention(%d)", int(c))
}

// ModelKind names the dividend model used for a holding.
type ModelKind int

const (
	ModelConstantGrowth ModelKind = iota + 1 // Gordon, V = D1/(k−g) for annual payments
	ModelMultiStage                          // finite stages then a constant-growth terminal stage
	ModelTermStructure                       // dividends discounted on a Nelson–Siegel curve plus β·ERP
)

func (k ModelKind) String() string {
	switch k {
	case ModelConstantGrowth:
		return "constant growth"
	case ModelMultiStage:
		return "multi-stage"
	case ModelTermStructure:
		return "term structure"
	}
	return fmt.Sprintf("ModelKind(%d)", int(k))
}

// Options tune the analysis. The zero value gives the defaults.
type Options struct {
	// UseCurve asks for the term-structure model. It applies when the
	// holding has no explicit DiscountRate (an explicit k always wins);
	// without Market.Curve the request fails with ErrNoCurve.
	UseCurve bool
	// GrowthConvention for growth duration, growth convexity and the cross
	// term; the zero value is D0Fixed.
	GrowthConvention GrowthConvention
	// Step is the largest central-difference step, decimal; 0 means 1e-4.
	// It is reduced to a twentieth of the terminal gap k − g.
	Step float64
	// Horizon is the explicit horizon of the term-structure model in years;
	// 0 means 30. It is extended to cover every finite stage plus one year.
	Horizon float64
	// Numerical forces effective (numerical) measures for the constant-growth
	// model too, instead of its closed forms.
	Numerical bool
}

// Which model applies (the selection rule):
//  1. term structure if opts.UseCurve and the holding has no explicit DiscountRate;
//  2. otherwise multi-stage if the holding has Stages;
//  3. otherwise constant growth.
//
// The holding's k is the explicit DiscountRate when given, else the CAPM rate
// rf + β·ERP (Beta required). The term-structure model uses the spread β·ERP
// over the curve instead of rf.
func (md *model) build(a Assumptions, mkt Market, opt Options) error {
	for _, p := range [...]struct {
		name string
		v    float64
	}{{"risk-free rate", mkt.RiskFree}, {"equity risk premium", mkt.ERP}} {
		if !finite(p.v) {
			return inputErr(p.name, p.v, ErrNotFinite)
		}
	}
	var beta float64
	if a.Beta != nil {
		beta = *a.Beta
		if !finite(beta) {
			return inputErr("beta", beta, ErrNotFinite)
		}
	}
	var k float64
	linked := false
	switch {
	case a.DiscountRate != nil:
		k = *a.DiscountRate
		if !finite(k) {
			return inputErr("discount rate", k, ErrNotFinite)
		}
		if k <= 0 {
			return inputErr("discount rate", k, ErrRateOutOfRange)
		}
	case a.Beta != nil:
		k = capmRate(mkt.RiskFree, beta, mkt.ERP)
		linked = true
	default:
		return ErrMissingBeta
	}
	d1 := opt.GrowthConvention == D1Fixed
	md.beta, md.hasBeta, md.erp = beta, a.Beta != nil, mkt.ERP
	if opt.UseCurve && a.DiscountRate == nil {
		if mkt.Curve == nil {
			return ErrNoCurve
		}
		h := opt.Horizon
		if h == 0 {
			h = 30
		}
		return md.buildCurve(a.D0, a.Frequency, a.StubFraction, a.Stages, a.Growth, a.GrowthCurve,
			*mkt.Curve, beta*mkt.ERP, h, d1)
	}
	if linked && k <= 0 {
		return inputErr("CAPM discount rate", k, ErrRateOutOfRange)
	}
	return md.buildStages(a.D0, a.Frequency, a.StubFraction, a.Stages, k, a.Growth, linked, d1)
}
