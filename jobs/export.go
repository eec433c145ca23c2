package jobs

import (
	"context"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"

	"plumbline/store"
)

// ExportResult lists what Export wrote.
type ExportResult struct {
	Dir   string   `json:"dir"`
	Files []string `json:"files"`
}

// Export writes everything an auditor needs to inspect a run into dir:
// the inputs the run used (read at the run's ledger mark) as CSV files in
// the ingest formats (so they can be ingested again), the results JSON,
// the stored configuration, the PDF when there is one, and
// MANIFEST.sha256 with the sha256 of each file.
func Export(ctx context.Context, db *store.DB, runID int64, dir string) (*ExportResult, error) {
	sr, err := loadStoredRun(ctx, db, runID)
	if err != nil {
		return nil, err
	}
	run, in := sr.run, sr.inputs
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	files := map[string][]byte{}
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	d := func(t time.Time) string { return t.Format(time.DateOnly) }
	opt := func(p *float64) string {
		if p == nil {
			return ""
		}
		return f(*p)
	}
	put := func(name string, header []string, rows [][]string) error {
		var b strings.Builder
		w := csv.NewWriter(&b)
		w.Write(header)
		w.WriteAll(rows) // flushes
		if err := w.Error(); err != nil {
			return fmt.Errorf("export run %d: %s: %w", runID, name, err)
		}
		files[name] = []byte(b.String())
		return nil
	}
	p := in.Portfolio
	var rows [][]string
	rows = append(rows, []string{p.ID, p.Name, p.Strategy, p.Inception, p.BenchmarkMethod})
	if err := put("portfolios.csv", store.Header(store.KindPortfolios), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, s := range in.Securities {
		rows = append(rows, []string{s.ID, s.Name, s.Sector, s.Currency, f(s.SharesOutstanding)})
	}
	if err := put("securities.csv", store.Header(store.KindSecurities), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, a := range in.Assumptions {
		var st []string
		for _, s := range a.Stages {
			x := f(s.Years) + ":" + f(s.Growth)
			if s.Rate != nil {
				x += ":" + f(*s.Rate)
			}
			st = append(st, x)
		}
		rows = append(rows, []string{a.SecurityID, d(a.Effective), f(a.AnnualDividend), strconv.Itoa(a.Frequency),
			f(a.Growth), opt(a.Beta), opt(a.DiscountRate), strings.Join(st, ";")})
	}
	if err := put("assumptions.csv", store.Header(store.KindAssumptions), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, ps := range in.Prices {
		for i := range ps.Dates {
			rows = append(rows, []string{d(ps.Dates[i]), ps.SecurityID, f(ps.Close[i]), f(ps.Dividend[i]), f(ps.Split[i])})
		}
	}
	sort.SliceStable(rows, func(a, b int) bool { return rows[a][0] < rows[b][0] })
	if err := put("prices.csv", store.Header(store.KindPrices), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, y := range in.Yields {
		for i := range y.Tenors {
			rows = append(rows, []string{d(y.Date), strconv.Itoa(y.Tenors[i]), f(y.Yields[i])})
		}
	}
	if err := put("yields.csv", store.Header(store.KindYields), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, v := range in.Premiums {
		rows = append(rows, []string{d(v.Date), f(v.Value)})
	}
	if err := put("premiums.csv", store.Header(store.KindPremiums), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, s := range in.Snapshots {
		for _, l := range s.Lines {
			rows = append(rows, []string{d(s.AsOf), p.ID, l.SecurityID, f(l.Quantity), f(l.Price)})
		}
		rows = append(rows, []string{d(s.AsOf), p.ID, "CASH", f(s.Cash), "1"})
	}
	if err := put("holdings.csv", store.Header(store.KindHoldings), rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, v := range in.Flows {
		rows = append(rows, []string{d(v.Date), p.ID, f(v.Value)})
	}
	if err := put("flows.csv", store.Header(store.KindFlows), rows); err != nil {
		return nil, err
	}
	files["results.json"] = run.ResultsJSON
	files["config.json"] = run.ConfigJSON
	if run.PDFSHA256 != "" {
		pdf, err := db.RunPDF(ctx, runID, run.PDFSHA256)
		if err != nil {
			return nil, err
		}
		files[fmt.Sprintf("pack-run%d.pdf", runID)] = pdf
	}
	names := make([]string, 0, len(files))
	for n := range files {
		names = append(names, n)
	}
	sort.Strings(names)
	var manifest strings.Builder
	fmt.Fprintf(&manifest, "# run %d, portfolio %s, as of %s, input hash %s, config hash %s\n",
		run.ID, run.PortfolioID, d(run.AsOf), run.InputHash, run.ConfigHash)
	for _, n := range names {
		if err := writeFileAtomic(filepath.Join(dir, n), files[n], 0o644); err != nil {
			return nil, err
		}
		fmt.Fprintf(&manifest, "%s  %s\n", SHA256Hex(files[n]), n)
	}
	if err := writeFileAtomic(filepath.Join(dir, "MANIFEST.sha256"), []byte(manifest.String()), 0o644); err != nil {
		return nil, err
	}
	return &ExportResult{Dir: dir, Files: append(names, "MANIFEST.sha256")}, nil
}
