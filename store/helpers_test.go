package store

import (
	"context"
	"os"
	"path/filepath"
	"testing"
)

// openTestDB opens a fresh database file in a temporary folder.
func openTestDB(tb testing.TB) *DB {
	tb.Helper()
	db, err := Open(context.Background(), filepath.Join(tb.TempDir(), "test.db"))
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() { db.Close() })
	return db
}

// writeFiles writes name -> content into a new folder and returns the
// paths in the order given.
func writeFiles(tb testing.TB, files ...string) []string {
	tb.Helper()
	dir := tb.TempDir()
	var paths []string
	for i := 0; i+1 < len(files); i += 2 {
		p := filepath.Join(dir, files[i])
		if err := os.WriteFile(p, []byte(files[i+1]), 0o644); err != nil {
			tb.Fatal(err)
		}
		paths = append(paths, p)
	}
	return paths
}

// ingest runs Ingest and fails the test on an operational error.
func ingest(tb testing.TB, db *DB, opt IngestOptions, paths ...string) []FileResult {
	tb.Helper()
	res, err := db.Ingest(context.Background(), paths, opt)
	if err != nil {
		tb.Fatal(err)
	}
	return res
}

// count returns the number of rows of a table.
func count(tb testing.TB, db *DB, table string) int {
	tb.Helper()
	var n int
	if err := db.sql.QueryRow("SELECT count(*) FROM " + table).Scan(&n); err != nil {
		tb.Fatal(err)
	}
	return n
}

// Fixtures: a small consistent set of fictional inputs.
const (
	portfoliosCSV = "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method\n" +
		"PF-GROWTH,Harbour Growth,Dividend growth,2020-01-02,value\n" +
		"PF-INCOME,Harbour Income,Equity income,2021-06-01,equal\n"
	securitiesCSV = "security_id,security_name,sector,currency,shares_outstanding\n" +
		"QLMB,Quillmere Brewing,Consumer Staples,USD,120000000\n" +
		"VNTR.A,Ventorra Rail class A,Industrials,USD,45000000\n" +
		"OSPX,Ospreyfield Power,Utilities,USD,300000000\n"
	pricesCSV = "date,security_id,close,dividend,split_ratio\n" +
		"2026-03-02,QLMB,41.20,,\n" +
		"2026-03-02,VNTR.A,18.05,0.12,1\n" +
		"2026-03-03,QLMB,41.55,0,1\n" +
		"2026-03-03,VNTR.A,9.10,,2\n"
	holdingsCSV = "as_of,portfolio_id,security_id,quantity,price\n" +
		"2026-03-06,PF-GROWTH,QLMB,1000,41.90\n" +
		"2026-03-06,PF-GROWTH,VNTR.A,2500,9.25\n" +
		"2026-03-06,PF-GROWTH,CASH,-1500.50,1\n"
	assumptionsCSV = "security_id,effective_date,annual_dividend,frequency,growth,beta,discount_rate,stages\n" +
		"QLMB,2026-01-01,1.60,4,0.03,0.8,,3:0.09;2:0.06:0.095\n" +
		"OSPX,2026-01-01,2.10,2,0.02,,0.07,\n"
	yieldsCSV   = "date,tenor_months,yield\n2026-03-06,12,0.041\n2026-03-06,120,0.043\n"
	premiumsCSV = "date,equity_risk_premium\n2026-03-06,0.05\n"
	flowsCSV    = "date,portfolio_id,amount\n2026-03-04,PF-GROWTH,250000\n2026-03-05,PF-INCOME,-12000.5\n"
)
