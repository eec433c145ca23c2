package store

import (
	"fmt"
	"regexp"
	"time"
)

// errList collects the errors of one file up to a cap.
type errList struct {
	file      string
	max       int
	errs      []RowError
	truncated bool
}

func (l *errList) add(line int, column, value, rule string) {
	if len(l.errs) >= l.max {
		l.truncated = true
		return
	}
	l.errs = append(l.errs, RowError{File: l.file, Line: line, Column: column, Value: value, Rule: rule})
}

func (l *errList) full() bool { return len(l.errs) >= l.max }

// row is one record being validated. Each check records its failure and
// returns the zero value; ok says whether every check passed.
type row struct {
	f    [][]byte
	line int
	cols []string
	errs *errList
	ok   bool
}

// fail records that field i breaks rule.
func (r *row) fail(i int, rule string) {
	r.ok = false
	r.errs.add(r.line, r.cols[i], clip(r.f[i]), rule)
}

func (r *row) failf(i int, format string, a ...any) { r.fail(i, fmt.Sprintf(format, a...)) }

// empty reports whether field i is empty (an absent optional value).
func (r *row) empty(i int) bool { return len(r.f[i]) == 0 }

func (r *row) required(i int) bool {
	if len(r.f[i]) == 0 {
		r.fail(i, "is empty; a value is required")
		return false
	}
	return true
}

// text is a required free-text field.
func (r *row) text(i int) string {
	if !r.required(i) {
		return ""
	}
	if hasControl(r.f[i]) {
		r.fail(i, "contains a control character")
		return ""
	}
	return string(r.f[i])
}

// date is a required date; the string is the stored form.
func (r *row) date(i int) (time.Time, bool) {
	if !r.required(i) {
		return time.Time{}, false
	}
	t, ok := parseDate(r.f[i])
	if !ok {
		r.failf(i, "is not a valid date (YYYY-MM-DD, years %d to %d)", minYear, maxYear)
	}
	return t, ok
}

// num is a required decimal.
func (r *row) num(i int) (float64, bool) {
	if !r.required(i) {
		return 0, false
	}
	v, ok := parseDecimal(r.f[i])
	if !ok {
		r.fail(i, "is not a number")
	}
	return v, ok
}

// optNum is an optional decimal: present is false for an empty field.
func (r *row) optNum(i int) (v float64, present, ok bool) {
	if r.empty(i) {
		return 0, false, true
	}
	v, ok = parseDecimal(r.f[i])
	if !ok {
		r.fail(i, "is not a number")
	}
	return v, ok, ok
}

// count is a required unsigned integer.
func (r *row) count(i int) (int64, bool) {
	if !r.required(i) {
		return 0, false
	}
	n, ok := parseCount(r.f[i])
	if !ok {
		r.fail(i, "is not a whole number")
	}
	return n, ok
}

// match is a required identifier matching re.
func (r *row) match(i int, re *regexp.Regexp, what string) bool {
	if !r.required(i) {
		return false
	}
	if !re.Match(r.f[i]) {
		r.fail(i, "is not a valid "+what)
		return false
	}
	return true
}

var (
	portfolioIDRe = regexp.MustCompile(`^[A-Z][A-Z0-9_-]{0,31}$`)
	securityIDRe  = regexp.MustCompile(`^[A-Z][A-Z0-9.]{0,15}$`)
	currencyRe    = regexp.MustCompile(`^[A-Z]{3}$`)
)

const (
	portfolioIDRule = "portfolio id (a capital letter, then up to 31 of A-Z 0-9 _ -)"
	securityIDRule  = "security id (a capital letter, then up to 15 of A-Z 0-9 .)"
	cashID          = "CASH"
)
