package jobs

import (
	"context"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"

	"plumbline/jobs/config"
	"plumbline/store"
)

func sha256Hex(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

// ExportResult lists what Export wrote.
type ExportResult struct {
	Dir   string   `json:"dir"`
	Files []string `json:"files"`
}

// Export writes everything an auditor needs to inspect a run into dir:
// the inputs the run used as CSV files in the ingest formats (so they can
// be ingested again), the results JSON, the stored configuration, the PDF
// when there is one, and MANIFEST.sha256 with the sha256 of each file.
func Export(ctx context.Context, db *store.DB, runID int64, dir string) (*ExportResult, error) {
	run, err := db.GetRun(ctx, runID)
	if err != nil {
		return nil, err
	}
	cfg, err := config.FromCanonical(run.ConfigJSON)
	if err != nil {
		return nil, err
	}
	ports, err := selectPortfolios(ctx, db, []string{run.PortfolioID})
	if err != nil {
		return nil, err
	}
	m, err := loadMarket(ctx, db, run.AsOf)
	if err != nil {
		return nil, err
	}
	in, err := gather(ctx, db, m, ports[0], cfg.BaseCurrency, nil)
	if err != nil {
		return nil, err
	}
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
		if err := w.Write(header); err != nil {
			return err
		}
		if err := w.WriteAll(rows); err != nil {
			return err
		}
		files[name] = []byte(b.String())
		return nil
	}
	p := ports[0]
	var rows [][]string
	rows = append(rows, []string{p.ID, p.Name, p.Strategy, d(p.Inception), p.BenchmarkMethod})
	if err := put("portfolios.csv", []string{"portfolio_id", "portfolio_name", "strategy", "inception_date", "benchmark_method"}, rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, s := range in.Securities {
		rows = append(rows, []string{s.ID, s.Name, s.Sector, s.Currency, f(s.SharesOutstanding)})
	}
	if err := put("securities.csv", []string{"security_id", "security_name", "sector", "currency", "shares_outstanding"}, rows); err != nil {
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
	if err := put("assumptions.csv", []string{"security_id", "effective_date", "annual_dividend", "frequency", "growth", "beta", "discount_rate", "stages"}, rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, ps := range in.Prices {
		for i := range ps.Dates {
			rows = append(rows, []string{d(ps.Dates[i]), ps.SecurityID, f(ps.Close[i]), f(ps.Dividend[i]), f(ps.Split[i])})
		}
	}
	sort.SliceStable(rows, func(a, b int) bool { return rows[a][0] < rows[b][0] })
	if err := put("prices.csv", []string{"date", "security_id", "close", "dividend", "split_ratio"}, rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, y := range in.Yields {
		for i := range y.Tenors {
			rows = append(rows, []string{d(y.Date), strconv.Itoa(y.Tenors[i]), f(y.Yields[i])})
		}
	}
	if err := put("yields.csv", []string{"date", "tenor_months", "yield"}, rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, v := range in.Premiums {
		rows = append(rows, []string{d(v.Date), f(v.Value)})
	}
	if err := put("premiums.csv", []string{"date", "equity_risk_premium"}, rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, s := range in.Snapshots {
		for _, l := range s.Lines {
			rows = append(rows, []string{d(s.AsOf), p.ID, l.SecurityID, f(l.Quantity), f(l.Price)})
		}
		rows = append(rows, []string{d(s.AsOf), p.ID, "CASH", f(s.Cash), "1"})
	}
	if err := put("holdings.csv", []string{"as_of", "portfolio_id", "security_id", "quantity", "price"}, rows); err != nil {
		return nil, err
	}
	rows = nil
	for _, v := range in.Flows {
		rows = append(rows, []string{d(v.Date), p.ID, f(v.Value)})
	}
	if err := put("flows.csv", []string{"date", "portfolio_id", "amount"}, rows); err != nil {
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
		fmt.Fprintf(&manifest, "%s  %s\n", sha256Hex(files[n]), n)
	}
	if err := writeFileAtomic(filepath.Join(dir, "MANIFEST.sha256"), []byte(manifest.String()), 0o644); err != nil {
		return nil, err
	}
	return &ExportResult{Dir: dir, Files: append(names, "MANIFEST.sha256")}, nil
}
