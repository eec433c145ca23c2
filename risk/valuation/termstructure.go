package valuation

import (
	"fmt"
	"math"

	"plumbline/risk/curve"
)

// TermStructure is the term-structure dividend model. Dividends are
// discounted on a Nelson–Siegel zero curve y(·) (tenor in months, annually
// compounded) plus an equity spread s = β·ERP:
//
//	V = Σ_{t_j ≤ H} (D0/m)·G(τ_j)·(1 + y(12·t_j) + s)^{−t_j}  +  TV
//
// with payment j at τ_j = j/m on the payment clock and t_j = τ_j − stub years
// from the valuation date. The growth index G is
//   - (1 + γ(12τ))^τ when a growth curve γ (Nelson–Siegel shape, decimal
//     average annual growth over the first τ years) is given;
//   - otherwise the stage path Π_i (1+g_i)^{τ_i} of Stages then G
//     (stage discount rates are not used: the curve replaces them).
//
// The explicit horizon H (years) is followed by a constant-growth terminal
// value TV: beyond H dividends grow at the long-run growth g∞ (the growth
// curve's Level, or G) and are discounted at the forward rate k∞ = Level + s,
// the limit of both the zero and the forward Nelson–Siegel curves. It
// requires k∞ > g∞. H defaults to 30 years, and is extended to cover every
// finite stage plus one year.
type TermStructure struct {
	D0           float64
	Frequency    int
	StubFraction float64
	Curve        curve.NelsonSiegel
	Spread       float64 // equity spread over the curve, decimal (β·ERP)
	G            float64 // long-run growth when GrowthCurve is nil
	Stages       []Stage // growth path before G; Rate is ignored
	GrowthCurve  *curve.NelsonSiegel
	Horizon      float64 // years; 0 means 30
}

// Value returns the model value per share.
func (ts TermStructure) Value() (float64, error) {
	var md model
	h := ts.Horizon
	if h == 0 {
		h = 30
	}
	if err := md.buildCurve(ts.D0, ts.Frequency, ts.StubFraction, ts.Stages, ts.G, ts.GrowthCurve, ts.Curve, ts.Spread, h, false); err != nil {
		return 0, err
	}
	sh := shifts{stage: -1}
	return md.value(&sh), nil
}

// payment is one explicit payment of the term-structure model.
type payment struct {
	tau, t float64 // payment clock and time from the valuation date, years
	l1, l2 float64 // discount-curve loadings at 12·t months
	g1, g2 float64 // growth-curve loadings at 12·τ months
	seg    int     // growth segment holding τ
}

func (md *model) buildCurve(d0 float64, freq int, stubFrac float64, stages []Stage, g float64, gc *curve.NelsonSiegel,
	c curve.NelsonSiegel, spread, horizon float64, d1Fixed bool) error {
	if err := md.setCommon(d0, freq, stubFrac, d1Fixed); err != nil {
		return err
	}
	if err := c.Validate(); err != nil {
		return fmt.Errorf("%w: %w", ErrCurve, err)
	}
	if !finite(spread) {
		return inputErr("equity spread", spread, ErrNotFinite)
	}
	if !finite(horizon) {
		return inputErr("horizon", horizon, ErrNotFinite)
	}
	if horizon < 1 {
		return inputErr("horizon", horizon, ErrHorizon)
	}
	if !finite(g) {
		return inputErr("growth", g, ErrNotFinite)
	}
	if g <= -1 {
		return inputErr("growth", g, ErrGrowthOutOfRange)
	}
	start := 0.0
	for i, st := range stages {
		if !finite(st.Years) {
			return inputErr(fmt.Sprintf("stage %d years", i+1), st.Years, ErrNotFinite)
		}
		if st.Years <= 0 {
			return inputErr(fmt.Sprintf("stage %d years", i+1), st.Years, ErrStageLength)
		}
		if !finite(st.Growth) {
			return inputErr(fmt.Sprintf("stage %d growth", i+1), st.Growth, ErrNotFinite)
		}
		if st.Growth <= -1 {
			return inputErr(fmt.Sprintf("stage %d growth", i+1), st.Growth, ErrGrowthOutOfRange)
		}
		md.addSegment(start, st.Years, st.Growth, 0, false)
		start += st.Years
	}
	md.addSegment(start, -1, g, 0, false)
	horizon = math.Max(horizon, start+1)

	md.kind = ModelTermStructure
	md.curve, md.spread = c, spread
	md.linked = true // the spread moves with β and ERP, the curve level with rf
	md.k = c.Level + spread
	md.g = g
	if gc != nil {
		if err := gc.Validate(); err != nil {
			return fmt.Errorf("%w: growth curve: %w", ErrCurve, err)
		}
		md.gcurve, md.hasGCurve = *gc, true
		md.g = gc.Level
		if md.g <= -1 {
			return inputErr("growth curve level", md.g, ErrGrowthOutOfRange)
		}
	}
	if md.k <= 0 {
		return inputErr("long-end discount rate", md.k, ErrRateOutOfRange)
	}
	if md.k <= md.g {
		return inputErr("long-end k - g", md.k-md.g, ErrGrowthNotBelowRate)
	}

	last := int(math.Floor((horizon+md.stub)*md.m + payTol))
	md.pays = md.pays[:0]
	md.margin = math.Inf(1)
	seg := 0
	for j := 1; j <= last; j++ {
		p := payment{tau: float64(j) / md.m}
		p.t = p.tau - md.stub
		p.l1, p.l2 = curve.Loadings(c.Lambda, 12*p.t)
		y := c.Level + c.Slope*p.l1 + c.Curvature*p.l2 + spread
		if y <= -1 {
			return inputErr(fmt.Sprintf("zero yield plus spread at %.4g years", p.t), y, ErrRateOutOfRange)
		}
		md.margin = math.Min(md.margin, 1+y)
		if md.hasGCurve {
			p.g1, p.g2 = curve.Loadings(md.gcurve.Lambda, 12*p.tau)
			if gm := md.gcurve.Level + md.gcurve.Slope*p.g1 + md.gcurve.Curvature*p.g2; gm <= -1 {
				return inputErr(fmt.Sprintf("growth curve at %.4g years", p.tau), gm, ErrGrowthOutOfRange)
			}
		}
		for seg < len(md.segs)-1 && p.tau > md.segs[seg].end+payTol/md.m {
			seg++
		}
		p.seg = seg
		md.pays = append(md.pays, p)
	}
	var sh shifts
	sh.stage = -1
	md.lnG1 = md.logGrowthOneYear(&sh)
	return nil
}

// logGrowthOneYear returns log G(1) under the shifts, after the segments'
// lgCur have been set (or computing them for the growth curve case).
func (md *model) logGrowthOneYear(sh *shifts) float64 {
	if md.hasGCurve {
		l1, l2 := curve.Loadings(md.gcurve.Lambda, 12)
		return math.Log1p(md.gcurve.Level + sh.growth + md.gcurve.Slope*l1 + md.gcurve.Curvature*l2)
	}
	var s float64
	for i := range md.segs {
		dg := sh.growth
		if i == sh.stage {
			dg += sh.stageGrowth
		}
		s += md.segs[i].ov1 * math.Log1p(md.segs[i].g+dg)
	}
	return s
}

// valueCurve evaluates the term-structure model payment by payment (the
// curve changes every discount factor, so there is no geometric shortcut
// before the horizon).
func (md *model) valueCurve(sh *shifts) float64 {
	c := &md.curve
	b0 := c.Level + md.spread + sh.rate + sh.linked + sh.level
	b1 := c.Slope + sh.slope
	b2 := c.Curvature + sh.curv
	gc := &md.gcurve
	c0 := gc.Level + sh.growth

	var gInf float64
	if md.hasGCurve {
		gInf = c0
	} else {
		cum := 0.0
		for i := range md.segs {
			s := &md.segs[i]
			dg := sh.growth
			if i == sh.stage {
				dg += sh.stageGrowth
			}
			s.lgCur = s.lg
			if dg != 0 {
				s.lgCur = math.Log1p(s.g + dg)
			}
			s.cum = cum
			cum += (s.end - s.start) * s.lgCur
		}
		gInf = md.segs[len(md.segs)-1].g + sh.growth
		if sh.stage == len(md.segs)-1 {
			gInf += sh.stageGrowth
		}
	}

	var pv, lgr, ldf float64
	for j := range md.pays {
		p := &md.pays[j]
		ldf = -p.t * (math.Log1p(b0+b1*p.l1+b2*p.l2) + sh.cts)
		if md.hasGCurve {
			lgr = p.tau * math.Log1p(c0+gc.Slope*p.g1+gc.Curvature*p.g2)
		} else {
			s := &md.segs[p.seg]
			lgr = s.cum + (p.tau-s.start)*s.lgCur
		}
		pv += math.Exp(lgr + ldf)
	}
	// Terminal value: each later payment multiplies the last one by
	// q = ((1+g∞)/(1+k∞))^{1/m}·e^{−cts/m}.
	lq := (math.Log1p(gInf) - math.Log1p(b0) - sh.cts) / md.m
	if lq >= 0 {
		return math.NaN()
	}
	pv += math.Exp(lgr+ldf+lq) / -math.Expm1(lq)

	lnG1 := md.lnG1
	if md.d1Fixed && (sh.growth != 0 || sh.stageGrowth != 0) {
		lnG1 = md.logGrowthOneYear(sh)
	}
	return md.d0 / md.m * pv * md.d1Adjust(lnG1)
}
