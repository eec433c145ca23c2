package store

import (
	"bufio"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"testing"
	"time"
)

// writePricesCSV writes a prices file of n rows for nsec fictional
// securities (SYN0000...) on consecutive weekdays, and the matching
// securities file.
func writePricesCSV(tb testing.TB, dir string, n, nsec int) (securities, prices string) {
	tb.Helper()
	securities = filepath.Join(dir, "securities.csv")
	prices = filepath.Join(dir, "prices.csv")
	sf, err := os.Create(securities)
	if err != nil {
		tb.Fatal(err)
	}
	fmt.Fprintln(sf, "security_id,security_name,sector,currency,shares_outstanding")
	for i := 0; i < nsec; i++ {
		fmt.Fprintf(sf, "SYN%04d,Synthetic %d,Sector %d,USD,%d\n", i, i, i%11, 1000000+i)
	}
	if err := sf.Close(); err != nil {
		tb.Fatal(err)
	}
	pf, err := os.Create(prices)
	if err != nil {
		tb.Fatal(err)
	}
	w := bufio.NewWriter(pf)
	fmt.Fprintln(w, "date,security_id,close,dividend,split_ratio")
	d := time.Date(2000, 1, 3, 0, 0, 0, 0, time.UTC)
	for row := 0; row < n; {
		if wd := d.Weekday(); wd != time.Saturday && wd != time.Sunday {
			ds := d.Format(time.DateOnly)
			for s := 0; s < nsec && row < n; s++ {
				fmt.Fprintf(w, "%s,SYN%04d,%d.%04d,0,1\n", ds, s, 10+(row*7919)%990, (row*104729)%10000)
				row++
			}
		}
		d = d.AddDate(0, 0, 1)
	}
	if err := w.Flush(); err != nil {
		tb.Fatal(err)
	}
	if err := pf.Close(); err != nil {
		tb.Fatal(err)
	}
	return securities, prices
}

// BenchmarkIngestPrices1M ingests a 1,000,000-row prices file into a
// fresh database (securities loaded beforehand, outside the timer).
func BenchmarkIngestPrices1M(b *testing.B) {
	const rows = 1000000
	dir := b.TempDir()
	secPath, pricePath := writePricesCSV(b, dir, rows, 400)
	ctx := context.Background()
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		db, err := Open(ctx, filepath.Join(dir, fmt.Sprintf("bench%d.db", i)))
		if err != nil {
			b.Fatal(err)
		}
		if res, err := db.Ingest(ctx, []string{secPath}, IngestOptions{}); err != nil || res[0].Outcome != Accepted {
			b.Fatalf("securities: %v %+v", err, res)
		}
		b.StartTimer()
		res, err := db.Ingest(ctx, []string{pricePath}, IngestOptions{})
		b.StopTimer()
		if err != nil || res[0].Outcome != Accepted || res[0].Rows != rows {
			b.Fatalf("prices: %v %+v", err, res)
		}
		db.Close()
		b.StartTimer()
	}
	b.ReportMetric(float64(rows)*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
}
