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

// day returns the calendar date of t as a day number, ignoring clock time and
// zone offsets beyond the date itself.
func day(t time.Time) int64 {
	y, m, d := t.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC).Unix() / 86400
}

// daysBetween returns the number of calendar days from a to b.
func daysBetween(a, b time.Time) int { return int(day(b) - day(a)) }

func checkDates(op string, dates []time.Time) error {
	for i := 1; i < len(dates); i++ {
		if day(dates[i]) <= day(dates[i-1]) {
			return fmt.Errorf("returns: %s: %s after %s: %w", op,
				dates[i].Format(time.DateOnly), dates[i-1].Format(time.DateOnly), ErrOrder)
		}
	}
	return nil
}
