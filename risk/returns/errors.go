package returns

import (
	"errors"
	"fmt"
	"math"
	"time"
)

// Errors returned (wrapped, with context) by this package.
var (
	ErrEmpty        = errors.New("empty input")
	ErrLength       = errors.New("mismatched lengths")
	ErrOrder        = errors.New("dates not strictly increasing")
	ErrPrice        = errors.New("price not positive and finite")
	ErrDividend     = errors.New("dividend negative or not finite")
	ErrSplit        = errors.New("split ratio not positive and finite")
	ErrMissingPrice = errors.New("no price on or before the date")
	ErrNoSnapshot   = errors.New("no holdings snapshot on or before the date")
	ErrQuantity     = errors.New("invalid quantity")
	ErrValue        = errors.New("portfolio value not positive")
	ErrThreshold    = errors.New("large-flow threshold negative or not finite")
	ErrDietz        = errors.New("Modified Dietz denominator not positive")
	ErrDate         = errors.New("invalid date")
	ErrMethod       = errors.New("unknown method")
	ErrReturn       = errors.New("return not above -1")
	ErrNonFinite    = errors.New("NaN or infinite value")
	ErrNonPositive  = errors.New("value not positive")
	ErrWeights      = errors.New("invalid weights")
	ErrUndefined    = errors.New("ratio undefined: aggregate denominator not positive")
)

func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func checkFinite(op string, x []float64) error {
	for i, v := range x {
		if !isFinite(v) {
			return fmt.Errorf("returns: %s: element %d is %v: %w", op, i, v, ErrNonFinite)
		}
	}
	return nil
}

// day returns the calendar date of t as a day number, days since 1970-01-01,
// ignoring clock time and zone offsets beyond the date itself:
//
//	day(t) = floor((unix(t) + offset(t)) / 86400)
//
// The date is the one t.Date reports (t's own location). Adding the zone
// offset gives the wall clock read as UTC, and flooring to a whole number of
// days normalises that to the UTC midnight of the same date, whose Unix time
// is day(t)·86400 (Go's clock has no leap seconds). Integer arithmetic only:
// this runs once per price point per comparison, where building a time.Date
// cost more than the rest of a valuation.
func day(t time.Time) int64 {
	s := t.Unix()
	if t.Location() != time.UTC { // dates are UTC by convention: skip the zone lookup
		_, off := t.Zone()
		s += int64(off)
	}
	n := s / 86400
	if s%86400 < 0 { // floor, not truncation, before 1970
		n--
	}
	return n
}

// daysBetween returns the number of calendar days from a to b.
func daysBetween(a, b time.Time) int { return int(day(b) - day(a)) }

func checkDates(op string, dates []time.Time) error {
	var prev int64
	for i, d := range dates {
		n := day(d)
		if i > 0 && n <= prev {
			return orderError(op, dates[i], dates[i-1])
		}
		prev = n
	}
	return nil
}

func orderError(op string, d, before time.Time) error {
	return fmt.Errorf("returns: %s: %s after %s: %w", op, d.Format(time.DateOnly), before.Format(time.DateOnly), ErrOrder)
}

// dayNumbers returns day(d) of each date, checking that they strictly
// increase.
func dayNumbers(op string, dates []time.Time) ([]int64, error) {
	out := make([]int64, len(dates))
	for i, d := range dates {
		out[i] = day(d)
		if i > 0 && out[i] <= out[i-1] {
			return nil, orderError(op, dates[i], dates[i-1])
		}
	}
	return out, nil
}
