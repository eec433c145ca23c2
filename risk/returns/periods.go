package returns

import (
	"fmt"
	"math"
	"sort"
	"time"
)

// Period is a reporting period ending on an as-of date.
type Period int

const (
	WeekToDate Period = iota
	MonthToDate
	QuarterToDate
	YearToDate
	SinceInception
)

// Periods lists the reporting periods in display order.
var Periods = []Period{WeekToDate, MonthToDate, QuarterToDate, YearToDate, SinceInception}

func (p Period) String() string {
	switch p {
	case WeekToDate:
		return "WTD"
	case MonthToDate:
		return "MTD"
	case QuarterToDate:
		return "QTD"
	case YearToDate:
		return "YTD"
	case SinceInception:
		return "SI"
	}
	return fmt.Sprintf("Period(%d)", int(p))
}

// PeriodStart returns the first calendar day of period p containing asOf:
// the Monday of its week (weeks run Monday to Sunday), the first day of its
// month, quarter or year. For SinceInception it returns inception.
func PeriodStart(p Period, asOf, inception time.Time) (time.Time, error) {
	y, m, d := asOf.Date()
	switch p {
	case WeekToDate:
		back := (int(asOf.Weekday()) + 6) % 7 // days since Monday
		return time.Date(y, m, d-back, 0, 0, 0, 0, time.UTC), nil
	case MonthToDate:
		return time.Date(y, m, 1, 0, 0, 0, 0, time.UTC), nil
	case QuarterToDate:
		q := (int(m) - 1) / 3
		return time.Date(y, time.Month(3*q+1), 1, 0, 0, 0, 0, time.UTC), nil
	case YearToDate:
		return time.Date(y, time.January, 1, 0, 0, 0, 0, time.UTC), nil
	case SinceInception:
		iy, im, id := inception.Date()
		return time.Date(iy, im, id, 0, 0, 0, 0, time.UTC), nil
	}
	return time.Time{}, fmt.Errorf("returns: period %v: %w", p, ErrMethod)
}

// PeriodReturn is the time-weighted return of one period.
type PeriodReturn struct {
	Period Period
	// The return runs from the close of Base to the close of End. Base is the
	// last valuation day before the period starts (for week-to-date, the
	// last trading day of the previous week), or the first valuation day on
	// or after inception if the portfolio started within the period.
	Base, End    time.Time
	Return       float64
	Partial      bool    // inception falls inside the period
	CalendarDays int     // days from Base to End
	Annualized   float64 // (1+Return)^(365/CalendarDays) - 1, when IsAnnualized
	IsAnnualized bool    // CalendarDays > 365; shorter periods are never annualised
	SubPeriods   []SubPeriod
}

// PeriodReturns returns the time-weighted return (TimeWeightedReturn with
// threshold largeFlow) of each of Periods as of asOf, using the last
// valuation day on or before asOf. The values must start on or before
// inception's first valuation day.
func PeriodReturns(v ValueSeries, asOf, inception time.Time, largeFlow float64) ([]PeriodReturn, error) {
	if err := v.check("period returns"); err != nil {
		return nil, err
	}
	if day(inception) < day(v.Dates[0]) {
		return nil, fmt.Errorf("returns: period returns: inception %s before the first value %s: %w",
			inception.Format(time.DateOnly), v.Dates[0].Format(time.DateOnly), ErrDate)
	}
	end := sort.Search(len(v.Dates), func(i int) bool { return day(v.Dates[i]) > day(asOf) }) - 1
	first := sort.Search(len(v.Dates), func(i int) bool { return day(v.Dates[i]) >= day(inception) })
	if end < 0 || first > end {
		return nil, fmt.Errorf("returns: period returns: no value between inception %s and as-of %s: %w",
			inception.Format(time.DateOnly), asOf.Format(time.DateOnly), ErrDate)
	}
	out := make([]PeriodReturn, 0, len(Periods))
	for _, p := range Periods {
		ps, err := PeriodStart(p, v.Dates[end], inception)
		if err != nil {
			return nil, err
		}
		// Base: last valuation day before the period start, not before the
		// first valuation day on or after inception.
		base := sort.Search(len(v.Dates), func(i int) bool { return day(v.Dates[i]) >= day(ps) }) - 1
		partial := p == SinceInception || base < first
		if base < first {
			base = first
		}
		pr := PeriodReturn{Period: p, Base: v.Dates[base], End: v.Dates[end], Partial: partial && p != SinceInception}
		pr.CalendarDays = daysBetween(pr.Base, pr.End)
		if base < end {
			sub, err := v.Slice(v.Dates[base], v.Dates[end])
			if err != nil {
				return nil, err
			}
			twr, err := TimeWeightedReturn(sub, largeFlow)
			if err != nil {
				return nil, fmt.Errorf("returns: %v: %w", p, err)
			}
			pr.Return, pr.SubPeriods = twr.Return, twr.SubPeriods
		}
		if pr.CalendarDays > 365 {
			a, err := AnnualizeReturn(pr.Return, pr.CalendarDays)
			if err != nil {
				return nil, fmt.Errorf("returns: %v: %w", p, err)
			}
			pr.Annualized, pr.IsAnnualized = a, true
		}
		out = append(out, pr)
	}
	return out, nil
}

// AnnualizeReturn converts a cumulative return over calendarDays to an
// annual rate, actual/365:
//
//	R_a = (1 + R)^(365 / days) - 1
//
// R must be above -1 and days positive. Reports should only annualise
// periods longer than a year (PeriodReturns does so).
func AnnualizeReturn(r float64, calendarDays int) (float64, error) {
	if calendarDays <= 0 {
		return 0, fmt.Errorf("returns: annualize: %d days: %w", calendarDays, ErrDate)
	}
	if !isFinite(r) || r <= -1 {
		return 0, fmt.Errorf("returns: annualize: return %v: %w", r, ErrReturn)
	}
	return math.Pow(1+r, 365/float64(calendarDays)) - 1, nil
}
