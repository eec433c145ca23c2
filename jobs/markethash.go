package jobs

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"hash"
	"math"
	"strconv"
	"time"

	"plumbline/risk/pack"
)

// marketHash is the sha256 of the canonical encoding of the shared market
// data: the encoding/json Encoder output (one JSON value and a newline
// each) of the securities, prices, yields, premiums and assumptions, in
// that order. Those bytes define every run's input hash, so they must not
// change: runs stored earlier verify against them.
//
// The prices, a million rows for ten years of 400 securities, are encoded
// here straight into the hash, byte for byte as encoding/json would (the
// test beside this file compares the two). encoding/json builds each value
// whole in memory first, which for the prices was a buffer of tens of
// megabytes at the peak of a pack run's memory, and formatted the same
// dates once per security.
func marketHash(m *market) (string, error) {
	h := sha256.New()
	enc := json.NewEncoder(h)
	if err := enc.Encode(m.securities); err != nil {
		return "", err
	}
	if err := encodePrices(h, m.prices); err != nil {
		return "", err
	}
	for _, v := range []any{m.yields, m.premiums, m.assumption} {
		if err := enc.Encode(v); err != nil {
			return "", err
		}
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// encodePrices writes what json.NewEncoder(w).Encode(ps) writes.
func encodePrices(w hash.Hash, ps []pack.PriceSeries) error {
	e := priceEncoder{dates: map[time.Time][]byte{}}
	if ps == nil {
		e.b = append(e.b, "null"...)
	} else {
		e.b = append(e.b, '[')
		for i := range ps {
			if i > 0 {
				e.b = append(e.b, ',')
			}
			if err := e.series(w, &ps[i]); err != nil {
				return err
			}
		}
		e.b = append(e.b, ']')
	}
	e.b = append(e.b, '\n')
	w.Write(e.b)
	return nil
}

// priceEncoder buffers a little output at a time and formats each
// distinct date once.
type priceEncoder struct {
	b     []byte
	dates map[time.Time][]byte // quoted JSON of each date seen
}

// flush hands the buffer to w once it holds a few kilobytes.
func (e *priceEncoder) flush(w hash.Hash) {
	if len(e.b) >= 32<<10 {
		w.Write(e.b)
		e.b = e.b[:0]
	}
}

func (e *priceEncoder) series(w hash.Hash, s *pack.PriceSeries) error {
	id, err := json.Marshal(s.SecurityID) // HTML-escaped, as the Encoder does
	if err != nil {
		return err
	}
	e.b = append(e.b, `{"security_id":`...)
	e.b = append(e.b, id...)
	e.b = append(e.b, `,"dates":`...)
	if s.Dates == nil {
		e.b = append(e.b, "null"...)
	} else {
		e.b = append(e.b, '[')
		for i, d := range s.Dates {
			if i > 0 {
				e.b = append(e.b, ',')
			}
			q, ok := e.dates[d]
			if !ok {
				if q, err = d.MarshalJSON(); err != nil {
					return fmt.Errorf("json: error calling MarshalJSON for type time.Time: %w", err)
				}
				e.dates[d] = q
			}
			e.b = append(e.b, q...)
			e.flush(w)
		}
		e.b = append(e.b, ']')
	}
	for _, f := range []struct {
		name string
		x    []float64
	}{{`,"close":`, s.Close}, {`,"dividend":`, s.Dividend}, {`,"split":`, s.Split}} {
		e.b = append(e.b, f.name...)
		if f.x == nil {
			e.b = append(e.b, "null"...)
			continue
		}
		e.b = append(e.b, '[')
		for i, x := range f.x {
			if i > 0 {
				e.b = append(e.b, ',')
			}
			if e.b, err = appendJSONFloat(e.b, x); err != nil {
				return err
			}
			e.flush(w)
		}
		e.b = append(e.b, ']')
	}
	e.b = append(e.b, '}')
	return nil
}

// appendJSONFloat appends x as encoding/json writes a float64: like
// strconv 'f' with the shortest precision, but in exponent form below
// 1e-6 and from 1e21 on (ES6 number to string), with a one-digit negative
// exponent unpadded; NaN and infinities are refused.
func appendJSONFloat(b []byte, x float64) ([]byte, error) {
	if math.IsInf(x, 0) || math.IsNaN(x) {
		return b, &json.UnsupportedValueError{Str: strconv.FormatFloat(x, 'g', -1, 64)}
	}
	abs := math.Abs(x)
	format := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, x, format, -1, 64)
	if format == 'e' {
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b, nil
}
