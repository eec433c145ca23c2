package store

import (
	"bytes"
	"context"
	"fmt"
	"reflect"
	"strings"
	"testing"
	"unicode/utf8"
)

// dryLoad validates and stores data as file name inside a transaction
// that is always rolled back.
func dryLoad(tb testing.TB, db *DB, name string, data []byte, seq int) FileResult {
	tb.Helper()
	ctx := context.Background()
	conn, err := db.sql.Conn(ctx)
	if err != nil {
		tb.Fatal(err)
	}
	defer conn.Close()
	// A made-up digest, so content equal to an accepted file does not
	// collide with it in the ledger.
	res := FileResult{Path: name, Name: name, SHA256: fmt.Sprintf("%064x", seq)}
	err = conn.Raw(func(dc any) error {
		c, err := newRawConn(dc)
		if err != nil {
			return err
		}
		defer c.close()
		return c.load(ctx, bytes.NewReader(data), nil, IngestOptions{dryRun: true}.withDefaults(), &res, func(bool) {})
	})
	if err != nil {
		tb.Fatalf("load returned an error instead of a result: %v", err)
	}
	return res
}

// FuzzReadCSV feeds arbitrary bytes to the CSV reader and the whole
// validate-and-store path. It must never panic or fail other than with a
// rejected result whose errors name the file and a line; where the
// reader accepts the input, encoding/csv (the standard library's RFC 4180
// reader, the reference) must read the same records on the same lines.
//
//	go test -run XXX -fuzz FuzzReadCSV -fuzztime 3m ./store/
func FuzzReadCSV(f *testing.F) {
	for _, s := range []string{portfoliosCSV, securitiesCSV, pricesCSV, holdingsCSV, assumptionsCSV, yieldsCSV,
		premiumsCSV, flowsCSV, "\xEF\xBB\xBF" + pricesCSV, strings.ReplaceAll(holdingsCSV, "\n", "\r\n"),
		hdrPrices + "\"2026-03-02\",\"QLMB\",\"41,2\",\"\"\"\",\n", "\x00\xff\xfe,\"\n", ""} {
		f.Add([]byte(s))
	}
	db := openTestDB(f)
	ingest(f, db, IngestOptions{}, writeFiles(f, "portfolios.csv", portfoliosCSV, "securities.csv", securitiesCSV)...)
	seq := 0
	f.Fuzz(func(t *testing.T, data []byte) {
		seq++
		res := dryLoad(t, db, "fuzz.csv", data, seq)
		switch res.Outcome {
		case Accepted:
			if len(res.Errors) != 0 || res.Kind == "" {
				t.Fatalf("accepted with errors %v, kind %q", res.Err(), res.Kind)
			}
		case Rejected:
			if len(res.Errors) == 0 || len(res.Errors) > defaultMaxErrors {
				t.Fatalf("rejected with %d errors", len(res.Errors))
			}
		default:
			t.Fatalf("outcome %q", res.Outcome)
		}
		lines := bytes.Count(data, []byte{'\n'}) + 1
		for _, e := range res.Errors {
			if e.File != "fuzz.csv" || e.Line < 0 || e.Line > lines || e.Rule == "" || !utf8.ValidString(e.Error()) {
				t.Fatalf("bad error %#v", e)
			}
		}

		// Differential check of the reader alone.
		recs, recLines, errLines, err := readAll(data)
		if err != nil {
			t.Fatalf("reader: %v", err)
		}
		if len(errLines) > 0 {
			return
		}
		want, wantLines, err := referenceRead(data)
		if err != nil {
			t.Fatalf("the reader accepts what encoding/csv refuses (%v): %q", err, data)
		}
		if !reflect.DeepEqual(recs, want) || !reflect.DeepEqual(recLines, wantLines) {
			t.Fatalf("records differ from encoding/csv:\n got %q %v\nwant %q %v", recs, recLines, want, wantLines)
		}
	})
}
