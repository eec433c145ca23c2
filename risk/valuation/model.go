package valuation

import (
	"math"

	"plumbline/risk/curve"
)

// model is the evaluator shared by every dividend model.
//
// Cash flows run on a payment clock τ (years) that starts at the last
// dividend payment: payment j ≥ 1 falls at τ_j = j/m and pays
// (D0/m)·G(τ_j), where G is the dividend growth index (G(0) = 1). The
// valuation date is at τ = stub = StubFraction/m, so payment j is
// t_j = τ_j − stub years away.
type model struct {
	kind    ModelKind
	d0      float64 // trailing annual dividend per share
	m       float64 // payments per year
	stub    float64 // years elapsed since the last payment
	d1Fixed bool

	// Stage models: finite stages then the terminal stage (n < 0). The
	// term-structure model uses segs for its growth path only.
	segs []segment
	lnG1 float64 // log G(1) at zero shifts, for the D1-fixed convention

	k, g         float64 // terminal discount rate and growth (term structure: long end)
	beta, erp    float64
	hasBeta      bool
	linked       bool // k is the CAPM rate and moves with rf, β and ERP
	explicitRate bool // some stage has its own rate (not linked)

	// Term-structure model.
	curve     curve.NelsonSiegel
	spread    float64
	gcurve    curve.NelsonSiegel
	hasGCurve bool
	pays      []payment
	margin    float64 // smallest 1 + y(t) + spread over the payments
}

// segment is one stage on the payment clock, covering (start, end].
type segment struct {
	start, end float64
	g, k       float64
	lg, lk     float64 // log1p(g), log1p(k)
	linked     bool
	first      float64 // τ of the first payment in the segment minus start
	n          int     // payments in the segment; −1 = unbounded (terminal)
	ov1        float64 // overlap of the segment with the first year (0, 1]
	// evaluation scratch for the term-structure growth path
	lgCur, cum float64
}

// shifts are the additive perturbations an evaluation applies.
type shifts struct {
	rate        float64 // every discount rate (term structure: every zero yield)
	linked      float64 // CAPM-linked rates only
	growth      float64 // every growth rate (term structure: the growth curve level too)
	stage       int     // segment receiving stageRate and stageGrowth; −1 = none
	stageRate   float64
	stageGrowth float64
	cts         float64 // continuously compounded yield shift; −∂/∂cts gives Macaulay duration
	level       float64 // Nelson–Siegel factor shifts of the discount curve
	slope       float64
	curv        float64
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// payTol absorbs rounding when a stage boundary falls on a payment date.
const payTol = 1e-9

// setCommon validates and stores the inputs every model shares.
func (md *model) setCommon(d0 float64, freq int, stubFrac float64, d1Fixed bool) error {
	if !finite(d0) {
		return inputErr("dividend D0", d0, ErrNotFinite)
	}
	if d0 < 0 {
		return inputErr("dividend D0", d0, ErrNegativeDividend)
	}
	if d0 == 0 {
		return inputErr("dividend D0", d0, ErrNoDividend)
	}
	switch freq {
	case 0:
		freq = 1
	case 1, 2, 4, 12:
	default:
		return inputErr("frequency", float64(freq), ErrFrequency)
	}
	if !finite(stubFrac) {
		return inputErr("stub fraction", stubFrac, ErrNotFinite)
	}
	if stubFrac < 0 || stubFrac >= 1 {
		return inputErr("stub fraction", stubFrac, ErrStubFraction)
	}
	md.d0, md.m, md.stub, md.d1Fixed = d0, float64(freq), stubFrac/float64(freq), d1Fixed
	md.segs = md.segs[:0]
	md.explicitRate = false
	md.hasGCurve = false
	md.spread = 0
	return nil
}

// addSegment appends the stage (start, start+years] (years < 0: terminal).
func (md *model) addSegment(start, years, g, k float64, linked bool) {
	s := segment{start: start, g: g, k: k, lg: math.Log1p(g), lk: math.Log1p(k), linked: linked}
	j0 := math.Floor(start*md.m+payTol) + 1
	s.first = j0/md.m - start
	if years < 0 {
		s.end = math.Inf(1)
		s.n = -1
		s.ov1 = math.Max(0, 1-start)
	} else {
		s.end = start + years
		j1 := math.Floor(s.end*md.m + payTol)
		s.n = max(0, int(j1-j0+1))
		s.ov1 = math.Max(0, math.Min(s.end, 1)-math.Min(start, 1))
	}
	md.segs = append(md.segs, s)
}

// value returns the model value per share under the shifts.
func (md *model) value(sh *shifts) float64 {
	if md.kind == ModelTermStructure {
		return md.valueCurve(sh)
	}
	return md.valueStages(sh)
}

// geometric returns Σ_{i=0}^{n−1} e^{i·lq} = expm1(n·lq)/expm1(lq), stable
// near lq = 0.
func geometric(n int, lq float64) float64 {
	if lq == 0 {
		return float64(n)
	}
	return math.Expm1(float64(n)*lq) / math.Expm1(lq)
}

// d1Adjust returns the factor that restores D1 when growth shifts move G(1).
func (md *model) d1Adjust(lnG1 float64) float64 {
	if !md.d1Fixed || lnG1 == md.lnG1 {
		return 1
	}
	return math.Exp(md.lnG1 - lnG1)
}
