package demo

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// Headers of the contract's input files; a file's kind is recognised from
// its exact header, so these must not drift.
var (
	headerPortfolios  = []string{"portfolio_id", "portfolio_name", "strategy", "inception_date", "benchmark_method"}
	headerSecurities  = []string{"security_id", "security_name", "sector", "currency", "shares_outstanding"}
	headerAssumptions = []string{"security_id", "effective_date", "annual_dividend", "frequency", "growth", "beta", "discount_rate", "stages"}
	headerHoldings    = []string{"as_of", "portfolio_id", "security_id", "quantity", "price"}
	headerPrices      = []string{"date", "security_id", "close", "dividend", "split_ratio"}
	headerYields      = []string{"date", "tenor_months", "yield"}
	headerPremiums    = []string{"date", "equity_risk_premium"}
	headerFlows       = []string{"date", "portfolio_id", "amount"}
)

const (
	dateLayout     = "2006-01-02"
	holdingsDir    = "holdings"
	holdingsPrefix = "holdings-"
)

// writeCSV writes header and the rows produced by fill to dir/rel and
// returns the number of data rows.
func writeCSV(dir, rel string, header []string, fill func(emit func(...string))) (int, error) {
	path := filepath.Join(dir, filepath.FromSlash(rel))
	f, err := os.Create(path)
	if err != nil {
		return 0, fmt.Errorf("demo: %w", err)
	}
	bw := bufio.NewWriterSize(f, 1<<16)
	w := csv.NewWriter(bw)
	rows := 0
	var werr error
	emit := func(rec ...string) {
		if werr == nil {
			werr = w.Write(rec)
			rows++
		}
	}
	emit(header...)
	fill(emit)
	w.Flush()
	if werr == nil {
		werr = w.Error()
	}
	if werr == nil {
		werr = bw.Flush()
	}
	if cerr := f.Close(); werr == nil {
		werr = cerr
	}
	if werr != nil {
		return 0, fmt.Errorf("demo: write %s: %w", path, werr)
	}
	return rows - 1, nil
}

// fmtDec writes a decimal in its shortest exact form (0.07, 1.5, 2).
func fmtDec(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

// fmtFixed writes x with the given number of decimals.
func fmtFixed(x float64, decimals int) string { return strconv.FormatFloat(x, 'f', decimals, 64) }

// fmtCents writes an amount in cents as units with two decimals.
func fmtCents(c int64) string {
	sign := ""
	if c < 0 {
		sign, c = "-", -c
	}
	return fmt.Sprintf("%s%d.%02d", sign, c/100, c%100)
}

func fmtDate(sc *scenario, day int) string { return sc.cal.days[day].Format(dateLayout) }

// removeOldHoldings deletes holdings files left by an earlier run (only
// names this package writes), so a shorter history does not leave strays
// that would be ingested with the new ones.
func removeOldHoldings(dir string) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return fmt.Errorf("demo: %w", err)
	}
	for _, e := range entries {
		name := e.Name()
		if !e.IsDir() && strings.HasPrefix(name, holdingsPrefix) && strings.HasSuffix(name, ".csv") {
			if err := os.Remove(filepath.Join(dir, name)); err != nil {
				return fmt.Errorf("demo: %w", err)
			}
		}
	}
	return nil
}
