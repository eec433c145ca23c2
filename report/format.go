package report

import (
	"math"
	"regexp"
	"strconv"
	"strings"
)

// NA is printed for a figure that is absent from the document. An absent
// figure is never shown as zero.
const NA = "n/a"

// Pct formats a decimal as a percentage with two decimals: 0.0123 -> "1.23%".
func Pct(x float64) string {
	if !finite(x) {
		return NA
	}
	return fixed(x*100, 2, false) + "%"
}

// PctSigned is Pct with an explicit sign: 0.0123 -> "+1.23%".
func PctSigned(x float64) string {
	if !finite(x) {
		return NA
	}
	return fixed(x*100, 2, true) + "%"
}

// PP formats the change of a decimal rate in percentage points, signed:
// 0.0025 -> "+0.25 pp".
func PP(x float64) string {
	if !finite(x) {
		return NA
	}
	return fixed(x*100, 2, true) + " pp"
}

// BP formats a decimal in basis points, signed: 0.0025 -> "+25.0 bp".
func BP(x float64) string {
	if !finite(x) {
		return NA
	}
	return fixed(x*1e4, 1, true) + " bp"
}

// Money formats an amount rounded to whole currency units with thousands
// separators after the currency code: (-1234567.8, "USD") -> "USD -1,234,568".
func Money(x float64, ccy string) string {
	if !finite(x) {
		return NA
	}
	return ccy + " " + Num(x, 0)
}

// MoneySigned is Money with an explicit sign: "USD +1,234".
func MoneySigned(x float64, ccy string) string {
	if !finite(x) {
		return NA
	}
	return ccy + " " + group(fixed(x, 0, true))
}

// Years formats a duration in years with two decimals: 8.123 -> "8.12 yrs".
func Years(x float64) string {
	if !finite(x) {
		return NA
	}
	return fixed(x, 2, false) + " yrs"
}

// YearsSigned is Years with an explicit sign: "+0.45 yrs".
func YearsSigned(x float64) string {
	if !finite(x) {
		return NA
	}
	return fixed(x, 2, true) + " yrs"
}

// Convexity formats a convexity, whose unit is years squared, with one
// decimal: 123.45 -> "123.5 yrs^2".
func Convexity(x float64) string {
	if !finite(x) {
		return NA
	}
	return Num(x, 1) + " yrs^2"
}

// ConvexitySigned is Convexity with an explicit sign.
func ConvexitySigned(x float64) string {
	if !finite(x) {
		return NA
	}
	return group(fixed(x, 1, true)) + " yrs^2"
}

// Num formats x with dec decimals and comma thousands separators:
// (1234567.891, 2) -> "1,234,567.89".
func Num(x float64, dec int) string {
	if !finite(x) {
		return NA
	}
	return group(fixed(x, dec, false))
}

// NumSigned is Num with an explicit sign.
func NumSigned(x float64, dec int) string {
	if !finite(x) {
		return NA
	}
	return group(fixed(x, dec, true))
}

// Sci formats a small figure in scientific notation with two significant
// digits: 0.000000123 -> "1.2e-07".
func Sci(x float64) string {
	if !finite(x) {
		return NA
	}
	return strconv.FormatFloat(x, 'e', 1, 64)
}

// Opt formats *p with f, or returns NA when p is nil.
func Opt(p *float64, f func(float64) string) string {
	if p == nil {
		return NA
	}
	return f(*p)
}

// fixed formats x with dec decimals, never printing a negative zero.
func fixed(x float64, dec int, sign bool) string {
	s := strconv.FormatFloat(x, 'f', dec, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	if sign && !strings.HasPrefix(s, "-") {
		s = "+" + s
	}
	return s
}

// group inserts comma thousands separators into a formatted number.
func group(s string) string {
	sign := ""
	if s != "" && (s[0] == '-' || s[0] == '+') {
		sign, s = s[:1], s[1:]
	}
	intPart, frac := s, ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		intPart, frac = s[:i], s[i:]
	}
	if len(intPart) <= 3 {
		return sign + intPart + frac
	}
	var b strings.Builder
	pre := len(intPart) % 3
	if pre > 0 {
		b.WriteString(intPart[:pre])
	}
	for i := pre; i < len(intPart); i += 3 {
		if b.Len() > 0 {
			b.WriteByte(',')
		}
		b.WriteString(intPart[i : i+3])
	}
	return sign + b.String() + frac
}

// longDecimal matches a number printed with more digits than a reader
// needs, such as -0.0020000000000000018 in an error message.
var longDecimal = regexp.MustCompile(`-?\d+\.\d{5,}(e[-+]?\d+)?`)

// tidyText shortens the long numbers of a message written for logs (four
// significant digits) so it reads in a table: "k - g = -0.0020000000000000018"
// becomes "k - g = -0.002".
func tidyText(s string) string {
	return longDecimal.ReplaceAllStringFunc(s, func(m string) string {
		x, err := strconv.ParseFloat(m, 64)
		if err != nil {
			return m
		}
		return strconv.FormatFloat(x, 'g', 4, 64)
	})
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
