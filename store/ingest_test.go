package store

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// day parses a YYYY-MM-DD test date.
func day(s string) time.Time {
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		panic(err)
	}
	return t
}

// baseDB is a database with the fixture portfolios and securities.
func baseDB(t *testing.T) *DB {
	t.Helper()
	db := openTestDB(t)
	res := ingest(t, db, IngestOptions{}, writeFiles(t, "portfolios.csv", portfoliosCSV, "securities.csv", securitiesCSV)...)
	for _, r := range res {
		if r.Outcome != Accepted {
			t.Fatalf("fixture %s: %v", r.Name, r.Err())
		}
	}
	return db
}

const (
	hdrPortfolios  = "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method\n"
	hdrSecurities  = "security_id,security_name,sector,currency,shares_outstanding\n"
	hdrAssumptions = "security_id,effective_date,annual_dividend,frequency,growth,beta,discount_rate,stages\n"
	hdrPrices      = "date,security_id,close,dividend,split_ratio\n"
	hdrYields      = "date,tenor_months,yield\n"
	hdrPremiums    = "date,equity_risk_premium\n"
	hdrHoldings    = "as_of,portfolio_id,security_id,quantity,price\n"
	hdrFlows       = "date,portfolio_id,amount\n"
)

// One case per validation rule: each bad input must be refused with
// exactly the expected error (file, line, column, value, rule), and the
// file must leave nothing behind but its rejected ledger row. The rules
// are those of the input formats in the project contract.
func TestIngestValidationRules(t *testing.T) {
	const dateRule = "is not a valid date (YYYY-MM-DD, years 1900 to 2199)"
	// The contract's example: line 14 of a holdings file (blank lines
	// count as lines).
	holdings := ""
	holdings = hdrHoldings + "2026-03-06,PF-GROWTH,QLMB,10,41.9\n" + strings.Repeat("\n", 11) +
		"2026-03-06,PF-GROWTH,VNTR.A,\"12,5\",9.25\n"

	wide := strings.Repeat("col,", 4999) + "col\n1\n"
	cases := []struct {
		name, file, content string
		want                RowError
	}{
		// portfolios
		{"portfolio id", "p.csv", hdrPortfolios + "pf-1,A,B,2020-01-02,value\n",
			RowError{Line: 2, Column: "portfolio_id", Value: "pf-1", Rule: "is not a valid " + portfolioIDRule}},
		{"portfolio id too long", "p.csv", hdrPortfolios + "P" + strings.Repeat("X", 32) + ",A,B,2020-01-02,value\n",
			RowError{Line: 2, Column: "portfolio_id", Value: "P" + strings.Repeat("X", 32), Rule: "is not a valid " + portfolioIDRule}},
		{"portfolio name empty", "p.csv", hdrPortfolios + "PF-X,,B,2020-01-02,value\n",
			RowError{Line: 2, Column: "portfolio_name", Rule: "is empty; a value is required"}},
		{"strategy control character", "p.csv", hdrPortfolios + "PF-X,A,\"two\nlines\",2020-01-02,value\n",
			RowError{Line: 2, Column: "strategy", Value: "two\nlines", Rule: "contains a control character"}},
		{"inception 30 February", "p.csv", hdrPortfolios + "PF-X,A,B,2026-02-30,value\n",
			RowError{Line: 2, Column: "inception_date", Value: "2026-02-30", Rule: dateRule}},
		{"inception not ISO", "p.csv", hdrPortfolios + "PF-X,A,B,02/01/2020,value\n",
			RowError{Line: 2, Column: "inception_date", Value: "02/01/2020", Rule: dateRule}},
		{"benchmark method", "p.csv", hdrPortfolios + "PF-X,A,B,2020-01-02,cap\n",
			RowError{Line: 2, Column: "benchmark_method", Value: "cap", Rule: "is not one of value, price, equal, equal_geometric"}},
		// securities
		{"security id", "s.csv", hdrSecurities + "1ABC,A,B,USD,10\n",
			RowError{Line: 2, Column: "security_id", Value: "1ABC", Rule: "is not a valid " + securityIDRule}},
		{"security id CASH", "s.csv", hdrSecurities + "CASH,A,B,USD,10\n",
			RowError{Line: 2, Column: "security_id", Value: "CASH", Rule: "is reserved for the cash line of holdings"}},
		{"currency not base", "s.csv", hdrSecurities + "NEWCO,A,B,EUR,10\n",
			RowError{Line: 2, Column: "currency", Value: "EUR", Rule: "is not the base currency USD; FX is not supported yet"}},
		{"currency lower case", "s.csv", hdrSecurities + "NEWCO,A,B,usd,10\n",
			RowError{Line: 2, Column: "currency", Value: "usd", Rule: "is not a valid currency (three capital letters, ISO 4217)"}},
		{"shares zero", "s.csv", hdrSecurities + "NEWCO,A,B,USD,0\n",
			RowError{Line: 2, Column: "shares_outstanding", Value: "0", Rule: "must be > 0"}},
		{"shares thousands separator", "s.csv", hdrSecurities + "NEWCO,A,B,USD,\"1,000\"\n",
			RowError{Line: 2, Column: "shares_outstanding", Value: "1,000", Rule: "is not a number"}},
		// assumptions
		{"assumption unknown security", "a.csv", hdrAssumptions + "NOPE,2026-01-01,1,4,0.03,,,\n",
			RowError{Line: 2, Column: "security_id", Value: "NOPE", Rule: "is not a known security; load it with a securities file first"}},
		{"dividend negative", "a.csv", hdrAssumptions + "QLMB,2026-01-01,-1,4,0.03,,,\n",
			RowError{Line: 2, Column: "annual_dividend", Value: "-1", Rule: "must be >= 0"}},
		{"frequency 3", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,3,0.03,,,\n",
			RowError{Line: 2, Column: "frequency", Value: "3", Rule: "must be 1, 2, 4 or 12 payments a year"}},
		{"growth 1", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,1,,,\n",
			RowError{Line: 2, Column: "growth", Value: "1", Rule: "must be a decimal > -1 and < 1; 0.03 means 3%"}},
		{"beta not a number", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,0.03,high,,\n",
			RowError{Line: 2, Column: "beta", Value: "high", Rule: "is not a number"}},
		{"discount rate zero", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,0.03,,0,\n",
			RowError{Line: 2, Column: "discount_rate", Value: "0", Rule: "must be > 0 when given"}},
		{"stage years zero", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,0.03,,,3:0.09;0:0.05\n",
			RowError{Line: 2, Column: "stages", Value: "3:0.09;0:0.05", Rule: "stage 2: years must be a whole number > 0"}},
		{"stage shape", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,0.03,,,3\n",
			RowError{Line: 2, Column: "stages", Value: "3", Rule: "stage 1: want years:growth or years:growth:rate"}},
		{"stage growth", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,0.03,,,3:-1\n",
			RowError{Line: 2, Column: "stages", Value: "3:-1", Rule: "stage 1: growth must be a decimal > -1"}},
		{"stage rate", "a.csv", hdrAssumptions + "QLMB,2026-01-01,1,4,0.03,,,3:0.1:0\n",
			RowError{Line: 2, Column: "stages", Value: "3:0.1:0", Rule: "stage 1: rate must be a decimal > 0"}},
		// prices
		{"close negative", "x.csv", hdrPrices + "2026-03-02,QLMB,-1,,\n",
			RowError{Line: 2, Column: "close", Value: "-1", Rule: "must be > 0"}},
		{"close exponent", "x.csv", hdrPrices + "2026-03-02,QLMB,1e3,,\n",
			RowError{Line: 2, Column: "close", Value: "1e3", Rule: "is not a number"}},
		{"close decimal comma", "x.csv", hdrPrices + "2026-03-02,QLMB,\"12,5\",,\n",
			RowError{Line: 2, Column: "close", Value: "12,5", Rule: "is not a number"}},
		{"close missing", "x.csv", hdrPrices + "2026-03-02,QLMB,,,\n",
			RowError{Line: 2, Column: "close", Rule: "is empty; a value is required"}},
		{"dividend negative", "x.csv", hdrPrices + "2026-03-02,QLMB,10,-0.1,\n",
			RowError{Line: 2, Column: "dividend", Value: "-0.1", Rule: "must be >= 0"}},
		{"split zero", "x.csv", hdrPrices + "2026-03-02,QLMB,10,,0\n",
			RowError{Line: 2, Column: "split_ratio", Value: "0", Rule: "must be > 0 (new shares per old share)"}},
		{"price on a Saturday", "x.csv", hdrPrices + "2026-03-07,QLMB,10,,\n",
			RowError{Line: 2, Column: "date", Value: "2026-03-07", Rule: "is a Saturday; prices are for trading days, Monday to Friday"}},
		{"price on 30 February", "x.csv", hdrPrices + "2026-02-30,QLMB,10,,\n",
			RowError{Line: 2, Column: "date", Value: "2026-02-30", Rule: dateRule}},
		{"price on 29 February 2100", "x.csv", hdrPrices + "2100-02-29,QLMB,10,,\n",
			RowError{Line: 2, Column: "date", Value: "2100-02-29", Rule: dateRule}},
		{"price unknown security", "x.csv", hdrPrices + "2026-03-02,ZZZZ,10,,\n",
			RowError{Line: 2, Column: "security_id", Value: "ZZZZ", Rule: "is not a known security; load it with a securities file first"}},
		{"price duplicate key in file", "x.csv", hdrPrices + "2026-03-02,QLMB,10,,\n2026-03-03,QLMB,10,,\n2026-03-02,QLMB,10,,\n",
			RowError{Line: 4, Column: "security_id", Value: "QLMB", Rule: "repeats the key (2026-03-02, QLMB) of line 2"}},
		{"ragged row", "x.csv", hdrPrices + "2026-03-02,QLMB,10,\n",
			RowError{Line: 2, Rule: "has 4 fields; the header has 5"}},
		// yields, premiums
		{"tenor zero", "y.csv", hdrYields + "2026-03-06,0,0.04\n",
			RowError{Line: 2, Column: "tenor_months", Value: "0", Rule: "must be between 1 and 600 months"}},
		{"tenor fractional", "y.csv", hdrYields + "2026-03-06,1.5,0.04\n",
			RowError{Line: 2, Column: "tenor_months", Value: "1.5", Rule: "is not a whole number"}},
		{"yield in percent", "y.csv", hdrYields + "2026-03-06,12,4.1\n",
			RowError{Line: 2, Column: "yield", Value: "4.1", Rule: "must be a decimal between -0.05 and 0.5 (exclusive); 0.05 means 5%"}},
		{"duplicate tenor", "y.csv", hdrYields + "2026-03-06,12,0.04\n2026-03-06,12,0.04\n",
			RowError{Line: 3, Column: "tenor_months", Value: "12", Rule: "repeats the key (2026-03-06, 12) of line 2"}},
		{"premium 0.5", "e.csv", hdrPremiums + "2026-03-06,0.5\n",
			RowError{Line: 2, Column: "equity_risk_premium", Value: "0.5", Rule: "must be a decimal >= 0 and < 0.5; 0.05 means 5%"}},
		{"premium negative", "e.csv", hdrPremiums + "2026-03-06,-0.01\n",
			RowError{Line: 2, Column: "equity_risk_premium", Value: "-0.01", Rule: "must be a decimal >= 0 and < 0.5; 0.05 means 5%"}},
		// holdings
		{"holdings quantity with decimal comma", "holdings-2026-03-06.csv", holdings,
			RowError{Line: 14, Column: "quantity", Value: "12,5", Rule: "is not a number"}},
		{"holdings unknown portfolio", "h.csv", hdrHoldings + "2026-03-06,PF-NONE,QLMB,10,41.9\n",
			RowError{Line: 2, Column: "portfolio_id", Value: "PF-NONE", Rule: "is not a known portfolio; load it with a portfolios file first"}},
		{"holdings cash price", "h.csv", hdrHoldings + "2026-03-06,PF-GROWTH,CASH,-10,2\n",
			RowError{Line: 2, Column: "price", Value: "2", Rule: "must be 1 on the CASH line, whose quantity is the cash amount"}},
		{"holdings negative shares", "h.csv", hdrHoldings + "2026-03-06,PF-GROWTH,QLMB,-10,41.9\n",
			RowError{Line: 2, Column: "quantity", Value: "-10", Rule: "must be >= 0 shares; only the CASH line may be negative"}},
		{"holdings price zero", "h.csv", hdrHoldings + "2026-03-06,PF-GROWTH,QLMB,10,0\n",
			RowError{Line: 2, Column: "price", Value: "0", Rule: "must be > 0"}},
		{"holdings security twice", "h.csv", hdrHoldings + "2026-03-06,PF-GROWTH,QLMB,10,41.9\n2026-03-06,PF-GROWTH,QLMB,5,41.9\n",
			RowError{Line: 3, Column: "security_id", Value: "QLMB", Rule: "appears twice in the snapshot of PF-GROWTH on 2026-03-06 (first on line 2)"}},
		// flows
		{"flow zero", "f.csv", hdrFlows + "2026-03-04,PF-GROWTH,0\n",
			RowError{Line: 2, Column: "amount", Value: "0", Rule: "must not be 0 (+ in, - out)"}},
		{"flow unknown portfolio", "f.csv", hdrFlows + "2026-03-04,PF-NONE,100\n",
			RowError{Line: 2, Column: "portfolio_id", Value: "PF-NONE", Rule: "is not a known portfolio; load it with a portfolios file first"}},
		{"flow twice a day", "f.csv", hdrFlows + "2026-03-04,PF-GROWTH,100\n2026-03-04,PF-GROWTH,50\n",
			RowError{Line: 3, Column: "portfolio_id", Value: "PF-GROWTH", Rule: "repeats the key (2026-03-04, PF-GROWTH) of line 2"}},
		// the file as a whole
		{"empty file", "empty.csv", "",
			RowError{Line: 0, Rule: "the file is empty; the first line must be a header"}},
		{"unknown header", "u.csv", "Date,Security,Close\n2026-03-02,QLMB,1\n",
			RowError{Line: 1, Column: "header", Value: "Date,Security,Close", Rule: "is not a known header; the closest is prices, whose header is exactly date,security_id,close,dividend,split_ratio"}},
		{"header of nothing known", "u.csv", "alpha,gamma\n1,2\n",
			RowError{Line: 1, Column: "header", Value: "alpha,gamma", Rule: "is not the header of any input kind (portfolios, securities, assumptions, prices, yields, premiums, holdings, flows)"}},
		{"5000 columns", "wide.csv", wide,
			RowError{Line: 1, Column: "header", Rule: "has 5000 columns; it is not the header of any input kind"}},
		{"non-UTF-8 byte", "latin1.csv", hdrSecurities + "NEWCO,A,B,USD,10\nCAFE,Caf\xe9 Lumi\xe8re,B,USD,10\n",
			RowError{Line: 3, Rule: "the line is not valid UTF-8"}},
		{"unterminated quote", "q.csv", hdrPrices + "2026-03-02,\"QLMB,10,,\n",
			RowError{Line: 2, Rule: "the quoted field is not closed before the end of the file"}},
		{"quote inside unquoted field", "q.csv", hdrPrices + "2026-03-02,QL\"MB,10,,\n",
			RowError{Line: 2, Rule: "field 2: a quote inside an unquoted field; enclose the field in quotes and double the quote"}},
		{"text after closing quote", "q.csv", hdrPrices + "2026-03-02,\"QLMB\"x,10,,\n",
			RowError{Line: 2, Rule: "field 2: 'x' after a closing quote; a quote inside a quoted field must be doubled"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			db := baseDB(t)
			before := tableCounts(t, db)
			res := ingest(t, db, IngestOptions{}, writeFiles(t, tc.file, tc.content)...)
			if len(res) != 1 {
				t.Fatalf("%d results, want 1", len(res))
			}
			r := res[0]
			if r.Outcome != Rejected {
				t.Fatalf("outcome %s, want rejected", r.Outcome)
			}
			want := tc.want
			want.File = tc.file
			if len(r.Errors) != 1 || r.Errors[0] != want {
				t.Fatalf("errors:\n%v\nwant exactly:\n%v", r.Err(), &want)
			}
			if after := tableCounts(t, db); after != before {
				t.Errorf("rows changed by a rejected file: %v -> %v", before, after)
			}
			led, err := db.Ledger(context.Background())
			if err != nil {
				t.Fatal(err)
			}
			last := led[len(led)-1]
			if last.Name != tc.file || last.Outcome != Rejected || last.Error != want.Error() {
				t.Errorf("ledger row %+v, want rejected %s with error %q", last, tc.file, want.Error())
			}
		})
	}
}

// tableCounts returns the row counts of the input tables.
func tableCounts(t *testing.T, db *DB) [10]int {
	t.Helper()
	var n [10]int
	for i, tb := range []string{"portfolios", "securities", "assumptions", "assumption_stages", "holding_snapshots",
		"holding_lines", "prices", "yields", "premiums", "flows"} {
		n[i] = count(t, db, tb)
	}
	return n
}

// Every error of a file is reported, in line order, up to the cap.
func TestIngestReportsAllErrorsUpToCap(t *testing.T) {
	db := baseDB(t)
	content := hdrPrices +
		"2026-03-02,QLMB,-1,,\n" + // close
		"2026-03-02,VNTR.A,10,-1,0\n" + // dividend and split
		"2026-03-03,QLMB,10,,\n" + // fine
		"2026-03-04,NOPE,10,,\n" // security
	res := ingest(t, db, IngestOptions{}, writeFiles(t, "p.csv", content)...)
	var got []string
	for _, e := range res[0].Errors {
		got = append(got, e.Column+"@"+strconv.Itoa(e.Line))
	}
	if want := "close@2 dividend@3 split_ratio@3 security_id@5"; strings.Join(got, " ") != want || res[0].ErrorsTruncated {
		t.Errorf("errors %v (truncated %v), want %s", got, res[0].ErrorsTruncated, want)
	}

	capped := ingest(t, db, IngestOptions{MaxErrors: 2}, writeFiles(t, "p2.csv", content)...)[0]
	if len(capped.Errors) != 2 || !capped.ErrorsTruncated {
		t.Errorf("with MaxErrors 2: %d errors, truncated %v; want 2, true", len(capped.Errors), capped.ErrorsTruncated)
	}
	// 60 bad rows and the default cap of 50.
	many := hdrPrices + strings.Repeat("2026-03-02,QLMB,-1,,\n", 60)
	def := ingest(t, db, IngestOptions{}, writeFiles(t, "p3.csv", many)...)[0]
	if len(def.Errors) != defaultMaxErrors || !def.ErrorsTruncated {
		t.Errorf("default cap: %d errors, truncated %v; want %d, true", len(def.Errors), def.ErrorsTruncated, defaultMaxErrors)
	}
}

// Input forms that must be accepted: a byte-order mark, CRLF line ends,
// RFC 4180 quoting (comma, doubled quote, line break inside quotes), blank
// lines (trailing or not), a missing final newline, a header-only file.
func TestIngestAcceptsCSVForms(t *testing.T) {
	cases := []struct {
		name, content string
		rows          int
	}{
		{"byte-order mark", "\xEF\xBB\xBF" + hdrSecurities + "NEWCO,Newco,Tech,USD,10\n", 1},
		{"CRLF", strings.ReplaceAll(hdrSecurities+"NEWCO,Newco,Tech,USD,10\nOTHR,Other,Tech,USD,5\n", "\n", "\r\n"), 2},
		{"quoted fields", hdrSecurities + "\"NEWCO\",\"Newco, \"\"the\"\" firm\",\"Tech\",USD,\"10\"\n", 1},
		{"quoted header", "\"security_id\",\"security_name\",sector,currency,shares_outstanding\nNEWCO,Newco,Tech,USD,10\n", 1},
		{"blank trailing line", hdrSecurities + "NEWCO,Newco,Tech,USD,10\n\n", 1},
		{"blank lines between", hdrSecurities + "\nNEWCO,Newco,Tech,USD,10\r\n\r\nOTHR,Other,Tech,USD,5\n\n\n", 2},
		{"no final newline", hdrSecurities + "NEWCO,Newco,Tech,USD,10", 1},
		{"header only", hdrSecurities, 0},
		{"BOM, CRLF and quotes", "\xEF\xBB\xBF" + strings.ReplaceAll(hdrSecurities, "\n", "\r\n") + "NEWCO,\"Newco, \"\"holding\"\"\",Tech,USD,10\r\n", 1},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			db := openTestDB(t)
			r := ingest(t, db, IngestOptions{}, writeFiles(t, "s.csv", tc.content)...)[0]
			if r.Outcome != Accepted || r.Kind != KindSecurities || r.Rows != tc.rows {
				t.Fatalf("outcome %s kind %s rows %d, want accepted securities %d: %v", r.Outcome, r.Kind, r.Rows, tc.rows, r.Err())
			}
			secs, err := db.Securities(context.Background())
			if err != nil {
				t.Fatal(err)
			}
			if len(secs) != tc.rows {
				t.Fatalf("%d securities stored, want %d", len(secs), tc.rows)
			}
			if tc.rows > 0 && secs[0].ID != "NEWCO" {
				t.Errorf("first security %q, want NEWCO (BOM or quotes left in the id?)", secs[0].ID)
			}
		})
	}
	// The quoted name keeps its comma and quotes.
	db := openTestDB(t)
	ingest(t, db, IngestOptions{}, writeFiles(t, "s.csv", hdrSecurities+"\"NEWCO\",\"Newco, \"\"the\"\" firm\",\"Tech\",USD,\"10\"\n")...)
	secs, _ := db.Securities(context.Background())
	if len(secs) != 1 || secs[0].Name != `Newco, "the" firm` {
		t.Errorf("quoted name stored as %+v", secs)
	}
}

// A file whose content was accepted before is a no-op, reported as a
// duplicate and recorded in the ledger; nothing else changes.
func TestIngestIdempotent(t *testing.T) {
	db := openTestDB(t)
	paths := writeFiles(t, "portfolios.csv", portfoliosCSV, "securities.csv", securitiesCSV, "prices.csv", pricesCSV,
		"holdings.csv", holdingsCSV, "assumptions.csv", assumptionsCSV, "yields.csv", yieldsCSV,
		"premiums.csv", premiumsCSV, "flows.csv", flowsCSV)
	first := ingest(t, db, IngestOptions{}, paths...)
	for _, r := range first {
		if r.Outcome != Accepted {
			t.Fatalf("%s: %s %v", r.Name, r.Outcome, r.Err())
		}
	}
	before := tableCounts(t, db)
	second := ingest(t, db, IngestOptions{}, paths...)
	for i, r := range second {
		if r.Outcome != Duplicate || r.DuplicateOf != first[i].Name || r.Rows != first[i].Rows || r.Kind != first[i].Kind {
			t.Errorf("%s again: %+v, want a duplicate of %s with %d rows", r.Name, r, first[i].Name, first[i].Rows)
		}
	}
	if after := tableCounts(t, db); after != before {
		t.Errorf("row counts changed on re-ingest: %v -> %v", before, after)
	}
	led, err := db.Ledger(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	dups := 0
	for _, e := range led {
		if e.Outcome == Duplicate {
			dups++
		}
	}
	if dups != len(paths) {
		t.Errorf("%d duplicate rows in the ledger, want %d", dups, len(paths))
	}
}

// Rows identical to stored ones are no-ops; a different value for a
// stored key is an error naming the stored value and where it came from.
func TestIngestRepeatedAndConflictingRows(t *testing.T) {
	db := baseDB(t)
	ingest(t, db, IngestOptions{}, writeFiles(t, "prices.csv", pricesCSV)...)
	n := count(t, db, "prices")

	// Same values, written differently (41.2 vs 41.20, 0 vs empty), plus a new row.
	again := hdrPrices + "2026-03-02,QLMB,41.2,0,1\n2026-03-04,QLMB,41.6,,\n"
	r := ingest(t, db, IngestOptions{}, writeFiles(t, "prices-again.csv", again)...)[0]
	if r.Outcome != Accepted || r.Unchanged != 1 || count(t, db, "prices") != n+1 {
		t.Fatalf("repeat: %s unchanged %d rows %d, want accepted, 1 unchanged, %d rows: %v",
			r.Outcome, r.Unchanged, count(t, db, "prices"), n+1, r.Err())
	}

	conflict := hdrPrices + "2026-03-02,QLMB,41.30,,\n2026-03-03,VNTR.A,9.10,0.05,2\n"
	r = ingest(t, db, IngestOptions{}, writeFiles(t, "prices-fix.csv", conflict)...)[0]
	want := []string{
		`prices-fix.csv:2: close: "41.30" differs from the value 41.2 stored from prices.csv line 2`,
		`prices-fix.csv:3: dividend: "0.05" differs from the value 0 stored from prices.csv line 5`,
	}
	var got []string
	for i := range r.Errors {
		got = append(got, r.Errors[i].Error())
	}
	if r.Outcome != Rejected || strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("conflict: %s\n%s\nwant:\n%s", r.Outcome, strings.Join(got, "\n"), strings.Join(want, "\n"))
	}

	// The same for a portfolio and an assumption's stages.
	ingest(t, db, IngestOptions{}, writeFiles(t, "assumptions.csv", assumptionsCSV)...)
	r = ingest(t, db, IngestOptions{}, writeFiles(t, "p.csv", hdrPortfolios+"PF-GROWTH,Harbour Growth,Dividend growth,2020-01-02,price\n",
		"a.csv", hdrAssumptions+"QLMB,2026-01-01,1.60,4,0.03,0.8,,3:0.09;2:0.06\n")...)[1]
	if len(r.Errors) != 1 || r.Errors[0].Error() != `a.csv:2: stages: "3:0.09;2:0.06" differs from the stages "3:0.09;2:0.06:0.095" stored from assumptions.csv line 2` {
		t.Errorf("assumption conflict: %v", r.Err())
	}
	r = ingest(t, db, IngestOptions{}, writeFiles(t, "p.csv", hdrPortfolios+"PF-GROWTH,Harbour Growth,Dividend growth,2020-01-02,price\n")...)[0]
	if len(r.Errors) != 1 || r.Errors[0].Error() != `p.csv:2: benchmark_method: "price" differs from the value "value" stored from portfolios.csv line 2` {
		t.Errorf("portfolio conflict: %v", r.Err())
	}
	r = ingest(t, db, IngestOptions{}, writeFiles(t, "a2.csv", hdrAssumptions+"QLMB,2026-01-01,1.6,4,0.03,0.8,,3:0.09;2:0.06:0.095\n")...)[0]
	if r.Outcome != Accepted || r.Unchanged != 1 {
		t.Errorf("identical assumption: %s unchanged %d: %v", r.Outcome, r.Unchanged, r.Err())
	}
}

// A failure half-way through a file leaves nothing of it behind, and
// the ledger says rejected.
func TestIngestAtomic(t *testing.T) {
	db := baseDB(t)
	dir := t.TempDir()
	sec, prices := writePricesCSV(t, dir, 1000, 10)
	ingest(t, db, IngestOptions{}, sec)
	before := tableCounts(t, db)
	ledBefore, _ := db.Ledger(context.Background())

	r := ingest(t, db, IngestOptions{failAfterRows: 500}, prices)[0]
	if r.Outcome != Rejected || len(r.Errors) != 1 || r.Errors[0].Rule != "injected failure after 500 rows" || r.Errors[0].Line != 501 {
		t.Fatalf("injected failure: %+v", r)
	}
	if after := tableCounts(t, db); after != before {
		t.Errorf("rows left behind: %v -> %v", before, after)
	}
	led, _ := db.Ledger(context.Background())
	if len(led) != len(ledBefore)+1 || led[len(led)-1].Outcome != Rejected || led[len(led)-1].Rows != 500 {
		t.Errorf("ledger after failure: %+v", led[len(led)-1])
	}
	// The same file goes in whole once the failure is gone.
	r = ingest(t, db, IngestOptions{}, prices)[0]
	if r.Outcome != Accepted || count(t, db, "prices") != 1000 {
		t.Errorf("retry: %s with %d prices stored, want accepted and 1000", r.Outcome, count(t, db, "prices"))
	}
}

// A corrected holdings file becomes a new revision; the old rows stay,
// marked superseded, and Holdings returns the new one.
func TestIngestHoldingsSupersede(t *testing.T) {
	ctx := context.Background()
	db := baseDB(t)
	first := ingest(t, db, IngestOptions{}, writeFiles(t, "holdings-2026-03-06.csv", holdingsCSV)...)[0]
	if first.Outcome != Accepted || len(first.Snapshots) != 1 || first.Snapshots[0].Revision != 1 || first.Snapshots[0].Supersedes != 0 {
		t.Fatalf("first file: %+v", first)
	}
	corrected := hdrHoldings +
		"2026-03-06,PF-GROWTH,QLMB,1200,41.90\n" +
		"2026-03-06,PF-GROWTH,CASH,-9880.50,1\n" +
		"2026-03-06,PF-INCOME,OSPX,500,22.10\n"
	second := ingest(t, db, IngestOptions{}, writeFiles(t, "holdings-2026-03-06-fix.csv", corrected)...)[0]
	if second.Outcome != Accepted || len(second.Snapshots) != 2 {
		t.Fatalf("corrected file: %+v %v", second, second.Err())
	}
	if s := second.Snapshots[0]; s.Portfolio != "PF-GROWTH" || s.Revision != 2 || s.Supersedes != 1 || s.Unchanged {
		t.Errorf("PF-GROWTH snapshot %+v, want revision 2 superseding 1", s)
	}
	if s := second.Snapshots[1]; s.Portfolio != "PF-INCOME" || s.Revision != 1 || s.Supersedes != 0 {
		t.Errorf("PF-INCOME snapshot %+v, want revision 1", s)
	}
	h, err := db.Holdings(ctx, "PF-GROWTH", day("2026-03-09"))
	if err != nil {
		t.Fatal(err)
	}
	if h.Revision != 2 || !h.AsOf.Equal(day("2026-03-06")) || h.SourceFile != "holdings-2026-03-06-fix.csv" || len(h.Lines) != 2 ||
		h.Lines[0] != (HoldingLine{"CASH", -9880.50, 1}) || h.Lines[1] != (HoldingLine{"QLMB", 1200, 41.90}) {
		t.Errorf("Holdings = %+v", h)
	}
	revs, err := db.HoldingsRevisions(ctx, "PF-GROWTH", day("2026-03-06"))
	if err != nil {
		t.Fatal(err)
	}
	if len(revs) != 2 || revs[0].SupersededBy != 2 || len(revs[0].Lines) != 3 || revs[1].SupersededBy != 0 {
		t.Errorf("revisions %+v", revs)
	}
	// The superseded rows are still in the table, marked.
	var superseded int
	if err := db.sql.QueryRow(`SELECT count(*) FROM holding_lines l JOIN holding_snapshots s ON s.id = l.snapshot_id
WHERE s.superseded_by IS NOT NULL`).Scan(&superseded); err != nil || superseded != 3 {
		t.Errorf("superseded lines %d (%v), want 3", superseded, err)
	}
	// The same snapshot again (another file, lines reordered) changes nothing.
	same := hdrHoldings + "2026-03-06,PF-GROWTH,CASH,-9880.5,1\n2026-03-06,PF-GROWTH,QLMB,1200,41.9\n"
	third := ingest(t, db, IngestOptions{}, writeFiles(t, "h3.csv", same)...)[0]
	if third.Outcome != Accepted || !third.Snapshots[0].Unchanged || third.Snapshots[0].Revision != 2 || count(t, db, "holding_snapshots") != 3 {
		t.Errorf("identical snapshot: %+v, %d snapshots", third, count(t, db, "holding_snapshots"))
	}
	// Before the first snapshot there are no holdings.
	if _, err := db.Holdings(ctx, "PF-GROWTH", day("2026-03-05")); !errors.Is(err, ErrNotFound) {
		t.Errorf("Holdings before any snapshot: %v, want ErrNotFound", err)
	}
}

// Files of one call load in dependency order whatever the order given,
// and folders contribute their .csv files.
func TestIngestDependencyOrderAndFolders(t *testing.T) {
	db := openTestDB(t)
	dir := t.TempDir()
	files := map[string]string{
		"a-holdings.csv": holdingsCSV, "b-prices.csv": pricesCSV, "c-flows.csv": flowsCSV,
		"d-assumptions.csv": assumptionsCSV, "y-securities.csv": securitiesCSV, "z-portfolios.csv": portfoliosCSV,
		"notes.txt": "not an input", "e-yields.CSV": yieldsCSV,
	}
	for n, c := range files {
		if err := os.WriteFile(filepath.Join(dir, n), []byte(c), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	extra := writeFiles(t, "premiums.csv", premiumsCSV)
	res := ingest(t, db, IngestOptions{}, append([]string{dir}, extra...)...)
	var order []string
	for _, r := range res {
		if r.Outcome != Accepted {
			t.Errorf("%s: %s %v", r.Name, r.Outcome, r.Err())
		}
		order = append(order, string(r.Kind))
	}
	want := "portfolios securities assumptions prices yields premiums holdings flows"
	if strings.Join(order, " ") != want {
		t.Errorf("load order %v, want %s", order, want)
	}
	if _, err := db.Ingest(context.Background(), []string{filepath.Join(dir, "missing.csv")}, IngestOptions{}); err == nil {
		t.Error("a missing path is not an error")
	}
}

// The database refuses to be written through a read-only handle.
func TestIngestReadOnly(t *testing.T) {
	db := openTestDB(t)
	path := db.Path()
	ro, err := OpenReadOnly(context.Background(), path)
	if err != nil {
		t.Fatal(err)
	}
	defer ro.Close()
	if _, err := ro.Ingest(context.Background(), writeFiles(t, "s.csv", securitiesCSV), IngestOptions{}); err == nil {
		t.Error("Ingest through OpenReadOnly succeeded")
	}
}

// Two processes ingesting the same file at once: one accepts it, the
// other reports a duplicate (whether it notices before or after taking
// the write lock), and the rows are stored once.
func TestIngestConcurrentSameFile(t *testing.T) {
	ctx := context.Background()
	db := baseDB(t)
	other, err := Open(ctx, db.Path())
	if err != nil {
		t.Fatal(err)
	}
	defer other.Close()
	_, prices := writePricesCSV(t, t.TempDir(), 3000, 3)
	// writePricesCSV's securities are SYN0000..; load them first.
	secs := hdrSecurities + "SYN0000,A,B,USD,1\nSYN0001,A,B,USD,1\nSYN0002,A,B,USD,1\n"
	ingest(t, db, IngestOptions{}, writeFiles(t, "syn.csv", secs)...)
	type out struct {
		res []FileResult
		err error
	}
	ch := make(chan out, 2)
	for _, h := range []*DB{db, other} {
		go func(h *DB) {
			res, err := h.Ingest(ctx, []string{prices}, IngestOptions{})
			ch <- out{res, err}
		}(h)
	}
	outcomes := map[Outcome]int{}
	for i := 0; i < 2; i++ {
		o := <-ch
		if o.err != nil {
			t.Fatal(o.err)
		}
		outcomes[o.res[0].Outcome]++
	}
	if outcomes[Accepted] != 1 || outcomes[Duplicate] != 1 || count(t, db, "prices") != 3000 {
		t.Errorf("outcomes %v, %d prices; want one accepted, one duplicate, 3000", outcomes, count(t, db, "prices"))
	}
}

// If the content was accepted between the duplicate check and the write
// lock, load notices from the ledger's unique index.
func TestIngestLateDuplicate(t *testing.T) {
	ctx := context.Background()
	db := baseDB(t)
	led, _ := db.Ledger(ctx)
	conn, err := db.sql.Conn(ctx)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	err = conn.Raw(func(dc any) error {
		c, err := newRawConn(dc)
		if err != nil {
			return err
		}
		defer c.close()
		res := FileResult{Path: "p.csv", Name: "p.csv", SHA256: led[0].SHA256}
		return c.load(ctx, strings.NewReader(portfoliosCSV), nil, IngestOptions{}.withDefaults(), &res, func(bool) {})
	})
	if !errors.Is(err, errLateDuplicate) {
		t.Errorf("load of accepted content: %v, want errLateDuplicate", err)
	}
}

// Prices go in batches; a batch refused by the database is replayed row
// by row, so the errors still name the right lines and repeated rows
// still count as unchanged.
func TestIngestPriceBatches(t *testing.T) {
	db := baseDB(t)
	// 150 weekdays of QLMB from 2026-01-05: more than two batches.
	var days []string
	for d := day("2026-01-05"); len(days) < 150; d = d.AddDate(0, 0, 1) {
		if wd := d.Weekday(); wd != time.Saturday && wd != time.Sunday {
			days = append(days, d.Format(time.DateOnly))
		}
	}
	var first strings.Builder
	first.WriteString(hdrPrices)
	for i, d := range days {
		first.WriteString(d + ",QLMB," + strconv.Itoa(40+i%7) + ".5,,\n")
	}
	r := ingest(t, db, IngestOptions{}, writeFiles(t, "first.csv", first.String())...)[0]
	if r.Outcome != Accepted || count(t, db, "prices") != 150 {
		t.Fatalf("first: %s, %d prices: %v", r.Outcome, count(t, db, "prices"), r.Err())
	}

	// The same 150 rows with, on line 101, another close, and on line
	// 140 a new row repeated on line 141 (same batch).
	var second strings.Builder
	second.WriteString(hdrPrices)
	for i, d := range days {
		px := strconv.Itoa(40+i%7) + ".5"
		if i == 99 {
			px = "99"
		}
		second.WriteString(d + ",QLMB," + px + ",,\n")
		if i == 137 {
			second.WriteString(d + ",VNTR.A,9,,\n" + d + ",VNTR.A,9,,\n")
		}
	}
	r = ingest(t, db, IngestOptions{}, writeFiles(t, "second.csv", second.String())...)[0]
	want := []string{
		`second.csv:101: close: "99" differs from the value 41.5 stored from first.csv line 101`, // 40 + 99%7
		`second.csv:141: security_id: "VNTR.A" repeats the key (` + days[137] + `, VNTR.A) of line 140`,
	}
	var got []string
	for i := range r.Errors {
		got = append(got, r.Errors[i].Error())
	}
	if r.Outcome != Rejected || strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("second: %s\n%s\nwant\n%s", r.Outcome, strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	if count(t, db, "prices") != 150 {
		t.Errorf("%d prices after a rejected file, want 150", count(t, db, "prices"))
	}

	// All 150 again plus one new: 150 unchanged, 1 stored.
	again := first.String() + "2026-12-01,QLMB,50,,\n"
	r = ingest(t, db, IngestOptions{}, writeFiles(t, "third.csv", again)...)[0]
	if r.Outcome != Accepted || r.Unchanged != 150 || count(t, db, "prices") != 151 {
		t.Errorf("third: %s, unchanged %d, %d prices: %v", r.Outcome, r.Unchanged, count(t, db, "prices"), r.Err())
	}
}
