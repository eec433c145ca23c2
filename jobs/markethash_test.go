package jobs

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"math"
	"testing"
	"time"

	"plumbline/risk/pack"
)

// TestEncodePrices: the streamed encoding of the prices is byte for byte
// what encoding/json's Encoder writes (the reference: the standard
// library, which defined the input hash before), on floats at and around
// its switch to exponent form (1e-6 and 1e21), negative zero, subnormals,
// extremes, dates in several locations, nil and empty slices, and IDs
// that need escaping.
func TestEncodePrices(t *testing.T) {
	d0 := time.Date(2024, 1, 2, 0, 0, 0, 0, time.UTC)
	east := time.FixedZone("east", 5*3600+1800)
	floats := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 123.4567, 1e-6, 9.999999e-7, 1e-7, -1e-7, 1.5e-9,
		1e20, 1e21, 9.99e20, -1e21, 1e100, 1e-100, 5e-324, math.MaxFloat64, -math.MaxFloat64, math.SmallestNonzeroFloat64,
		123456789012345678, 0.000123, 2.5e-10, 3e-5}
	many := pack.PriceSeries{SecurityID: "SYN0001"}
	for i := range 3000 { // past the encoder's flush size
		many.Dates = append(many.Dates, d0.AddDate(0, 0, i))
		many.Close = append(many.Close, 20+float64(i)/7)
		many.Dividend = append(many.Dividend, floats[i%len(floats)])
		many.Split = append(many.Split, 1)
	}
	for _, tc := range []struct {
		name string
		ps   []pack.PriceSeries
	}{
		{"nil", nil},
		{"empty", []pack.PriceSeries{}},
		{"nil columns", []pack.PriceSeries{{SecurityID: "A"}}},
		{"empty columns", []pack.PriceSeries{{SecurityID: "A", Dates: []time.Time{}, Close: []float64{}, Dividend: []float64{}, Split: []float64{}}}},
		{"floats", []pack.PriceSeries{{SecurityID: "F", Dates: []time.Time{d0}, Close: floats, Dividend: floats[:3], Split: []float64{2, 1.5, 0.5}}}},
		{"zones and escapes", []pack.PriceSeries{
			{SecurityID: "A<&>\u2028\"\\é", Dates: []time.Time{d0.In(east), d0.Add(90 * time.Minute), d0.Add(123456789 * time.Nanosecond), d0.Local()}, Close: []float64{1, 2, 3, 4}},
			{SecurityID: "B\xff", Dates: []time.Time{d0, d0}, Close: []float64{1}},
		}},
		{"long", []pack.PriceSeries{many, many}},
	} {
		var want bytes.Buffer
		if err := json.NewEncoder(&want).Encode(tc.ps); err != nil {
			t.Fatal(err)
		}
		h := sha256.New()
		if err := encodePrices(h, tc.ps); err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if got, w := hex.EncodeToString(h.Sum(nil)), SHA256Hex(want.Bytes()); got != w {
			t.Errorf("%s: hash %s, encoding/json gives %s for\n%.400s", tc.name, got, w, want.String())
		}
	}
}

// TestEncodePricesRefuses: like encoding/json, values JSON cannot hold are
// an error, not a quiet hash.
func TestEncodePricesRefuses(t *testing.T) {
	d0 := time.Date(2024, 1, 2, 0, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		name string
		ps   pack.PriceSeries
	}{
		{"NaN", pack.PriceSeries{SecurityID: "A", Dates: []time.Time{d0}, Close: []float64{math.NaN()}}},
		{"+Inf", pack.PriceSeries{SecurityID: "A", Dates: []time.Time{d0}, Split: []float64{math.Inf(1)}}},
		{"year 10000", pack.PriceSeries{SecurityID: "A", Dates: []time.Time{time.Date(10000, 1, 1, 0, 0, 0, 0, time.UTC)}}},
	} {
		if json.NewEncoder(new(bytes.Buffer)).Encode([]pack.PriceSeries{tc.ps}) == nil {
			t.Fatalf("%s: encoding/json accepts it; the case tests nothing", tc.name)
		}
		err := encodePrices(sha256.New(), []pack.PriceSeries{tc.ps})
		var uv *json.UnsupportedValueError
		if err == nil || (tc.name != "year 10000" && !errors.As(err, &uv)) {
			t.Errorf("%s: err = %v", tc.name, err)
		}
	}
}
