package pack

import (
	"fmt"
	"sort"
	"strings"

	"plumbline/risk/stress"
	"plumbline/risk/valuation"
)

// stressPositions maps the holdings to stress positions.
//
// A valued holding carries its sensitivities (DurK = modified duration,
// ConvK = convexity, DurG, ConvG, CrossKG, and the Nelson-Siegel factor
// durations) and a Revalue closure that revalues it with
// valuation.Revalue under
//
//	Rate   = Δk = stress.Shock.DeltaK(β, ERP)  (+ ΔL + l1·ΔS + l2·ΔC, see below)
//	Growth = Δg = stress.Shock.DeltaG(sector)
//
// so full revaluation and the Taylor estimate see the same Δk and Δg. An
// explicit discount rate is read as rf-linked: the shock's Δk (rates,
// premium and beta parts alike) is added to it, as to a CAPM rate.
// Curve shocks reach the term-structure model through its curve
// (NSLevel, NSSlope, NSCurvature); for the other models rf is the curve's
// yield at the risk-free tenor τ, so a factor shock moves k by
// ΔL + l1(τ)·ΔS + l2(τ)·ΔC, matching the factor durations D·(1, l1, l2).
//
// A holding excluded from the valuation is a position whose Revalue
// returns the exclusion reason: it is listed as failed in every scenario
// with a model part, and moves with the market through its beta (when
// known) in a pure market move. Cash has a nil Revalue.
func (r *run) stressPositions() []stress.Position {
	doc := r.doc
	out := make([]stress.Position, 0, len(doc.Holdings)+1)
	var z valuation.Analyzer // the closures run one at a time
	for i := range doc.Holdings {
		h, v := &doc.Holdings[i], &r.vals[i]
		pos := stress.Position{ID: h.ID, Name: h.Name, Sector: h.Sector, Value: h.Value, Beta: v.beta}
		s := v.s
		sens := stress.Sensitivities{
			DurK: s.ModifiedDuration, ConvK: s.Convexity,
			DurG: s.GrowthDuration, ConvG: s.GrowthConvexity, CrossKG: s.CrossKG,
			DurLevel: v.level, DurSlope: v.slope, DurCurvature: v.curv,
		}
		err := v.err
		if err == nil && !finiteSens(sens) {
			err = fmt.Errorf("sensitivities are not finite numbers")
		}
		if err != nil {
			e := err
			pos.Revalue = func(stress.Shock) (float64, error) { return 0, e }
			out = append(out, pos)
			continue
		}
		a, mkt, opt := v.a, r.mkt, r.opt
		pos.K, pos.G, pos.Sens = s.K, s.G, sens
		ts := s.Model == valuation.ModelTermStructure
		ns := v.hasNS && !ts
		l1, l2, beta, sector, v0 := r.rfL1, r.rfL2, v.beta, h.Sector, s.Value
		pos.Revalue = func(sh stress.Shock) (float64, error) {
			x := valuation.Shock{Rate: sh.DeltaK(beta, mkt.ERP), Growth: sh.DeltaG(sector)}
			dl, ds, dc := sh.DeltaNS()
			switch {
			case ts:
				x.NSLevel, x.NSSlope, x.NSCurvature = dl, ds, dc
			case ns:
				x.Rate += dl + l1*ds + l2*dc
			}
			v1, err := z.Revalue(a, mkt, opt, x)
			if err != nil {
				return 0, err
			}
			return v1 / v0, nil
		}
		out = append(out, pos)
	}
	return append(out, stress.Position{ID: "CASH", Name: "Cash", Sector: valuation.CashSector, Value: r.book.cash})
}

// stressing runs the scenarios (stress.Run) and the historical replays.
func (r *run) stressing() {
	positions := r.stressPositions()
	if len(r.p.Scenarios) > 0 {
		res, err := stress.Run(positions, r.p.Scenarios, r.mkt.ERP)
		if err != nil {
			r.finding("stress_unavailable", "", 1, "stress scenarios: %v", err)
		}
		for _, x := range res {
			sr := StressResult{
				Name: x.Scenario.Name, Description: x.Scenario.Description,
				PnL: x.PnL, PnLPct: x.PnLPct,
				Taylor: ptr(x.TaylorPnL), TaylorPct: ptr(x.TaylorPct), Error: ptr(x.Error),
				Top: contributors(x.Top, true),
			}
			failed := map[string]bool{}
			for _, f := range x.Failed {
				failed[f.ID] = true
				sr.Failed = append(sr.Failed, Exclusion{ID: f.ID, Reason: f.Reason, ValueShare: r.weight(f.ID)})
			}
			if x.Scenario.Shock.MarketMove != 0 {
				for i, h := range r.doc.Holdings {
					if !r.vals[i].hasBeta && !failed[h.ID] {
						sr.Failed = append(sr.Failed, Exclusion{ID: h.ID, Reason: "no beta: the market move is not applied to this holding", ValueShare: h.Weight})
					}
				}
			}
			r.doc.Stress = append(r.doc.Stress, sr)
		}
	}
	r.replays(positions)
}

func finiteSens(s stress.Sensitivities) bool {
	for _, x := range []float64{s.DurK, s.ConvK, s.DurG, s.ConvG, s.CrossKG, s.DurLevel, s.DurSlope, s.DurCurvature} {
		if !finite(x) {
			return false
		}
	}
	return true
}

func contributors(hs []stress.HoldingPnL, taylor bool) []Contributor {
	out := make([]Contributor, len(hs))
	for i, h := range hs {
		out[i] = Contributor{ID: h.ID, Sector: h.Sector, PnL: h.PnL, Pct: h.Pct}
		if taylor {
			out[i].Taylor = ptr(h.Taylor)
		}
	}
	return out
}

// WorstWindowName is the name of the worst-window replay of a run whose
// worst window is days trading days long, "worst 10-day window". It
// shares the scenario scope of Metrics with the stress scenarios and the
// named replays, so none of them may take it (Params.Validate).
func WorstWindowName(days int) string { return fmt.Sprintf("worst %d-day window", days) }

// replays replays history on the current holdings: the worst
// WorstWindowDays-day window of the stored calendar (stress.WorstWindow)
// and each named window (stress.Replay), with every holding's daily total
// returns aligned on the trading calendar, a day without a close counting
// as a zero return. A named window not inside the stored history is a
// finding.
func (r *run) replays(positions []stress.Position) {
	d := r.d
	n := len(d.cal) - 1 // days with a return: calendar 1..n
	if n < 1 {
		r.finding("replay_unavailable", "", 1, "fewer than two trading days stored: no historical replay")
		return
	}
	rows := make([][]float64, len(positions))
	for i, h := range r.doc.Holdings {
		rows[i] = d.calReturns(d.prices[h.ID])[1:]
	}
	add := func(name, desc string, rr stress.ReplayResult) StressResult {
		sr := StressResult{
			Name: name, Description: desc,
			From: dayString(d.cal[rr.Start+1]), To: dayString(d.cal[rr.End+1]),
			PnL: rr.PnL, PnLPct: rr.PnLPct, Top: contributors(rr.Top, false),
		}
		if len(rr.Missing) > 0 {
			ids := make([]string, len(rr.Missing))
			for i, m := range rr.Missing {
				ids[i] = fmt.Sprintf("%s (%d days)", m.ID, m.Days)
			}
			sort.Strings(ids)
			miss := make([]string, len(rr.Missing))
			for i, m := range rr.Missing {
				miss[i] = m.ID
			}
			r.finding("replay_missing_returns", "", r.share(miss), "%s: days without a return, held flat: %s", name, strings.Join(ids, ", "))
		}
		r.doc.Replays = append(r.doc.Replays, sr)
		return sr
	}
	if w := r.p.WorstWindowDays; w > n {
		r.finding("replay_outside_history", "", 1, "the worst %d-day window needs more than the %d days of returns stored", w, n)
	} else if rr, err := stress.WorstWindow(positions, rows, w); err != nil {
		r.finding("replay_unavailable", "", 1, "worst window: %v", err)
	} else {
		sr := add(WorstWindowName(w), fmt.Sprintf("the %d consecutive trading days of stored history that lose most on the current holdings", w), rr)
		r.worstLoss = ptr(-sr.PnLPct)
	}
	for _, nw := range r.p.Replays {
		from, to := dayOf(nw.From), dayOf(nw.To)
		start, end := d.floorIdx(from-1)+1, d.floorIdx(to)
		if from < d.cal[1] || to > d.asOf || start > end {
			r.finding("replay_outside_history", "", 0, "replay %q (%s to %s) is not inside the stored history of returns (%s to %s)", nw.Name, dayString(from), dayString(to), dayString(d.cal[1]), dayString(d.cal[n]))
			continue
		}
		rr, err := stress.Replay(positions, rows, start-1, end-1)
		if err != nil {
			r.finding("replay_unavailable", "", 1, "replay %q: %v", nw.Name, err)
			continue
		}
		add(nw.Name, fmt.Sprintf("price moves of %s to %s replayed on the current holdings", dayString(from), dayString(to)), rr)
	}
}
