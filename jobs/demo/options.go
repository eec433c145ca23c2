package demo

import (
	"errors"
	"fmt"
	"regexp"
	"time"
)

// ErrOptions is wrapped by every error about invalid Options.
var ErrOptions = errors.New("demo: invalid options")

// Defaults used where an Options field is the zero value.
const (
	DefaultSeed         int64 = 20201127
	DefaultYears              = 6
	DefaultBaseCurrency       = "USD"
	minYears                  = 3 // the crash, rising rates and splits need room
	maxYears                  = 30
)

// DefaultEnd is the last business day used when Options.End is zero.
var DefaultEnd = time.Date(2026, time.November, 27, 0, 0, 0, 0, time.UTC)

// Options choose the scenario. The zero value is valid and gives the
// default scenario.
type Options struct {
	// Seed seeds every random stream. Zero means DefaultSeed.
	Seed int64
	// End is the last business day of the history (its calendar date is
	// used; a Saturday or Sunday rolls back to the Friday). Zero means
	// DefaultEnd.
	End time.Time
	// Years of daily history ending at End. Zero means DefaultYears.
	Years int
	// BaseCurrency is the ISO 4217 code of every amount and of every
	// security. Empty means DefaultBaseCurrency.
	BaseCurrency string
}

var currencyRE = regexp.MustCompile(`^[A-Z]{3}$`)

// resolved fills defaults and checks the values.
func (o Options) resolved() (Options, error) {
	if o.Seed == 0 {
		o.Seed = DefaultSeed
	}
	if o.End.IsZero() {
		o.End = DefaultEnd
	}
	y, m, d := o.End.Date()
	o.End = time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
	switch o.End.Weekday() {
	case time.Saturday:
		o.End = o.End.AddDate(0, 0, -1)
	case time.Sunday:
		o.End = o.End.AddDate(0, 0, -2)
	}
	if o.Years == 0 {
		o.Years = DefaultYears
	}
	if o.Years < minYears || o.Years > maxYears {
		return o, fmt.Errorf("%w: years %d outside [%d, %d]", ErrOptions, o.Years, minYears, maxYears)
	}
	if o.BaseCurrency == "" {
		o.BaseCurrency = DefaultBaseCurrency
	}
	if !currencyRE.MatchString(o.BaseCurrency) {
		return o, fmt.Errorf("%w: base currency %q is not three upper-case letters", ErrOptions, o.BaseCurrency)
	}
	return o, nil
}
