// Package storetest helps tests of other packages put into a store
// database the rows that other parts of the program write, such as runs
// and their PDFs, through store's own API.
package storetest

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"plumbline/store"
)

// InsertRun saves a run of portfolioID as of asOf ("YYYY-MM-DD") with pdf
// as its PDF (none when nil) and returns the run id. The portfolio is
// ingested first if needed. The run's results are an empty document: the
// tests using this read only the run's identity and PDF.
func InsertRun(t testing.TB, db *store.DB, portfolioID, asOf string, pdf []byte) int64 {
	t.Helper()
	ctx := context.Background()
	csv := "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method\n" +
		portfolioID + ",Fictional " + portfolioID + ",Dividend growth,2020-01-02,value\n"
	path := filepath.Join(t.TempDir(), "portfolios-"+portfolioID+".csv")
	if err := os.WriteFile(path, []byte(csv), 0o600); err != nil {
		t.Fatal(err)
	}
	res, err := db.Ingest(ctx, []string{path}, store.IngestOptions{})
	if err != nil || len(res) != 1 || res[0].Outcome == store.Rejected {
		t.Fatalf("storetest: ingest portfolio %s: %v %+v", portfolioID, err, res)
	}
	day, err := time.Parse(time.DateOnly, asOf)
	if err != nil {
		t.Fatal(err)
	}
	zero := strings.Repeat("0", 64)
	run, err := db.SaveRun(ctx, store.NewRun{
		PortfolioID: portfolioID, AsOf: day, CreatedAt: day.Add(19 * time.Hour),
		ProgramVersion: "test", ConfigJSON: []byte("{}"), ConfigHash: zero, InputHash: zero,
		ResultsSchema: "test", ResultsJSON: []byte("{}"),
	}, func(*store.Run) (*store.Completion, error) {
		if pdf == nil {
			return nil, nil
		}
		return &store.Completion{PDF: pdf, Pages: 1}, nil
	})
	if err != nil {
		t.Fatalf("storetest: save run: %v", err)
	}
	return run.ID
}

// SHA256 is the hex sha256 of b.
func SHA256(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}
