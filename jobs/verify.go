package jobs

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"sort"
	"time"

	"plumbline/risk/pack"
	"plumbline/store"
)

// Difference is one metric whose recomputed value is not the stored one.
type Difference struct {
	Scope      string   `json:"scope"`
	Key        string   `json:"key"`
	Metric     string   `json:"metric"`
	Stored     *float64 `json:"stored,omitempty"`
	Recomputed *float64 `json:"recomputed,omitempty"`
}

// Verification is the outcome of recomputing a run.
type Verification struct {
	RunID           int64        `json:"run_id"`
	Portfolio       string       `json:"portfolio"`
	AsOf            string       `json:"as_of"`
	StoredInputHash string       `json:"stored_input_hash"`
	InputHash       string       `json:"input_hash"`
	InputsMatch     bool         `json:"inputs_match"`
	ResultsMatch    bool         `json:"results_match"`
	Metrics         int          `json:"metrics_compared"`
	Differences     []Difference `json:"differences"`
	PDFMatch        *bool        `json:"pdf_match,omitempty"`
}

// Identical reports whether the run was reproduced exactly.
func (v *Verification) Identical() bool {
	return v.InputsMatch && v.ResultsMatch && len(v.Differences) == 0 && (v.PDFMatch == nil || *v.PDFMatch)
}

// Verify recomputes a run from the inputs the store held when the run was
// made (the rows of ledger entries up to the run's ledger mark, so a later
// correction does not count as a difference) with the configuration
// stored with the run, and compares the input hash, every long-form
// metric and the full results document, and the PDF when the run has one.
// Metrics are compared exactly: the computation is deterministic, so any
// difference means changed input rows or different code.
func Verify(ctx context.Context, db *store.DB, runID int64) (*Verification, error) {
	sr, err := loadStoredRun(ctx, db, runID)
	if err != nil {
		return nil, err
	}
	run, cfg, ih := sr.run, sr.cfg, sr.inputHash
	params, err := Params(cfg)
	if err != nil {
		return nil, fmt.Errorf("run %d: stored configuration: %w", runID, err)
	}
	v := &Verification{RunID: run.ID, Portfolio: run.PortfolioID, AsOf: run.AsOf.Format(time.DateOnly),
		StoredInputHash: run.InputHash, InputHash: ih, InputsMatch: ih == run.InputHash}
	doc, err := pack.Compute(sr.inputs, params)
	if err != nil {
		return nil, fmt.Errorf("run %d: recompute: %w", runID, err)
	}
	results, err := json.Marshal(doc)
	if err != nil {
		return nil, err
	}
	v.ResultsMatch = string(results) == string(run.ResultsJSON)
	stored, err := db.RunMetrics(ctx, runID)
	if err != nil {
		return nil, err
	}
	type key struct{ scope, k, m string }
	want := map[key]float64{}
	for _, s := range stored {
		want[key{s.Scope, s.Key, s.Metric}] = s.Value
	}
	got := map[key]float64{}
	for _, mt := range pack.Metrics(doc) {
		got[key{mt.Scope, mt.Key, mt.Name}] = mt.Value
	}
	keys := map[key]bool{}
	for k := range want {
		keys[k] = true
	}
	for k := range got {
		keys[k] = true
	}
	v.Metrics = len(keys)
	for k := range keys {
		w, okw := want[k]
		g, okg := got[k]
		if okw && okg && (w == g || (math.IsNaN(w) && math.IsNaN(g))) {
			continue
		}
		d := Difference{Scope: k.scope, Key: k.k, Metric: k.m}
		if okw {
			d.Stored = &w
		}
		if okg {
			d.Recomputed = &g
		}
		v.Differences = append(v.Differences, d)
	}
	sort.Slice(v.Differences, func(a, b int) bool {
		x, y := v.Differences[a], v.Differences[b]
		if x.Scope != y.Scope {
			return x.Scope < y.Scope
		}
		if x.Key != y.Key {
			return x.Key < y.Key
		}
		return x.Metric < y.Metric
	})
	if run.PDFSHA256 != "" {
		pdf, _, err := RenderRun(run)
		if err != nil {
			return nil, err
		}
		ok := SHA256Hex(pdf) == run.PDFSHA256
		v.PDFMatch = &ok
	}
	return v, nil
}
