package pack

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"plumbline/risk/limits"
)

// fxSingle is the fixture reduced to a book of 1,000 ALDR and no cash,
// with ALDR's dividend removed so that no cash ever appears.
func fxSingle() *Inputs {
	in := fxInputs()
	in.Snapshots = []Snapshot{{AsOf: fxStart, Lines: []Line{{SecurityID: "ALDR", Quantity: 1000}}}}
	in.Flows = nil
	for i := range in.Prices {
		if in.Prices[i].SecurityID == "ALDR" {
			clear(in.Prices[i].Dividend)
		}
	}
	return in
}

func mustCompute(t *testing.T, in *Inputs, p Params) *Document {
	t.Helper()
	doc, err := Compute(in, p)
	if err != nil {
		t.Fatalf("Compute: %v", err)
	}
	return doc
}

func holding(t *testing.T, doc *Document, id string) *Holding {
	t.Helper()
	for i := range doc.Holdings {
		if doc.Holdings[i].ID == id {
			return &doc.Holdings[i]
		}
	}
	t.Fatalf("no holding %s", id)
	return nil
}

func relClose(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// fxK is the CAPM rate k = rf + β·ERP of the fixture on the as-of date.
func fxK(beta float64) float64 {
	t := fxIndex(fxAsOf)
	return fxYield(t, 120) + beta*fxPremium(t)
}

// A book of one constant-growth holding and no cash has the holding's
// Gordon duration: V = D0(1+g)/(k−g) gives −(1/V)dV/dk = 1/(k−g) and a
// Macaulay duration (1+k)/(k−g) (Gordon growth model: Bodie, Kane &
// Marcus, Investments, "Equity Valuation Models", from memory; the
// Macaulay form of a growing perpetuity: Leibowitz 1986, from memory).
// A +100bp rate shock revalues it by (k−g)/(k+0.01−g) − 1 exactly.
// Closed forms against closed forms: 1e-12 relative.
func TestGordonSingleHolding(t *testing.T) {
	in := fxSingle()
	doc := mustCompute(t, in, fxParams())
	k, g := fxK(1.1), 0.03
	s := doc.Summary
	if s.ModifiedDuration == nil || !relClose(*s.ModifiedDuration, 1/(k-g), 1e-12) {
		t.Errorf("modified duration %v, want 1/(k-g) = %v", s.ModifiedDuration, 1/(k-g))
	}
	if s.MacaulayDuration == nil || !relClose(*s.MacaulayDuration, (1+k)/(k-g), 1e-12) {
		t.Errorf("Macaulay duration %v, want (1+k)/(k-g) = %v", s.MacaulayDuration, (1+k)/(k-g))
	}
	if h := holding(t, doc, "ALDR"); h.Model != "constant_growth" || h.BetaSource != "assumption" {
		t.Errorf("model %q, beta source %q", h.Model, h.BetaSource)
	}
	var found bool
	for _, x := range doc.Stress {
		if x.Name == "rates +100bp" {
			found = true
			if want := (k-g)/(k+0.01-g) - 1; !relClose(x.PnLPct, want, 1e-12) {
				t.Errorf("rates +100bp: %v, want %v", x.PnLPct, want)
			}
		}
	}
	if !found {
		t.Error("no rates +100bp result")
	}
}

// On a flat curve the term-structure model is the constant-growth model
// (payments discounted at (1 + y + β·ERP)^−t with y flat sum to Gordon's
// V = D1/(k−g), k = y + β·ERP: Bodie, Kane & Marcus, from memory), so the
// book of one holding has duration 1/(k−g) and loses (k−g)/(k+0.01−g) − 1
// for +100bp. The durations are central differences with Richardson
// extrapolation (error estimates about 1e-9 here): 1e-6 relative; the
// revaluation is a sum of 30 years of payments plus a closed-form
// terminal value: 1e-9.
func TestTermStructureOnFlatCurve(t *testing.T) {
	in := fxSingle()
	const y = 0.04
	for i := range in.Yields {
		for j := range in.Yields[i].Yields {
			in.Yields[i].Yields[j] = y
		}
	}
	p := fxParams()
	p.UseCurve = true
	doc := mustCompute(t, in, p)
	k, g := y+1.1*fxPremium(fxIndex(fxAsOf)), 0.03
	h := holding(t, doc, "ALDR")
	if h.Model != "term_structure" || h.ModDuration == nil || !relClose(*h.ModDuration, 1/(k-g), 1e-6) {
		t.Fatalf("model %q duration %v, want %v", h.Model, h.ModDuration, 1/(k-g))
	}
	for _, x := range doc.Stress {
		if x.Name == "rates +100bp" {
			if want := (k-g)/(k+0.01-g) - 1; !relClose(x.PnLPct, want, 1e-9) {
				t.Errorf("rates +100bp: %v, want %v", x.PnLPct, want)
			}
		}
	}
}

// The split day's total return follows the contract's convention
// r_t = s·(P_t + D_t)/P_{t−1} − 1 (a 2-for-1 split is not a −50% day):
// for a book of one security and no cash the portfolio's daily return is
// the security's. Exact arithmetic on the same numbers: 1e-12.
func TestSplitIsNotALoss(t *testing.T) {
	in := fxSingle()
	doc := mustCompute(t, in, fxParams())
	i := slices.Index(doc.Series.Dates, fxSplitDay.Format("2006-01-02"))
	if i < 0 {
		t.Fatal("split day not in the series")
	}
	ts := fxIndex(fxSplitDay)
	pPrev := fxClose("ALDR", ts-1, fxDays()[ts-1])
	p := fxClose("ALDR", ts, fxSplitDay)
	want := fxSplit*(p+0)/pPrev - 1
	if got := doc.Series.Discrete[i]; !relClose(got, want, 1e-12) || got < -0.2 {
		t.Errorf("split-day return %v, want %v", got, want)
	}
	// With the dividend kept, the ex-day return of the one-security book
	// (no cash before it) is (P_t + D_t)/P_{t−1} − 1.
	in = fxSingle()
	in.Prices = fxInputs().Prices
	doc = mustCompute(t, in, fxParams())
	td := fxIndex(fxDivDay)
	j := slices.Index(doc.Series.Dates, fxDivDay.Format("2006-01-02"))
	want = (fxClose("ALDR", td, fxDivDay)+fxDividend)/fxClose("ALDR", td-1, fxDays()[td-1]) - 1
	if got := doc.Series.Discrete[j]; !relClose(got, want, 1e-12) {
		t.Errorf("dividend-day return %v, want %v", got, want)
	}
}

func TestHoldingsOnTheAsOfDate(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	// Weights of the securities plus the cash weight sum to one (by
	// definition of a weight; exact up to rounding, 1e-12).
	sum := doc.Concentration.CashWeight
	for _, h := range doc.Holdings {
		sum += h.Weight
	}
	if !relClose(sum, 1, 1e-12) {
		t.Errorf("weights sum to %v", sum)
	}
	// The snapshot of 2025-01-15 held 1,200 ALDR; the 2-for-1 split of
	// 2025-03-03 doubles them. Cash: 5,000 + 1,200 × 0.50 dividend + the
	// 50,000 flow (contract: dividends and flows are cash).
	if q := holding(t, doc, "ALDR").Quantity; q != 2400 {
		t.Errorf("ALDR quantity %v, want 2400", q)
	}
	if c := doc.Summary.Cash; !relClose(c, 5000+1200*fxDividend+fxFlow, 1e-12) {
		t.Errorf("cash %v", c)
	}
	// HHI = Σ w², EffectiveN = 1/HHI (Herfindahl-Hirschman index, common practice).
	var hhi float64
	for _, h := range doc.Holdings {
		hhi += h.Weight * h.Weight
	}
	if c := doc.Concentration; !relClose(c.HHI, hhi, 1e-12) || !relClose(c.EffectiveN, 1/hhi, 1e-12) {
		t.Errorf("HHI %v effective N %v, want %v", c.HHI, c.EffectiveN, hhi)
	}
}

// DUNE has no close after 2025-06-10: on Friday 2025-06-13 its price is
// three calendar days old, inside the five allowed.
func TestStalePriceFinding(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	h := holding(t, doc, "DUNE")
	if h.PriceDate != "2025-06-10" {
		t.Errorf("price date %s", h.PriceDate)
	}
	var f *Finding
	for i := range doc.DataQuality {
		if doc.DataQuality[i].Kind == "stale_price" && doc.DataQuality[i].ID == "DUNE" {
			f = &doc.DataQuality[i]
		}
	}
	if f == nil {
		t.Fatalf("no stale_price finding: %+v", doc.DataQuality)
	}
	if !strings.Contains(f.Detail, "3 days old") || f.ValueShare != h.Weight {
		t.Errorf("finding %+v, weight %v", f, h.Weight)
	}
	// Beyond the allowed age the holding is excluded, never valued at zero.
	p := fxParams()
	p.StalePriceDays = 2
	doc = mustCompute(t, fxInputs(), p)
	for _, h := range doc.Holdings {
		if h.ID == "DUNE" {
			t.Fatal("DUNE still held with a 3-day-old price and 2 days allowed")
		}
	}
	if i := slices.IndexFunc(doc.Excluded, func(e Exclusion) bool { return e.ID == "DUNE" }); i < 0 || !(doc.Excluded[i].ValueShare > 0) {
		t.Errorf("DUNE not excluded with its share: %+v", doc.Excluded)
	}
}

// CVNT's explicit discount rate 4% is below its 5% growth: the Gordon
// value is undefined (k <= g), so the holding is excluded with its value
// share and takes no part in the aggregates (valuation.Aggregate's
// convention: durations over the valued holdings and cash).
func TestKAtOrBelowGExcluded(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	cv := holding(t, doc, "CVNT")
	i := slices.IndexFunc(doc.Excluded, func(e Exclusion) bool { return e.ID == "CVNT" })
	if i < 0 {
		t.Fatalf("CVNT not excluded: %+v", doc.Excluded)
	}
	if ex := doc.Excluded[i]; ex.ValueShare != cv.Weight || !strings.Contains(ex.Reason, "k <= g") {
		t.Errorf("exclusion %+v, weight %v", ex, cv.Weight)
	}
	if cv.Model != "" || cv.ModDuration != nil || cv.ContribDuration != nil {
		t.Errorf("CVNT has model figures: %+v", cv)
	}
	// Duration over the included value (the other holdings and cash).
	var num, den float64 = 0, doc.Summary.Cash
	for _, h := range doc.Holdings {
		if h.ModDuration != nil {
			num += h.Value * *h.ModDuration
			den += h.Value
		}
	}
	if d := doc.Summary.ModifiedDuration; d == nil || !relClose(*d, num/den, 1e-12) {
		t.Errorf("duration %v, want %v", d, num/den)
	}
	// In every scenario with a model part it is listed as failed.
	for _, x := range doc.Stress {
		if x.Name == "rates +100bp" && !slices.ContainsFunc(x.Failed, func(e Exclusion) bool { return e.ID == "CVNT" }) {
			t.Errorf("CVNT not failed in %s: %+v", x.Name, x.Failed)
		}
	}
}

// BRKW: three years of 8% growth, then 2.5% for ever, annual payments, k
// by CAPM. The two-stage dividend discount model (Bodie, Kane & Marcus,
// Investments, "Equity Valuation Models", from memory):
//
//	V = Σ_{t=1..3} D0·1.08^t/(1+k)^t + D0·1.08³·1.025/((k−0.025)(1+k)³)
//
// A sum of four terms against the library's closed-form geometric sums:
// 1e-12 relative.
func TestMultiStageTwoStageModel(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	h := holding(t, doc, "BRKW")
	k, d0 := fxK(0.8), 1.5
	var want float64
	for y := 1; y <= 3; y++ {
		want += d0 * math.Pow(1.08, float64(y)) / math.Pow(1+k, float64(y))
	}
	want += d0 * math.Pow(1.08, 3) * 1.025 / (k - 0.025) / math.Pow(1+k, 3)
	if h.Model != "multi_stage" || h.ModelValue == nil || !relClose(*h.ModelValue, want, 1e-12) {
		t.Errorf("model %q value %v, want %v", h.Model, h.ModelValue, want)
	}
	if d := holding(t, doc, "DUNE"); d.BetaSource != "estimated" || d.Beta == nil {
		t.Errorf("DUNE beta %v source %q", d.Beta, d.BetaSource)
	}
}

// The week's time-weighted return from the close of Friday 2025-06-06 to
// that of 2025-06-13, computed by hand from the fixture: the value is
// V_t = Σ q_i·P_i,t + cash_t (DUNE at its last close), and the true TWR
// links (V_t − F_t)/V_{t−1} over the days (end-of-day flows). The flow is
// above 10% of value, so GIPS revalues at it and the GIPS TWR equals the
// true TWR (GIPS 2020, provision on large cash flows). Same arithmetic in
// another order: 1e-12.
func TestWeekReturnIsHandTWR(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	days := fxDays()
	value := func(d int) float64 {
		dd := days[d]
		v := 2400*fxClose("ALDR", d, dd) + 1500*fxClose("BRKW", d, dd) + 500*fxClose("CVNT", d, dd) + 5000 + 1200*fxDividend
		dune := d
		if dd.After(fxDUNELast) {
			dune = fxIndex(fxDUNELast)
		}
		v += 1000 * fxClose("DUNE", dune, days[dune])
		if !dd.Before(fxFlowDay) {
			v += fxFlow
		}
		return v
	}
	from, to := fxIndex(day("2025-06-06")), fxIndex(fxAsOf)
	g := 1.0
	for d := from + 1; d <= to; d++ {
		f := 0.0
		if days[d].Equal(fxFlowDay) {
			f = fxFlow
		}
		g *= (value(d) - f) / value(d-1)
	}
	if w := doc.Summary.Returns.Week; w == nil || !relClose(*w, g-1, 1e-12) {
		t.Errorf("week return %v, want %v", w, g-1)
	}
	if !relClose(doc.Summary.Value, value(to), 1e-12) {
		t.Errorf("value %v, want %v", doc.Summary.Value, value(to))
	}
	if e := doc.Explain; e == nil || e.Actual == nil || *e.Actual != *doc.Summary.Returns.Week || e.From != "2025-06-06" {
		t.Errorf("explain %+v", e)
	}
}

func TestMetricsHoldHeadline(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	head := Headline(doc)
	// The headline set the committee follows (the brief's list).
	for _, name := range []string{"value", "return_week", "return_ytd", "volatility_ann_63d", "var_99_1d", "es_975_1d",
		"duration_modified", "duration_empirical", "convexity", "growth_duration", "beta", "max_single_name_weight", "tracking_error_ann"} {
		if _, ok := head[name]; !ok {
			t.Errorf("headline lacks %s", name)
		}
	}
	ms := Metrics(doc)
	for name, v := range head {
		i := slices.IndexFunc(ms, func(m Metric) bool { return m.Scope == ScopePortfolio && m.Key == "" && m.Name == name })
		if i < 0 || ms[i].Value != v {
			t.Errorf("metric %s missing or different", name)
		}
	}
	if !slices.IsSortedFunc(ms, func(a, b Metric) int {
		return strings.Compare(a.Scope+"\x00"+a.Key+"\x00"+a.Name, b.Scope+"\x00"+b.Key+"\x00"+b.Name)
	}) {
		t.Error("metrics not sorted")
	}
	if last := doc.History[len(doc.History)-1]; last.AsOf != "2025-06-13" || len(last.Metrics) != len(head) {
		t.Errorf("history point %+v", last)
	}
}

// Every limit metric of the limits package gets a value from the
// fixture (scenario_loss through the scenario map).
func TestLimitValuesCoverLimitMetrics(t *testing.T) {
	p := fxParams()
	doc := mustCompute(t, fxInputs(), p)
	for _, l := range doc.Limits {
		if l.Status == "no_data" {
			t.Errorf("limit %s has no data", l.Name)
		}
	}
	all := make([]limits.Limit, 0)
	for _, m := range limits.Metrics() {
		l := limits.Limit{Name: m.Name, Metric: m.Name, BreachMax: f64(1e9)}
		if m.Scope == limits.ScopeScenario {
			l.Scenario = "rates +100bp"
		}
		all = append(all, l)
	}
	p.Limits = all
	doc = mustCompute(t, fxInputs(), p)
	for _, l := range doc.Limits {
		if l.Status != "ok" || l.Value == nil {
			t.Errorf("limit metric %s: status %s", l.Metric, l.Status)
		}
	}
	// max_single_name_weight is the largest holding weight.
	var maxW float64
	for _, h := range doc.Holdings {
		maxW = math.Max(maxW, h.Weight)
	}
	for _, l := range doc.Limits {
		if l.Metric == "max_single_name_weight" && *l.Value != maxW {
			t.Errorf("max single name %v, want %v", *l.Value, maxW)
		}
	}
}

func TestReplays(t *testing.T) {
	doc := mustCompute(t, fxInputs(), fxParams())
	names := map[string]StressResult{}
	for _, x := range doc.Replays {
		names[x.Name] = x
	}
	a, ok := names["autumn"]
	if !ok || a.From != "2024-09-02" || a.To != "2024-10-31" {
		t.Errorf("autumn replay %+v", a)
	}
	if _, ok := names["before history"]; ok {
		t.Error("a window before the history was replayed")
	}
	if !slices.ContainsFunc(doc.DataQuality, func(f Finding) bool {
		return f.Kind == "replay_outside_history" && strings.Contains(f.Detail, "before history")
	}) {
		t.Error("no finding for the window outside the history")
	}
	// The worst window loses at least as much as any other 10-day window,
	// the autumn one's first ten days included (its definition).
	w, ok := names["worst 10-day window"]
	if !ok || w.From == "" || w.To == "" {
		t.Fatalf("worst window %+v", w)
	}
	p := fxParams()
	p.Replays = []NamedWindow{{Name: "ten", From: day("2024-09-02"), To: day("2024-09-13")}}
	ten := mustCompute(t, fxInputs(), p).Replays[1]
	if ten.Name != "ten" || w.PnL > ten.PnL {
		t.Errorf("worst window %v, a ten-day window %+v", w.PnL, ten)
	}
}

// Two runs give the same JSON, also with the inputs' lists in another
// order.
func TestComputeIsDeterministic(t *testing.T) {
	a, err := json.Marshal(mustCompute(t, fxInputs(), fxParams()))
	if err != nil {
		t.Fatal(err)
	}
	in := fxInputs()
	slices.Reverse(in.Securities)
	slices.Reverse(in.Prices)
	slices.Reverse(in.Assumptions)
	b, err := json.Marshal(mustCompute(t, in, fxParams()))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Error("two runs differ")
	}
}

func TestComputeErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		edit func(*Inputs, *Params)
		want error
	}{
		{"no snapshot", func(in *Inputs, _ *Params) { in.Snapshots = nil }, ErrNoHoldings},
		{"no prices", func(in *Inputs, _ *Params) { in.Prices = nil }, ErrNoPrices},
		{"no yields", func(in *Inputs, _ *Params) { in.Yields = nil }, ErrNoMarketData},
		{"no premiums", func(in *Inputs, _ *Params) { in.Premiums = nil }, ErrNoMarketData},
		{"lambda 1", func(_ *Inputs, p *Params) { p.EWMALambda = 1 }, ErrParams},
		{"as-of before every price", func(in *Inputs, _ *Params) { in.AsOf = fxAsOf.AddDate(-100, 0, 0) }, ErrNoPrices},
		{"zero as-of", func(in *Inputs, _ *Params) { in.AsOf = time.Time{} }, ErrInputs},
		{"overdraft", func(in *Inputs, _ *Params) { in.Snapshots[1].Cash = -1e9 }, ErrNoHoldings},
	} {
		t.Run(tc.name, func(t *testing.T) {
			in, p := fxInputs(), fxParams()
			tc.edit(in, &p)
			if _, err := Compute(in, p); !errors.Is(err, tc.want) {
				t.Errorf("got %v, want %v", err, tc.want)
			}
		})
	}
	if _, err := Compute(nil, fxParams()); !errors.Is(err, ErrInputs) {
		t.Errorf("nil inputs: %v", err)
	}
}
