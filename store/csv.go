package store

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"unicode/utf8"
)

// Limits that keep memory bounded whatever the input: no input kind has
// more than eight columns or needs long lines.
const (
	maxLineBytes   = 64 << 10 // one physical line, newline included
	maxRecordBytes = 64 << 10 // one record, quoted newlines included
	maxFields      = 64
)

// csvError is a malformed record. The reader can go on with the next
// line after it.
type csvError struct {
	Line   int
	Msg    string
	syntax bool // a quoting error (encoding/csv refuses the same input)
	fields int  // for too many fields: how many there were
}

func (e *csvError) Error() string { return fmt.Sprintf("line %d: %s", e.Line, e.Msg) }

// csvReader reads RFC 4180 records: comma-separated fields, optionally
// enclosed in double quotes, a doubled quote standing for one inside a
// quoted field, and quoted fields that may span lines. On top of RFC 4180
// it accepts a UTF-8 byte-order mark, LF or CRLF line ends (a CRLF inside
// a quoted field reads as LF, as in encoding/csv), and skips empty lines.
// Every line must be valid UTF-8.
//
// It is a hand-rolled encoding/csv: the returned fields point into the
// reader's buffers (valid until the next call), so the common unquoted
// line costs no allocation.
type csvReader struct {
	br     *bufio.Reader
	line   int // physical lines consumed
	fields [][]byte
	buf    []byte // unquoted copy of a record that has quotes
	ends   []int  // field ends in buf
}

func newCSVReader(r io.Reader) *csvReader {
	return &csvReader{br: bufio.NewReaderSize(r, maxLineBytes), fields: make([][]byte, 0, 16)}
}

var bom = []byte("\xEF\xBB\xBF")

// readLine returns the next physical line without its line end. At the
// end of input it returns io.EOF; an over-long line is a *csvError after
// which reading goes on with the line that follows.
func (r *csvReader) readLine() ([]byte, error) {
	b, err := r.br.ReadSlice('\n')
	if errors.Is(err, bufio.ErrBufferFull) {
		r.line++
		for errors.Is(err, bufio.ErrBufferFull) {
			_, err = r.br.ReadSlice('\n')
		}
		if err != nil && err != io.EOF {
			return nil, err
		}
		return nil, &csvError{Line: r.line, Msg: fmt.Sprintf("the line is longer than %d bytes", maxLineBytes)}
	}
	if len(b) == 0 {
		if err == nil {
			err = io.EOF
		}
		return nil, err
	}
	if err != nil && err != io.EOF {
		return nil, err
	}
	r.line++
	if b[len(b)-1] == '\n' {
		b = b[:len(b)-1]
	}
	if n := len(b); n > 0 && b[n-1] == '\r' {
		b = b[:n-1]
	}
	if r.line == 1 {
		b = bytes.TrimPrefix(b, bom)
	}
	return b, nil
}

// next returns the next record and the line it starts on. It returns
// io.EOF at the end, a *csvError for a malformed record (call next again
// to go on), or a read error.
func (r *csvReader) next() ([][]byte, int, error) {
	for {
		line, err := r.readLine()
		if err != nil {
			return nil, r.line, err
		}
		if len(line) == 0 {
			continue
		}
		start := r.line
		if !utf8.Valid(line) {
			return nil, start, &csvError{Line: start, Msg: "the line is not valid UTF-8"}
		}
		if bytes.IndexByte(line, '"') >= 0 {
			return r.quoted(line, start)
		}
		if n := bytes.Count(line, []byte{','}) + 1; n > maxFields {
			return nil, start, &csvError{Line: start, Msg: fmt.Sprintf("%d fields, more than %d", n, maxFields), fields: n}
		}
		r.fields = r.fields[:0]
		for {
			i := bytes.IndexByte(line, ',')
			if i < 0 {
				r.fields = append(r.fields, line)
				break
			}
			r.fields = append(r.fields, line[:i])
			line = line[i+1:]
		}
		return r.fields, start, nil
	}
}

// quoted parses a record that contains a double quote, reading further
// lines while a quoted field is open.
func (r *csvReader) quoted(line []byte, start int) ([][]byte, int, error) {
	r.buf = r.buf[:0]
	r.ends = r.ends[:0]
	pos := 0
	for {
		if len(r.ends) >= maxFields {
			n := len(r.ends) + bytes.Count(line[pos:], []byte{','}) + 1
			return nil, start, &csvError{Line: start, Msg: fmt.Sprintf("%d or more fields, more than %d", n, maxFields), fields: n}
		}
		if pos < len(line) && line[pos] == '"' {
			pos++
			for {
				i := bytes.IndexByte(line[pos:], '"')
				if i < 0 {
					// The quoted field goes on past the line end.
					r.buf = append(r.buf, line[pos:]...)
					r.buf = append(r.buf, '\n')
					if len(r.buf) > maxRecordBytes {
						return nil, start, &csvError{Line: start, Msg: fmt.Sprintf("the quoted field is longer than %d bytes (is a closing quote missing?)", maxRecordBytes)}
					}
					next, err := r.readLine()
					if err == io.EOF {
						return nil, start, &csvError{Line: start, Msg: "the quoted field is not closed before the end of the file", syntax: true}
					}
					if err != nil {
						return nil, start, err
					}
					if !utf8.Valid(next) {
						return nil, start, &csvError{Line: r.line, Msg: "the line is not valid UTF-8"}
					}
					line, pos = next, 0
					continue
				}
				r.buf = append(r.buf, line[pos:pos+i]...)
				pos += i + 1
				if pos < len(line) && line[pos] == '"' {
					r.buf = append(r.buf, '"')
					pos++
					continue
				}
				break
			}
			r.ends = append(r.ends, len(r.buf))
			if pos == len(line) {
				break
			}
			if line[pos] != ',' {
				return nil, start, &csvError{Line: r.line, syntax: true,
					Msg: fmt.Sprintf("field %d: %q after a closing quote; a quote inside a quoted field must be doubled", len(r.ends), line[pos])}
			}
			pos++
			continue
		}
		f := line[pos:]
		i := bytes.IndexByte(f, ',')
		if i >= 0 {
			f = f[:i]
		}
		if bytes.IndexByte(f, '"') >= 0 {
			return nil, start, &csvError{Line: r.line, syntax: true,
				Msg: fmt.Sprintf("field %d: a quote inside an unquoted field; enclose the field in quotes and double the quote", len(r.ends)+1)}
		}
		r.buf = append(r.buf, f...)
		r.ends = append(r.ends, len(r.buf))
		if i < 0 {
			break
		}
		pos += i + 1
	}
	r.fields = r.fields[:0]
	from := 0
	for _, end := range r.ends {
		r.fields = append(r.fields, r.buf[from:end:end])
		from = end
	}
	return r.fields, start, nil
}
