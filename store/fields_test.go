package store

import (
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"
)

// parseDecimal must give exactly strconv.ParseFloat's correctly rounded
// result (the reference) on every input it accepts, and accept only
// -?digits(.digits)?.
func TestParseDecimalMatchesStrconv(t *testing.T) {
	accept := []string{"0", "-0", "1", "41.20", "0.000001", "-12000.5", "007.50", "123456789012345",
		"1234567890123456789", "0.1", "0.3", "9007199254740993", "1.7976931348623157", "0.0000000000000000000000001",
		"99999999999999999999999999999.999999999999999"}
	reject := []string{"", "-", ".", "1.", ".5", "+1", "1e3", "1E3", "1,5", "1_000", " 1", "1 ", "Inf", "NaN",
		"0x10", "1.2.3", "--1", "1-", "١٢"}
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 20000; i++ {
		// Random decimals of up to 20 digits on each side.
		s := strconv.FormatUint(rng.Uint64()%1e15, 10)
		if rng.IntN(2) == 0 {
			frac := strconv.FormatUint(rng.Uint64(), 10)
			s += "." + frac[:1+rng.IntN(len(frac))]
		}
		if rng.IntN(3) == 0 {
			s = "-" + s
		}
		accept = append(accept, s)
	}
	for _, s := range accept {
		got, ok := parseDecimal([]byte(s))
		want, err := strconv.ParseFloat(s, 64)
		if !ok || err != nil || got != want {
			t.Errorf("parseDecimal(%q) = %v, %v; strconv.ParseFloat = %v, %v", s, got, ok, want, err)
		}
	}
	for _, s := range reject {
		if v, ok := parseDecimal([]byte(s)); ok {
			t.Errorf("parseDecimal(%q) = %v, want refused", s, v)
		}
	}
	// Beyond float64's range: refused, not Inf.
	if _, ok := parseDecimal([]byte("1" + strings.Repeat("0", 330))); ok {
		t.Error("a 1e330 is accepted")
	}
}

// parseDate accepts exactly the days the Gregorian calendar has, as
// time.Parse (the reference) does, within the plausible years.
func TestParseDateMatchesTime(t *testing.T) {
	for d := time.Date(1899, 12, 25, 0, 0, 0, 0, time.UTC); d.Year() < 2201; d = d.AddDate(0, 0, 1) {
		s := d.Format(time.DateOnly)
		got, ok := parseDate([]byte(s))
		inRange := d.Year() >= minYear && d.Year() <= maxYear
		if ok != inRange || (ok && !got.Equal(d)) {
			t.Fatalf("parseDate(%q) = %v, %v", s, got, ok)
		}
	}
	// Days that do not exist (Gregorian leap rule: 2000 leap, 1900, 2100
	// not; from memory and checked by time.Parse below) and bad shapes.
	for _, s := range []string{"2026-02-29", "2100-02-29", "1900-02-29", "2026-02-30", "2026-04-31", "2026-13-01",
		"2026-00-10", "2026-01-00", "2026-1-05", "2026/01/05", "20260105", "2026-01-05T00:00", " 2026-01-05", "2026-01-5 "} {
		if _, ok := parseDate([]byte(s)); ok {
			t.Errorf("parseDate(%q) accepted", s)
		}
		if _, err := time.Parse(time.DateOnly, s); err == nil {
			t.Errorf("time.Parse accepts %q: the test case is wrong", s)
		}
	}
	for _, s := range []string{"2000-02-29", "2024-02-29", "2026-12-31"} {
		if _, ok := parseDate([]byte(s)); !ok {
			t.Errorf("parseDate(%q) refused", s)
		}
	}
}

func TestParseCount(t *testing.T) {
	for s, want := range map[string]int64{"0": 0, "12": 12, "600": 600, "000000007": 7} {
		if n, ok := parseCount([]byte(s)); !ok || n != want {
			t.Errorf("parseCount(%q) = %d, %v", s, n, ok)
		}
	}
	for _, s := range []string{"", "-1", "1.0", "1e2", "1234567890", " 1"} {
		if _, ok := parseCount([]byte(s)); ok {
			t.Errorf("parseCount(%q) accepted", s)
		}
	}
}
