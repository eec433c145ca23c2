package store

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"reflect"
	"strings"
	"testing"
)

// readAll reads every record with csvReader; errs collects the line of
// each malformed record.
func readAll(data []byte) (recs [][]string, lines []int, errLines []int, err error) {
	r := newCSVReader(bytes.NewReader(data))
	for {
		f, line, e := r.next()
		if e == io.EOF {
			return recs, lines, errLines, nil
		}
		var ce *csvError
		if errors.As(e, &ce) {
			errLines = append(errLines, ce.Line)
			continue
		}
		if e != nil {
			return recs, lines, errLines, e
		}
		rec := make([]string, len(f))
		for i := range f {
			rec[i] = string(f[i])
		}
		recs = append(recs, rec)
		lines = append(lines, line)
	}
}

// referenceRead reads data with encoding/csv (the standard library's RFC
// 4180 reader), the reference csvReader must agree with on valid input.
func referenceRead(data []byte) (recs [][]string, lines []int, err error) {
	r := csv.NewReader(bytes.NewReader(bytes.TrimPrefix(data, bom)))
	r.FieldsPerRecord = -1
	for {
		rec, err := r.Read()
		if err == io.EOF {
			return recs, lines, nil
		}
		if err != nil {
			return nil, nil, err
		}
		line, _ := r.FieldPos(0)
		recs = append(recs, rec)
		lines = append(lines, line)
	}
}

// Records and their starting lines match encoding/csv on RFC 4180 input
// with the variations the formats allow.
func TestCSVReaderMatchesEncodingCSV(t *testing.T) {
	inputs := []string{
		"a,b,c\n1,2,3\n",
		"a,b,c\r\n1,2,3\r\n",
		"a,b\n1,2",               // no final newline
		"a,b\n1,2\r",             // CR at end of file
		"a,b\n\n1,2\n\n\n",       // blank lines
		"a,b\n\r\n1,2\r\n",       // blank CRLF line
		"a,b\n\"1,5\",2\n",       // comma inside quotes
		"a,b\n\"x \"\"y\"\"\",2", // doubled quotes
		"a,b\n\"two\nlines\",2\nnext,3\n",
		"a,b\n\"two\r\nlines\",2\r\n", // CRLF inside quotes reads as LF
		"a,b\n\"\",\"\"\n",            // empty quoted fields
		"a,b\n,\n",                    // empty unquoted fields
		"a,b\n1,\"\"\"\"\n",           // a field that is one quote
		"a\n\"\n\n\"\n",               // quoted blank lines
		"a,b\n1,2\rx\n",               // lone CR inside a field
		"\xEF\xBB\xBFa,b\n1,2\n",      // byte-order mark
		"a,b\n\"1\",\"2\",\n",         // trailing comma after quotes
		" a , b \n 1 , 2 \n",          // spaces are data
	}
	for _, in := range inputs {
		got, gotLines, errLines, err := readAll([]byte(in))
		if err != nil || len(errLines) > 0 {
			t.Errorf("%q: errors %v on lines %v", in, err, errLines)
			continue
		}
		want, wantLines, err := referenceRead([]byte(in))
		if err != nil {
			t.Fatalf("%q: encoding/csv: %v", in, err)
		}
		if !reflect.DeepEqual(got, want) || !reflect.DeepEqual(gotLines, wantLines) {
			t.Errorf("%q:\n got %q lines %v\nwant %q lines %v", in, got, gotLines, want, wantLines)
		}
	}
}

// Malformed records are errors on the right line, and reading goes on
// with the following line. encoding/csv refuses the same quoting errors.
func TestCSVReaderErrors(t *testing.T) {
	cases := []struct {
		name, in string
		errLines []int
		after    int // records read after the error
		syntax   bool
	}{
		{"bare quote", "a,b\n1,x\"y\n2,3\n", []int{2}, 1, true},
		{"text after closing quote", "a,b\n\"1\"x,2\n2,3\n", []int{2}, 1, true},
		{"unterminated quote", "a,b\n1,\"open\n2,3\n", []int{2}, 0, true},
		{"invalid UTF-8", "a,b\n\xff,2\n2,3\n", []int{2}, 1, false},
		{"invalid UTF-8 inside quotes", "a,b\n\"x\n\xfe\",2\n2,3\n", []int{3}, 1, false},
		{"too many fields", "a\n" + strings.Repeat(",", maxFields) + "\n2\n", []int{2}, 1, false},
		{"too many quoted fields", "a\n" + strings.Repeat("\"\",", maxFields) + "\n2\n", []int{2}, 1, false},
		{"line too long", "a\n" + strings.Repeat("x", maxLineBytes+10) + "\n2\n", []int{2}, 1, false},
		{"quoted field too long", "a\n\"" + strings.Repeat("x\n", maxRecordBytes/2+10) + "\"\n",
			// then the closing quote, out of step, opens a field of its own
			[]int{2, 2 + maxRecordBytes/2 + 10}, -1, false},
	}
	for _, tc := range cases {
		recs, _, errLines, err := readAll([]byte(tc.in))
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if !reflect.DeepEqual(errLines, tc.errLines) {
			t.Errorf("%s: errors on lines %v, want %v", tc.name, errLines, tc.errLines)
		}
		if tc.after >= 0 && len(recs) != 1+tc.after {
			t.Errorf("%s: %d records, want header + %d", tc.name, len(recs), tc.after)
		}
		if tc.syntax {
			if _, _, err := referenceRead([]byte(tc.in)); err == nil {
				t.Errorf("%s: encoding/csv accepts it", tc.name)
			}
		}
	}
}

// Memory stays bounded on a huge single line: the reader's buffer never
// grows past the line limit.
func TestCSVReaderBoundedMemory(t *testing.T) {
	huge := io.MultiReader(strings.NewReader("a\n"), io.LimitReader(repeatByte('x'), 64<<20), strings.NewReader("\nz\n"))
	r := newCSVReader(huge)
	var recs, errs int
	for {
		_, _, err := r.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			errs++
			continue
		}
		recs++
	}
	if recs != 2 || errs != 1 || r.br.Size() != maxLineBytes || cap(r.buf) > maxRecordBytes*2 {
		t.Errorf("records %d errors %d buffer %d record buffer %d", recs, errs, r.br.Size(), cap(r.buf))
	}
}

type repeatByte byte

func (b repeatByte) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = byte(b)
	}
	return len(p), nil
}
