package returns

import (
	"errors"
	"math"
	"testing"
	"time"
)

// TestPeriodStart: weeks run Monday to Sunday; quarters start in January,
// April, July and October (calendar conventions, common practice).
func TestPeriodStart(t *testing.T) {
	cases := []struct {
		p    Period
		asOf string
		want string
	}{
		{WeekToDate, "2024-05-15", "2024-05-13"}, // Wednesday
		{WeekToDate, "2024-05-13", "2024-05-13"}, // Monday
		{WeekToDate, "2024-05-19", "2024-05-13"}, // Sunday
		{MonthToDate, "2024-05-15", "2024-05-01"},
		{QuarterToDate, "2024-05-15", "2024-04-01"},
		{QuarterToDate, "2024-12-31", "2024-10-01"},
		{YearToDate, "2024-05-15", "2024-01-01"},
		{SinceInception, "2024-05-15", "2022-01-03"},
	}
	for _, c := range cases {
		got, err := PeriodStart(c.p, d(c.asOf), d("2022-01-03"))
		if err != nil || !got.Equal(d(c.want)) {
			t.Errorf("%v as of %s: %v %v, want %s", c.p, c.asOf, got, err, c.want)
		}
	}
}

// growthSeries: weekday values from 2022-01-03 to 2024-05-17 growing 0.05%
// per trading day, no flows; the return between two dates is
// 1.0005^(trading days between them) - 1.
func growthSeries() ValueSeries {
	var v ValueSeries
	val := 100.0
	for day := d("2022-01-03"); !day.After(d("2024-05-17")); day = day.AddDate(0, 0, 1) {
		if wd := day.Weekday(); wd == time.Saturday || wd == time.Sunday {
			continue
		}
		if len(v.Dates) > 0 {
			val *= 1.0005
		}
		v.Dates = append(v.Dates, day)
		v.Values = append(v.Values, val)
		v.Flows = append(v.Flows, 0)
	}
	return v
}

// TestPeriodReturns: as of Wednesday 2024-05-15 the bases are the last
// trading day before each period (hand-picked from the calendar): Friday
// 10 May (WTD), Tuesday 30 April (MTD), Friday 29 March (QTD), Friday 29
// December 2023 (YTD) and the inception day. Since inception spans 863 days,
// more than a year, and only it is annualised, actual/365. Tolerance 1e-12
// relative (a few hundred compounding steps).
func TestPeriodReturns(t *testing.T) {
	v := growthSeries()
	prs, err := PeriodReturns(v, d("2024-05-15"), d("2022-01-03"), DefaultLargeFlow)
	if err != nil {
		t.Fatal(err)
	}
	bases := []string{"2024-05-10", "2024-04-30", "2024-03-29", "2023-12-29", "2022-01-03"}
	end := v.index(d("2024-05-15"))
	for i, pr := range prs {
		if pr.Period != Periods[i] || !pr.Base.Equal(d(bases[i])) || !pr.End.Equal(d("2024-05-15")) {
			t.Errorf("%v: base %v end %v, want %s", pr.Period, pr.Base, pr.End, bases[i])
			continue
		}
		n := end - v.index(pr.Base)
		want := math.Pow(1.0005, float64(n)) - 1
		if !closeTo(pr.Return, want, 1e-12, 0) {
			t.Errorf("%v: %v, want %v (%d days)", pr.Period, pr.Return, want, n)
		}
		if pr.IsAnnualized != (pr.Period == SinceInception) {
			t.Errorf("%v annualised: %v", pr.Period, pr.IsAnnualized)
		}
	}
	si := prs[4]
	if si.CalendarDays != 863 {
		t.Errorf("since inception %d days, want 863", si.CalendarDays)
	}
	if want := math.Pow(1+si.Return, 365.0/863) - 1; !closeTo(si.Annualized, want, 1e-14, 0) {
		t.Errorf("annualised %v, want %v", si.Annualized, want)
	}
	// WTD counts 3 trading days (Mon-Wed) from Friday's close.
	if want := math.Pow(1.0005, 3) - 1; !closeTo(prs[0].Return, want, 1e-12, 0) {
		t.Errorf("WTD %v, want %v", prs[0].Return, want)
	}
}

// TestPeriodReturnsInceptionInside: a portfolio started on Wednesday
// 14 February 2024; its YTD and since-inception returns both start at its
// first close, YTD is flagged partial; as of a Saturday the Friday close is
// used.
func TestPeriodReturnsInceptionInside(t *testing.T) {
	v := growthSeries()
	prs, err := PeriodReturns(v, d("2024-05-18"), d("2024-02-14"), DefaultLargeFlow)
	if err != nil {
		t.Fatal(err)
	}
	ytd, si := prs[3], prs[4]
	if !ytd.Base.Equal(d("2024-02-14")) || !ytd.Partial || !si.Base.Equal(d("2024-02-14")) || si.Partial ||
		ytd.Return != si.Return || si.IsAnnualized || !si.End.Equal(d("2024-05-17")) {
		t.Errorf("YTD %+v\nSI %+v", ytd, si)
	}
	if prs[1].Partial || !prs[1].Base.Equal(d("2024-04-30")) {
		t.Errorf("MTD %+v", prs[1])
	}
}

// TestAnnualizeReturn: 21% over two years (730 days) is 10% a year
// (1.1² = 1.21, common practice).
func TestAnnualizeReturn(t *testing.T) {
	a, err := AnnualizeReturn(0.21, 730)
	if err != nil || math.Abs(a-0.1) > 1e-15 {
		t.Errorf("%v %v", a, err)
	}
	if _, err := AnnualizeReturn(-1, 400); !errors.Is(err, ErrReturn) {
		t.Errorf("-100%%: %v", err)
	}
	if _, err := AnnualizeReturn(0.1, 0); !errors.Is(err, ErrDate) {
		t.Errorf("0 days: %v", err)
	}
}

func TestPeriodReturnsErrors(t *testing.T) {
	v := growthSeries()
	if _, err := PeriodReturns(v, d("2024-05-15"), d("2021-06-01"), 0.1); !errors.Is(err, ErrDate) {
		t.Errorf("inception before data: %v", err)
	}
	if _, err := PeriodReturns(v, d("2021-12-31"), d("2022-01-03"), 0.1); !errors.Is(err, ErrDate) {
		t.Errorf("as-of before inception: %v", err)
	}
}
