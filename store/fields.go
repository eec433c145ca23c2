package store

import (
	"strconv"
	"time"
	"unicode/utf8"
)

// Field syntax shared by every input kind. The parsers are strict: dot
// decimals without exponent, sign '+', thousands separators or spaces;
// dates exactly YYYY-MM-DD.

// pow10 holds the powers of ten that float64 represents exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// parseDecimal parses -?[0-9]+(\.[0-9]+)? into the nearest float64.
// ok is false for anything else, and for values beyond float64's range.
//
// Up to 15 significant digits and 22 decimals it uses the exact fast path
// of strconv (Clinger 1990): an integer below 2^53 divided by an exactly
// representable power of ten rounds once, correctly. Longer inputs go
// through strconv.ParseFloat after the syntax check.
func parseDecimal(b []byte) (float64, bool) {
	i := 0
	neg := false
	if len(b) > 0 && b[0] == '-' {
		neg = true
		i = 1
	}
	var mant uint64
	digits, frac := 0, 0
	intStart := i
	for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
		if mant != 0 || b[i] != '0' {
			digits++
		}
		mant = mant*10 + uint64(b[i]-'0')
	}
	if i == intStart {
		return 0, false
	}
	if i < len(b) {
		if b[i] != '.' {
			return 0, false
		}
		i++
		fracStart := i
		for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
			if mant != 0 || b[i] != '0' {
				digits++
			}
			mant = mant*10 + uint64(b[i]-'0')
			frac++
		}
		if i == fracStart || i < len(b) {
			return 0, false
		}
	}
	if digits <= 15 && frac < len(pow10) {
		v := float64(mant) / pow10[frac]
		if neg {
			v = -v
		}
		return v, true
	}
	v, err := strconv.ParseFloat(string(b), 64)
	if err != nil {
		return 0, false
	}
	return v, true
}

// parseCount parses an unsigned decimal integer of at most 9 digits.
func parseCount(b []byte) (int64, bool) {
	if len(b) == 0 || len(b) > 9 {
		return 0, false
	}
	var n int64
	for _, c := range b {
		if c < '0' || c > '9' {
			return 0, false
		}
		n = n*10 + int64(c-'0')
	}
	return n, true
}

// Dates outside these years are refused as implausible for the inputs.
const (
	minYear = 1900
	maxYear = 2199
)

// parseDate checks YYYY-MM-DD, a real calendar day in minYear..maxYear.
func parseDate(b []byte) (time.Time, bool) {
	if len(b) != 10 || b[4] != '-' || b[7] != '-' {
		return time.Time{}, false
	}
	num := func(s []byte) (int, bool) {
		n := 0
		for _, c := range s {
			if c < '0' || c > '9' {
				return 0, false
			}
			n = n*10 + int(c-'0')
		}
		return n, true
	}
	y, ok1 := num(b[0:4])
	m, ok2 := num(b[5:7])
	d, ok3 := num(b[8:10])
	if !ok1 || !ok2 || !ok3 || y < minYear || y > maxYear || m < 1 || m > 12 || d < 1 || d > daysIn(y, m) {
		return time.Time{}, false
	}
	return time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC), true
}

// daysIn is the number of days of month m (1..12) of year y, Gregorian.
func daysIn(y, m int) int {
	switch m {
	case 2:
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

// dateOf converts a stored 'YYYY-MM-DD' to UTC midnight.
func dateOf(s string) (time.Time, error) {
	t, ok := parseDate([]byte(s))
	if !ok {
		// Stored dates passed the CHECK constraint; the year bound may
		// still differ, so fall back to the general parser.
		return time.Parse(time.DateOnly, s)
	}
	return t, nil
}

// dateString formats t's calendar day as stored.
func dateString(t time.Time) string { return t.Format(time.DateOnly) }

// hasControl reports whether s contains a control character, which a
// name or label has no use for (and which would upset reports).
func hasControl(b []byte) bool {
	for len(b) > 0 {
		r, n := utf8.DecodeRune(b)
		if r < 0x20 || (r >= 0x7f && r < 0xa0) || r == 0x2028 || r == 0x2029 {
			return true
		}
		b = b[n:]
	}
	return false
}

// clip shortens a value for an error message, keeping it valid UTF-8.
func clip(b []byte) string {
	const max = 80
	if len(b) <= max {
		return string(b)
	}
	i := max
	for i > 0 && !utf8.RuneStart(b[i]) {
		i--
	}
	return string(b[:i]) + "…"
}
