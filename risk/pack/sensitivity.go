package pack

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"plumbline/risk/valuation"
)

// valued is one holding's valuation on the as-of date.
type valued struct {
	err     error // why the holding has no model measures; nil when valued
	a       valuation.Assumptions
	s       valuation.Sensitivities
	beta    float64 // the beta used (assumption or estimate); 0 when !hasBeta
	hasBeta bool
	// Nelson-Siegel factor durations −(1/V)·dV/dfactor: the model's own for
	// the term-structure model; for the others rf is the curve's yield at
	// the risk-free tenor, so dk/dL = 1, dk/dS = l1(τ), dk/dC = l2(τ) and
	// the durations are D·(1, l1, l2).
	level, slope, curv float64
	hasNS              bool
}

// modelName maps a valuation model to the Document's name.
func modelName(k valuation.ModelKind) string {
	switch k {
	case valuation.ModelConstantGrowth:
		return "constant_growth"
	case valuation.ModelMultiStage:
		return "multi_stage"
	case valuation.ModelTermStructure:
		return "term_structure"
	}
	return k.String()
}

// toValuation converts stored assumptions. The stub fraction is not
// stored, so every valuation takes a dividend as just paid (stub 0).
func toValuation(a Assumption) valuation.Assumptions {
	va := valuation.Assumptions{
		D0:           a.AnnualDividend,
		Frequency:    a.Frequency,
		Growth:       a.Growth,
		Beta:         a.Beta,
		DiscountRate: a.DiscountRate,
	}
	for _, s := range a.Stages {
		va.Stages = append(va.Stages, valuation.Stage{Years: s.Years, Growth: s.Growth, Rate: s.Rate})
	}
	return va
}

// assumptionsAt returns the valuation assumptions of id on day with the
// beta filled in (the estimate where the assumptions give none), and
// where the beta came from ("" when there is none).
func (r *run) assumptionsAt(id string, day int64) (va valuation.Assumptions, source string, betaErr error, ok bool) {
	a, ok := r.d.assumptionAt(id, day)
	if !ok {
		return va, "", nil, false
	}
	va = toValuation(a)
	if va.Beta != nil {
		return va, "assumption", nil, true
	}
	be := r.betaOf(id)
	if be.err != nil {
		return va, "", be.err, true
	}
	b := be.reg.Slope
	va.Beta = &b
	return va, "estimated", nil, true
}

// valuation values every holding on the as-of date (valuation.Analyzer),
// aggregates them with cash (valuation.Aggregate) into the Summary and
// the per-holding and per-sector contributions. A holding whose
// valuation fails is excluded with the error as reason and its value
// share; it has no model figure and takes no part in the aggregates.
func (r *run) valuation() {
	doc := r.doc
	asOf := dayString(r.d.asOf)
	r.vals = make([]valued, len(doc.Holdings))
	positions := make([]valuation.Position, 0, len(doc.Holdings)+1)
	positions = append(positions, valuation.Position{ID: "CASH", Sector: valuation.CashSector, MarketValue: r.book.cash, Cash: true})
	var z valuation.Analyzer
	var noBeta []string
	for i := range doc.Holdings {
		h, v := &doc.Holdings[i], &r.vals[i]
		va, source, betaErr, ok := r.assumptionsAt(h.ID, r.d.asOf)
		switch {
		case !ok:
			v.err = fmt.Errorf("no valuation assumptions in effect on %s", asOf)
			r.finding("no_assumptions", h.ID, h.Weight, "no valuation assumptions in effect on %s; left out of model measures", asOf)
			// A beta still passes market moves to it in stress tests.
			if be := r.betaOf(h.ID); be.err == nil {
				v.beta, v.hasBeta = be.reg.Slope, true
				h.Beta, h.BetaSource = ptr(v.beta), "estimated"
			}
		default:
			v.a = va
			h.D0 = ptr(va.D0)
			if va.Beta != nil {
				v.beta, v.hasBeta = *va.Beta, true
				h.Beta, h.BetaSource = ptr(v.beta), source
			} else {
				noBeta = append(noBeta, h.ID)
			}
			var s valuation.Sensitivities
			if err := z.Analyze(&s, va, r.mkt, r.opt); err != nil {
				if errors.Is(err, valuation.ErrMissingBeta) && betaErr != nil {
					err = fmt.Errorf("%w; estimating it failed: %w", err, betaErr)
				}
				v.err = err
				break
			}
			v.s = s
			r.models[modelName(s.Model)]++
			h.Model = modelName(s.Model)
			h.K, h.G, h.ModelValue = ptr(s.K), ptr(s.G), ptr(s.Value)
			h.ModDuration, h.MacDuration, h.Convexity = ptr(s.ModifiedDuration), ptr(s.MacaulayDuration), ptr(s.Convexity)
			h.GrowthDur, h.GrowthConv = ptr(s.GrowthDuration), ptr(s.GrowthConvexity)
			if s.Numerical {
				h.NumericalError = ptr(s.Errors.ModifiedDuration)
			}
			switch {
			case s.Model == valuation.ModelTermStructure:
				v.level, v.slope, v.curv, v.hasNS = s.NSLevelDuration, s.NSSlopeDuration, s.NSCurvatureDuration, true
			case r.mkt.Curve != nil:
				d := s.ModifiedDuration
				v.level, v.slope, v.curv, v.hasNS = d, d*r.rfL1, d*r.rfL2, true
			}
			if v.hasNS {
				h.LevelDur, h.SlopeDur, h.CurveDur = ptr(v.level), ptr(v.slope), ptr(v.curv)
			}
		}
		if v.err != nil {
			doc.Excluded = append(doc.Excluded, Exclusion{ID: h.ID, Reason: v.err.Error(), ValueShare: h.Weight})
		}
		positions = append(positions, valuation.Position{ID: h.ID, Sector: h.Sector, MarketValue: h.Value, Sensitivities: v.s, Err: v.err})
	}
	if len(noBeta) > 0 {
		r.finding("beta_unavailable", "", r.share(noBeta), "no beta given and none could be estimated, so left out of the portfolio beta and of market moves: %s", strings.Join(noBeta, ", "))
	}
	agg, err := valuation.Aggregate(positions)
	if err != nil {
		r.finding("no_model_measures", "", 0, "no rate or growth sensitivity could be aggregated: %v", err)
		return
	}
	r.summarise(agg)
}

// summarise copies the aggregate into the Summary, the holdings and the
// sectors. Contributions are w_i·X_i with w_i the holding's share of the
// included value (valued holdings plus cash), so they sum to the
// portfolio figure.
func (r *run) summarise(agg valuation.PortfolioSensitivities) {
	doc := r.doc
	s := &doc.Summary
	s.ModifiedDuration, s.MacaulayDuration, s.Convexity = ptr(agg.ModifiedDuration), ptr(agg.MacaulayDuration), ptr(agg.Convexity)
	s.DollarDuration01 = ptr(agg.DollarDuration)
	s.GrowthDuration, s.GrowthConvexity = ptr(agg.GrowthDuration), ptr(agg.GrowthConvexity)
	if agg.BetaCoverage > 0 {
		s.Beta = ptr(agg.Beta)
	}
	contrib := make(map[string]valuation.HoldingContribution, len(agg.Holdings))
	for _, c := range agg.Holdings {
		if !c.Cash {
			contrib[c.ID] = c
		}
	}
	var lvl, slp, crv float64
	hasNS := false
	for i := range doc.Holdings {
		h, v := &doc.Holdings[i], &r.vals[i]
		c, ok := contrib[h.ID]
		if !ok {
			continue
		}
		h.ContribDuration, h.ContribGrowthDuration = ptr(c.ModifiedDuration), ptr(c.GrowthDuration)
		if v.hasNS {
			hasNS = true
			lvl += c.Weight * v.level
			slp += c.Weight * v.slope
			crv += c.Weight * v.curv
		}
	}
	if hasNS {
		s.LevelDuration, s.SlopeDuration, s.CurvatureDuration = ptr(lvl), ptr(slp), ptr(crv)
	}
	// Sector contributions are Aggregate's sums of the holdings'
	// contributions, in holding order. Its CashSector holds the cash line
	// at zero duration: alone it is no sector of the Document; with
	// securities filed under the same name the cash line adds nothing.
	sectors := make(map[string]*valuation.SectorContribution, len(agg.Sectors))
	for i := range agg.Sectors {
		sc := &agg.Sectors[i]
		if sc.Sector == valuation.CashSector && sc.Holdings == 1 {
			continue
		}
		sectors[sc.Sector] = sc
	}
	for i := range doc.Sectors {
		if sc := sectors[doc.Sectors[i].Name]; sc != nil {
			doc.Sectors[i].ContribDuration, doc.Sectors[i].ContribGrowthDuration = ptr(sc.ModifiedDuration), ptr(sc.GrowthDuration)
		}
	}
}

// share is the summed weight of the listed holdings.
func (r *run) share(ids []string) float64 {
	set := make(map[string]bool, len(ids))
	for _, id := range ids {
		set[id] = true
	}
	var w float64
	for _, h := range r.doc.Holdings {
		if set[h.ID] {
			w += h.Weight
		}
	}
	return w
}

// sortedKeys returns a map's keys in order.
func sortedKeys[V any](m map[string]V) []string {
	k := make([]string, 0, len(m))
	for x := range m {
		k = append(k, x)
	}
	sort.Strings(k)
	return k
}
