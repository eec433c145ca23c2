package jobs

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"sort"
	"time"

	"plumbline/risk/pack"
	"plumbline/store"
)

// market is the data shared by every portfolio of one as-of date: the
// securities, their prices, the curves and premiums. It is read once per
// pack call and hashed once.
type market struct {
	asOf       time.Time
	securities []pack.Security
	prices     []pack.PriceSeries
	yields     []pack.YieldCurve
	premiums   []pack.DatedValue
	assumption []pack.Assumption
	hash       string // marketHash: sha256 of the canonical JSON of the fields above
}

// loadMarket reads everything up to asOf that is not specific to one
// portfolio. db is a view at the run's ledger mark (store.DB.At), as is
// gather's, so a run and its verification read the same rows.
func loadMarket(ctx context.Context, db *store.DB, asOf time.Time) (*market, error) {
	m := &market{asOf: asOf}
	secs, err := db.Securities(ctx)
	if err != nil {
		return nil, err
	}
	for _, s := range secs {
		m.securities = append(m.securities, pack.Security{ID: s.ID, Name: s.Name, Sector: s.Sector,
			Currency: s.Currency, SharesOutstanding: s.SharesOutstanding})
	}
	prices, err := db.Prices(ctx, time.Time{}, asOf)
	if err != nil {
		return nil, err
	}
	m.prices = splitPrices(prices)
	sort.Slice(m.prices, func(a, b int) bool { return m.prices[a].SecurityID < m.prices[b].SecurityID })
	ys, err := db.Yields(ctx, time.Time{}, asOf)
	if err != nil {
		return nil, err
	}
	for _, y := range ys {
		n := len(m.yields)
		if n == 0 || !m.yields[n-1].Date.Equal(y.Date) {
			m.yields = append(m.yields, pack.YieldCurve{Date: y.Date})
			n++
		}
		c := &m.yields[n-1]
		c.Tenors = append(c.Tenors, y.TenorMonths)
		c.Yields = append(c.Yields, y.Yield)
	}
	prem, err := db.Premiums(ctx, time.Time{}, asOf)
	if err != nil {
		return nil, err
	}
	for _, p := range prem {
		m.premiums = append(m.premiums, pack.DatedValue{Date: p.Date, Value: p.EquityRiskPremium})
	}
	// Assumptions in effect on the as-of date and a week earlier (the
	// week's return explanation needs both).
	seen := map[string]bool{}
	for _, d := range []time.Time{asOf.AddDate(0, 0, -7), asOf} {
		as, err := db.AssumptionsAsOf(ctx, d)
		if err != nil {
			return nil, err
		}
		for _, a := range as {
			key := a.SecurityID + "|" + a.Effective.Format(time.DateOnly)
			if seen[key] {
				continue
			}
			seen[key] = true
			pa := pack.Assumption{SecurityID: a.SecurityID, Effective: a.Effective, AnnualDividend: a.AnnualDividend,
				Frequency: a.Frequency, Growth: a.Growth, Beta: a.Beta, DiscountRate: a.DiscountRate}
			for _, st := range a.Stages {
				pa.Stages = append(pa.Stages, pack.Stage{Years: float64(st.Years), Growth: st.Growth, Rate: st.Rate})
			}
			m.assumption = append(m.assumption, pa)
		}
	}
	sort.Slice(m.assumption, func(a, b int) bool {
		x, y := m.assumption[a], m.assumption[b]
		if x.SecurityID != y.SecurityID {
			return x.SecurityID < y.SecurityID
		}
		return x.Effective.Before(y.Effective)
	})
	if m.hash, err = marketHash(m); err != nil {
		return nil, err
	}
	return m, nil
}

// splitPrices turns price rows (by date, then security) into one series
// per security, in order of first appearance. The rows are counted first
// so that each column is one exactly sized array shared by the series (a
// million rows for a large store, where growing slices by appending held
// up to twice the memory at the peak of a pack run).
func splitPrices(prices []store.Price) []pack.PriceSeries {
	idx := map[string]int{}
	var count []int
	for _, p := range prices {
		i, ok := idx[p.SecurityID]
		if !ok {
			i = len(count)
			idx[p.SecurityID] = i
			count = append(count, 0)
		}
		count[i]++
	}
	n := len(prices)
	dates, closes, divs, splits := make([]time.Time, n), make([]float64, n), make([]float64, n), make([]float64, n)
	out := make([]pack.PriceSeries, len(count))
	at := 0
	for id, i := range idx {
		out[i].SecurityID = id
	}
	for i, c := range count {
		// Full slice expressions: appending to one series never writes
		// into the next.
		ps := &out[i]
		ps.Dates, ps.Close = dates[at:at:at+c], closes[at:at:at+c]
		ps.Dividend, ps.Split = divs[at:at:at+c], splits[at:at:at+c]
		at += c
	}
	for _, p := range prices {
		ps := &out[idx[p.SecurityID]]
		ps.Dates = append(ps.Dates, p.Date)
		ps.Close = append(ps.Close, p.Close)
		ps.Dividend = append(ps.Dividend, p.Dividend)
		ps.Split = append(ps.Split, p.SplitRatio)
	}
	return out
}

// gather builds one portfolio's inputs on top of the shared market data.
// history holds the headline metrics of the portfolio's earlier runs.
func gather(ctx context.Context, db *store.DB, m *market, p store.Portfolio, base string, history []pack.HistoryPoint) (*pack.Inputs, error) {
	in := &pack.Inputs{
		AsOf:         m.asOf,
		BaseCurrency: base,
		Portfolio: pack.PortfolioInfo{ID: p.ID, Name: p.Name, Strategy: p.Strategy,
			Inception: p.Inception.Format(time.DateOnly), BenchmarkMethod: p.BenchmarkMethod},
		Securities:  m.securities,
		Prices:      m.prices,
		Yields:      m.yields,
		Premiums:    m.premiums,
		Assumptions: m.assumption,
		History:     history,
	}
	snaps, err := db.HoldingsSnapshots(ctx, p.ID, time.Time{}, m.asOf)
	if err != nil {
		return nil, err
	}
	files := map[string]bool{}
	for _, s := range snaps {
		ps := pack.Snapshot{AsOf: s.AsOf, Revision: s.Revision}
		for _, l := range s.Lines {
			if l.SecurityID == "CASH" {
				ps.Cash += l.Quantity
				continue
			}
			ps.Lines = append(ps.Lines, pack.Line{SecurityID: l.SecurityID, Quantity: l.Quantity, Price: l.Price})
		}
		sort.Slice(ps.Lines, func(a, b int) bool { return ps.Lines[a].SecurityID < ps.Lines[b].SecurityID })
		in.Snapshots = append(in.Snapshots, ps)
		files[s.SourceFile] = true
	}
	flows, err := db.Flows(ctx, p.ID, time.Time{}, m.asOf)
	if err != nil {
		return nil, err
	}
	for _, f := range flows {
		in.Flows = append(in.Flows, pack.DatedValue{Date: f.Date, Value: f.Amount})
	}
	for f := range files {
		in.Sources = append(in.Sources, f)
	}
	sort.Strings(in.Sources)
	return in, nil
}

// inputHash is the sha256 over the shared market data's hash and the
// canonical JSON of the portfolio's own inputs (snapshots, flows,
// history): proof of every input row the run used.
func inputHash(m *market, in *pack.Inputs) (string, error) {
	own := struct {
		AsOf      time.Time           `json:"as_of"`
		Base      string              `json:"base_currency"`
		Portfolio pack.PortfolioInfo  `json:"portfolio"`
		Snapshots []pack.Snapshot     `json:"snapshots"`
		Flows     []pack.DatedValue   `json:"flows"`
		History   []pack.HistoryPoint `json:"history"`
	}{in.AsOf, in.BaseCurrency, in.Portfolio, in.Snapshots, in.Flows, in.History}
	b, err := json.Marshal(own)
	if err != nil {
		return "", fmt.Errorf("input hash: %w", err)
	}
	h := sha256.New()
	h.Write([]byte(m.hash))
	h.Write(b)
	return hex.EncodeToString(h.Sum(nil)), nil
}
