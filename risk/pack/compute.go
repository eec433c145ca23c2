package pack

import (
	"cmp"
	"fmt"
	"slices"
	"time"

	"plumbline/risk/returns"
	"plumbline/risk/valuation"
)

// run carries one Compute call's state between its steps.
type run struct {
	in  *Inputs
	p   Params
	d   *data
	doc *Document

	book  bookOf  // holdings on the as-of date
	total float64 // Summary.Value

	// Valuation on the as-of date.
	opt   valuation.Options
	mkt   valuation.Market
	vals  []valued // one per Document.Holdings
	betas map[string]betaEstimate
	rfL1  float64 // slope and curvature loadings of the fitted curve at
	rfL2  float64 // the risk-free tenor (factor durations of non-curve models)

	// Returns.
	vs        *returns.ValueSeries
	vsStart   int       // calendar index of vs.Dates[0]
	port      []float64 // daily returns; port[i] is the return of calendar day vsStart+1+i
	bench     *returns.Index
	benchAt   int // calendar index of bench.Dates[0]
	weekEnds  []int
	benchWeek []float64
	weekBase  int // calendar index of the close a week before the as-of date; -1 if none

	worstLoss *float64
	models    map[string]int
}

// Compute assembles the results Document of one portfolio on in.AsOf from
// its gathered inputs. It is pure and deterministic: the same inputs and
// parameters give the same Document, byte for byte once encoded.
//
// In order: holdings on the as-of date (holdings.go), the market of that
// date (market.go), the daily value series and benchmark (returns.go),
// valuation and aggregation (sensitivity.go), empirical durations
// (empirical.go), returns, volatilities and series (returns.go), the
// week's return explanation (explain.go), VaR, ES and backtest (risk.go),
// stress scenarios and replays (stressing.go), limits (limits.go), then
// headline, drift, history and methodology (metrics.go, methodology.go).
// Each file's doc comments give the formulas and conventions.
//
// Errors wrap ErrInputs, ErrParams, ErrNoHoldings, ErrNoPrices or
// ErrNoMarketData and name what is missing. Everything confined to one
// holding or one measure (a valuation that fails, a stale or missing
// price, too short a history for one statistic) is recorded in
// Document.Excluded or Document.DataQuality instead, and the figure is
// absent, never zero.
func Compute(in *Inputs, p Params) (*Document, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	if in == nil {
		return nil, fmt.Errorf("%w: no inputs", ErrInputs)
	}
	if in.AsOf.IsZero() {
		return nil, fmt.Errorf("%w: portfolio %s: no as-of date", ErrInputs, in.Portfolio.ID)
	}
	wrap := func(err error) error {
		return fmt.Errorf("pack %s %s: %w", in.Portfolio.ID, in.AsOf.Format(time.DateOnly), err)
	}
	d, err := newData(in)
	if err != nil {
		return nil, wrap(err)
	}
	r := &run{in: in, p: p, d: d, betas: map[string]betaEstimate{}, models: map[string]int{}, weekBase: -1}
	r.doc = &Document{
		Schema:       SchemaVersion,
		Portfolio:    in.Portfolio,
		AsOf:         in.AsOf.Format(time.DateOnly),
		BaseCurrency: in.BaseCurrency,
		Holdings:     []Holding{},
		Sectors:      []Sector{},
		VaR:          []VaRFigure{},
		Stress:       []StressResult{},
		Replays:      []StressResult{},
		Limits:       []LimitStatus{},
		Excluded:     []Exclusion{},
		DataQuality:  []Finding{},
	}
	if err := r.holdings(); err != nil {
		return nil, wrap(err)
	}
	if err := r.market(); err != nil {
		return nil, wrap(err)
	}
	r.weeks()
	r.valueSeries()
	r.benchmark()
	r.valuation()
	r.empirical()
	r.returnsSection()
	r.explain()
	r.risk()
	r.stressing()
	if err := r.limits(); err != nil {
		return nil, wrap(err)
	}
	r.finish()
	return r.doc, nil
}

// finding records a data-quality observation.
func (r *run) finding(kind, id string, share float64, format string, a ...any) {
	r.doc.DataQuality = append(r.doc.DataQuality, Finding{Kind: kind, ID: id, Detail: fmt.Sprintf(format, a...), ValueShare: share})
}

// weight returns a holding's value share of the total, 0 for an unknown ID.
func (r *run) weight(id string) float64 {
	for _, h := range r.doc.Holdings {
		if h.ID == id {
			return h.Weight
		}
	}
	return 0
}

// finish sorts the lists, adds drift, history and methodology.
func (r *run) finish() {
	doc := r.doc
	doc.DataQuality = append(doc.DataQuality, r.d.finding...)
	slices.SortStableFunc(doc.DataQuality, func(a, b Finding) int {
		return cmp.Or(cmp.Compare(a.Kind, b.Kind), cmp.Compare(a.ID, b.ID), cmp.Compare(a.Detail, b.Detail))
	})
	slices.SortStableFunc(doc.Excluded, func(a, b Exclusion) int {
		return cmp.Or(cmp.Compare(a.ID, b.ID), cmp.Compare(a.Reason, b.Reason))
	})
	head := Headline(doc)
	doc.Drift = Drift(head, r.in.History, r.p.Drift)
	doc.History = make([]HistoryPoint, 0, len(r.in.History)+1)
	doc.History = append(doc.History, r.in.History...)
	doc.History = append(doc.History, HistoryPoint{AsOf: doc.AsOf, Metrics: head})
	doc.Methodology = r.methodology()
}
