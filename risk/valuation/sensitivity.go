package valuation

import (
	"fmt"
	"math"
)

// Sensitivities are the per-share value and rate and growth sensitivities of
// one holding. Rates are decimal; durations are per unit of decimal rate
// (a duration of 20 means −20% for +1.00 = +100 percentage points, so about
// −0.2% for +1 bp).
type Sensitivities struct {
	Model ModelKind
	Value float64 // model value per share, base currency

	K      float64 // terminal discount rate k (term structure: long end Level + spread)
	G      float64 // terminal growth g (term structure: long-run growth)
	Beta   float64 // CAPM beta used; 0 when HasBeta is false
	Spread float64 // term structure: equity spread β·ERP over the curve; else 0

	HasBeta    bool // a beta was given
	CAPMLinked bool // k is the CAPM rate rf + β·ERP (no explicit DiscountRate)

	// Rate sensitivities, for a parallel shift of every discount rate
	// (every stage rate; for the term structure, every zero yield).
	ModifiedDuration float64 // −(1/V) dV/dk
	MacaulayDuration float64 // Σ t·PV(t) / V, years; equals (1+k)·ModifiedDuration under a single flat k
	Convexity        float64 // (1/V) d²V/dk²

	// Growth sensitivities, for a parallel shift of every growth rate,
	// holding fixed the dividend named by GrowthConvention.
	GrowthConvention GrowthConvention
	GrowthDuration   float64 // +(1/V) dV/dg (positive: value rises with growth)
	GrowthConvexity  float64 // (1/V) d²V/dg²
	CrossKG          float64 // (1/V) d²V/(dk dg)

	// CAPM form: −(1/V) dV/dx for x = rf, β, ERP, moving only the rates
	// that follow CAPM (zero when k is an explicit DiscountRate). In the
	// term-structure model rf is the curve level.
	RiskFreeDuration float64
	BetaDuration     float64
	ERPDuration      float64

	// Per stage: index i < len(Stages) is finite stage i, the last entry the
	// terminal stage. Rate: −(1/V) dV/dk_i; growth: (1/V) dV/dg_i. They add up
	// to ModifiedDuration and GrowthDuration. StageRateDurations is nil for
	// the term-structure model; StageGrowthDurations is nil there when a
	// growth curve is used.
	StageRateDurations   []float64
	StageGrowthDurations []float64

	// Term-structure model only: −(1/V) dV/dβ_j for the Nelson–Siegel
	// level, slope and curvature of the discount curve (decimal factor
	// changes). The level duration equals ModifiedDuration.
	NSLevelDuration     float64
	NSSlopeDuration     float64
	NSCurvatureDuration float64

	// Numerical is true when the measures are effective (central
	// differences); Step is the largest step used and Errors the estimated
	// absolute error of each measure. Closed forms leave them zero.
	Numerical bool
	Step      float64
	Errors    ErrorEstimates
}

// ErrorEstimates are absolute error estimates of numerical measures, in the
// measure's own units. Stage entries are the largest over stages.
type ErrorEstimates struct {
	ModifiedDuration, MacaulayDuration, Convexity float64
	GrowthDuration, GrowthConvexity, CrossKG      float64
	RiskFreeDuration                              float64
	StageRate, StageGrowth                        float64
	NSSlope, NSCurvature                          float64
}

// Analyzer computes sensitivities while reusing its scratch space, so a loop
// over many holdings does not allocate. The zero value is ready; an Analyzer
// must not be used by two goroutines at once.
type Analyzer struct {
	m model
}

// Analyze computes the sensitivities of one holding (see Analyzer.Analyze).
func Analyze(a Assumptions, mkt Market, opt Options) (Sensitivities, error) {
	var z Analyzer
	var s Sensitivities
	err := z.Analyze(&s, a, mkt, opt)
	return s, err
}

// Analyze fills dst with the sensitivities of one holding, reusing dst's
// stage slices. The model follows the selection rule documented on
// Options.UseCurve: term structure if requested, else multi-stage if there
// are stages, else constant growth. Constant growth uses the closed forms of
// ConstantGrowth.Measures unless opt.Numerical; the other models use
// effective measures by central differences with Richardson extrapolation.
func (z *Analyzer) Analyze(dst *Sensitivities, a Assumptions, mkt Market, opt Options) error {
	if !finite(opt.Step) || opt.Step < 0 {
		return inputErr("step", opt.Step, ErrStep)
	}
	if opt.GrowthConvention != D0Fixed && opt.GrowthConvention != D1Fixed {
		return inputErr("growth convention", float64(opt.GrowthConvention), ErrConvention)
	}
	md := &z.m
	if err := md.build(a, mkt, opt); err != nil {
		return err
	}
	rates, growths := dst.StageRateDurations[:0], dst.StageGrowthDurations[:0]
	*dst = Sensitivities{
		Model:            md.kind,
		K:                md.k,
		G:                md.g,
		Beta:             md.beta,
		Spread:           md.spread,
		HasBeta:          md.hasBeta,
		CAPMLinked:       md.linked,
		GrowthConvention: opt.GrowthConvention,
	}
	if md.kind == ModelConstantGrowth && !opt.Numerical {
		cf := md.closedForm()
		dst.Value = cf.Value
		dst.ModifiedDuration = cf.ModifiedDuration
		dst.MacaulayDuration = cf.MacaulayDuration
		dst.Convexity = cf.Convexity
		dst.GrowthDuration = cf.GrowthDuration
		dst.GrowthConvexity = cf.GrowthConvexity
		dst.CrossKG = cf.CrossKG
		dst.StageRateDurations = append(rates, cf.ModifiedDuration)
		dst.StageGrowthDurations = append(growths, cf.GrowthDuration)
		if md.linked {
			dst.RiskFreeDuration, dst.BetaDuration, dst.ERPDuration = CAPMDurations(cf.ModifiedDuration, md.beta, md.erp)
		}
		return nil
	}
	dst.StageRateDurations, dst.StageGrowthDurations = rates, growths
	return md.numerical(dst, opt)
}

// step returns the largest central-difference step: the requested base
// (default 1 bp), at most a twentieth of the terminal gap k − g so that no
// evaluation approaches the k = g pole, and at most a quarter of the
// distance of any rate or growth from −1.
func (md *model) step(base float64) float64 {
	if base == 0 {
		base = 1e-4
	}
	h := math.Min(base, (md.k-md.g)/20)
	h = math.Min(h, (1+md.g)/4)
	for i := range md.segs {
		h = math.Min(h, (1+md.segs[i].g)/4)
		if md.kind != ModelTermStructure {
			h = math.Min(h, (1+md.segs[i].k)/4)
		}
	}
	if md.kind == ModelTermStructure {
		h = math.Min(h, md.margin/4)
	}
	return h
}

func (md *model) numerical(dst *Sensitivities, opt Options) error {
	sh := shifts{stage: -1}
	f := func() float64 { return md.value(&sh) }
	v := f()
	if !finite(v) || v <= 0 {
		return inputErr("model value", v, ErrNumerical)
	}
	h := md.step(opt.Step)
	dst.Value, dst.Numerical, dst.Step = v, true, h
	fail := func(what string) error { return fmt.Errorf("%s: %w", what, ErrNumerical) }

	dk, ok := central(f, &sh.rate, h, v)
	if !ok {
		return fail("rate")
	}
	dst.ModifiedDuration, dst.Errors.ModifiedDuration = -dk.d1/v, dk.e1/v
	dst.Convexity, dst.Errors.Convexity = dk.d2/v, dk.e2/v

	dg, ok := central(f, &sh.growth, h, v)
	if !ok {
		return fail("growth")
	}
	dst.GrowthDuration, dst.Errors.GrowthDuration = dg.d1/v, dg.e1/v
	dst.GrowthConvexity, dst.Errors.GrowthConvexity = dg.d2/v, dg.e2/v

	x, e, ok := centralCross(f, &sh.rate, &sh.growth, h)
	if !ok {
		return fail("cross")
	}
	dst.CrossKG, dst.Errors.CrossKG = x/v, e/v

	d, e, ok := centralFirst(f, &sh.cts, h)
	if !ok {
		return fail("Macaulay")
	}
	dst.MacaulayDuration, dst.Errors.MacaulayDuration = -d/v, e/v

	// CAPM-linked rates: identical to the parallel shift unless some stage
	// carries its own rate.
	lin, linErr := 0.0, 0.0
	switch {
	case !md.linked:
	case md.explicitRate:
		d, e, ok := centralFirst(f, &sh.linked, h)
		if !ok {
			return fail("risk-free")
		}
		lin, linErr = -d/v, e/v
	default:
		lin, linErr = dst.ModifiedDuration, dst.Errors.ModifiedDuration
	}
	dst.RiskFreeDuration, dst.BetaDuration, dst.ERPDuration = CAPMDurations(lin, md.beta, md.erp)
	dst.Errors.RiskFreeDuration = linErr

	perStageGrowth := md.kind != ModelTermStructure || !md.hasGCurve
	ns := len(md.segs)
	if md.kind != ModelTermStructure && cap(dst.StageRateDurations) < ns {
		dst.StageRateDurations = make([]float64, 0, ns)
	}
	if perStageGrowth && cap(dst.StageGrowthDurations) < ns {
		dst.StageGrowthDurations = make([]float64, 0, ns)
	}
	for i := range md.segs {
		sh.stage = i
		if md.kind != ModelTermStructure {
			d, e, ok := centralFirst(f, &sh.stageRate, h)
			if !ok {
				return fail(fmt.Sprintf("stage %d rate", i+1))
			}
			dst.StageRateDurations = append(dst.StageRateDurations, -d/v)
			dst.Errors.StageRate = math.Max(dst.Errors.StageRate, e/v)
		}
		if perStageGrowth {
			d, e, ok := centralFirst(f, &sh.stageGrowth, h)
			if !ok {
				return fail(fmt.Sprintf("stage %d growth", i+1))
			}
			dst.StageGrowthDurations = append(dst.StageGrowthDurations, d/v)
			dst.Errors.StageGrowth = math.Max(dst.Errors.StageGrowth, e/v)
		}
	}
	sh.stage = -1

	if md.kind == ModelTermStructure {
		// A level shift moves every zero yield and the long end by the same
		// amount as the parallel rate shift: the same derivative.
		dst.NSLevelDuration = dst.ModifiedDuration
		d, e, ok := centralFirst(f, &sh.slope, h)
		if !ok {
			return fail("slope")
		}
		dst.NSSlopeDuration, dst.Errors.NSSlope = -d/v, e/v
		d, e, ok = centralFirst(f, &sh.curv, h)
		if !ok {
			return fail("curvature")
		}
		dst.NSCurvatureDuration, dst.Errors.NSCurvature = -d/v, e/v
	}
	return nil
}
