package pack

import (
	"fmt"
	"math"
	"strings"

	"plumbline/risk/valuation"
)

// explanation is one security's model explanation of the week.
type explanation struct {
	e   valuation.ReturnExplanation
	err error
}

// explain explains the week's return (valuation.ExplainBetween per
// holding, valuation.ExplainPortfolio for the book) from the close of the
// last trading day on or before as-of minus 7 days, with the assumptions
// and market of that day, to the as-of date. A beta the assumptions do
// not give is the as-of estimate on both dates, so Δk moves with rf, ERP
// and the assumptions only. Actual is the realised total return over the
// same closes: Π(1 + r_t) − 1 per holding, the week's TWR for the book.
func (r *run) explain() {
	d, doc := r.d, r.doc
	if r.weekBase < 0 {
		return
	}
	day0 := d.cal[r.weekBase]
	from := dayString(day0)
	mkt0, _, err := r.marketAt(day0)
	if err != nil {
		r.finding("explain_unavailable", "", 1, "no return explanation: %v", err)
		return
	}
	cache := map[string]explanation{}
	explainOf := func(id string) explanation {
		if x, ok := cache[id]; ok {
			return x
		}
		var x explanation
		a0, _, _, ok0 := r.assumptionsAt(id, day0)
		a1, _, _, ok1 := r.assumptionsAt(id, d.asOf)
		if !ok0 || !ok1 {
			x.err = fmt.Errorf("no valuation assumptions in effect on %s and %s", from, doc.AsOf)
		} else {
			x.e, _, x.err = valuation.ExplainBetween(a0, mkt0, a1, r.mkt, r.opt)
		}
		cache[id] = x
		return x
	}
	end := d.last()
	for i := range doc.Holdings {
		h := &doc.Holdings[i]
		x := explainOf(h.ID)
		if x.err != nil {
			continue
		}
		ex := &Explain{From: from, To: doc.AsOf, DeltaK: x.e.DK, DeltaG: x.e.DG, Taylor: x.e.Taylor, Full: x.e.Revaluation, Residual: x.e.Unexplained}
		if ps := d.prices[h.ID]; ps.first <= r.weekBase {
			g := 1.0
			for _, v := range d.calReturns(ps)[r.weekBase+1 : end+1] {
				if !math.IsNaN(v) {
					g *= 1 + v
				}
			}
			ex.Actual = ptr(g - 1)
		}
		h.Explain = ex
	}
	b0, ok := d.bookAt(day0)
	if !ok {
		return
	}
	ps := []valuation.ExplainPosition{{ID: "CASH", MarketValue: b0.cash, Cash: true}}
	for _, p := range b0.lines {
		x := explainOf(p.id)
		if p.priceDay < 0 && x.err == nil {
			x.err = fmt.Errorf("no close on or before %s", from)
		}
		sector := ""
		if s := d.secs[p.id]; s != nil {
			sector = s.Sector
		}
		ps = append(ps, valuation.ExplainPosition{ID: p.id, Sector: sector, MarketValue: p.value, Explanation: x.e, Err: x.err})
	}
	pe, err := valuation.ExplainPortfolio(ps)
	if err != nil {
		r.finding("explain_unavailable", "", 1, "no portfolio return explanation: %v", err)
		return
	}
	if len(pe.Excluded) > 0 {
		ids := make([]string, len(pe.Excluded))
		var share float64
		for i, e := range pe.Excluded {
			ids[i] = e.ID
			share += e.Share
		}
		r.finding("explain_partial", "", share, "left out of the week's return explanation (share of the %s value): %s", from, strings.Join(ids, ", "))
	}
	dk, dg := meanMoves(ps)
	doc.Explain = &Explain{From: from, To: doc.AsOf, DeltaK: dk, DeltaG: dg, Taylor: pe.Taylor, Full: pe.Revaluation, Residual: pe.Unexplained, Actual: doc.Summary.Returns.Week}
}

// meanMoves returns the value-weighted averages of Δk and Δg over the
// holdings valuation.ExplainPortfolio includes (cash, holdings with an
// error and negative values left out), weighted by their values at the
// first date:
//
//	Δk_p = Σ_i MV_i·Δk_i / Σ_i MV_i,   Δg_p likewise
//
// Both are zero when no holding is included.
func meanMoves(ps []valuation.ExplainPosition) (dk, dg float64) {
	var mv float64
	for _, p := range ps {
		if p.Cash || p.Err != nil || p.MarketValue < 0 {
			continue
		}
		mv += p.MarketValue
		dk += p.MarketValue * p.Explanation.DK
		dg += p.MarketValue * p.Explanation.DG
	}
	if !(mv > 0) {
		return 0, 0
	}
	return dk / mv, dg / mv
}
