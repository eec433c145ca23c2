package pack

import (
	"errors"
	"testing"
	"time"
)

// Day numbers count days since 1970-01-01 (the Unix epoch, POSIX) of the
// date in the time's own location.
func TestDayOf(t *testing.T) {
	est := time.FixedZone("UTC-5", -5*3600)
	for _, tc := range []struct {
		t    time.Time
		want int64
	}{
		{time.Date(1970, 1, 1, 0, 0, 0, 0, time.UTC), 0},
		{time.Date(1970, 1, 2, 23, 59, 0, 0, time.UTC), 1},
		{time.Date(1969, 12, 31, 0, 0, 0, 0, time.UTC), -1},
		{time.Date(1969, 12, 31, 12, 0, 0, 0, time.UTC), -1},
		{time.Date(2000, 3, 1, 0, 0, 0, 0, time.UTC), 11017}, // POSIX time 951868800 s / 86400 s a day
		{time.Date(1970, 1, 2, 22, 0, 0, 0, est), 1},         // 03:00 UTC on the 3rd, still the 2nd in its zone
	} {
		if got := dayOf(tc.t); got != tc.want {
			t.Errorf("dayOf(%v) = %d, want %d", tc.t, got, tc.want)
		}
	}
	if got := dayString(11017); got != "2000-03-01" {
		t.Errorf("dayString = %s", got)
	}
}

// Weeks run Monday to Sunday (ISO 8601); 1970-01-05 was a Monday (calendar fact).
func TestWeekOf(t *testing.T) {
	mon := dayOf(time.Date(2025, 6, 9, 0, 0, 0, 0, time.UTC))
	for i := int64(0); i < 7; i++ {
		if weekOf(mon+i) != weekOf(mon) {
			t.Errorf("day %d of the week in another week", i)
		}
	}
	if weekOf(mon-1) == weekOf(mon) || weekOf(mon+7) == weekOf(mon) {
		t.Error("Sunday before or Monday after in the same week")
	}
	if weekOf(-3) != weekOf(-1) || weekOf(-4) == weekOf(-3) { // 1969-12-29 was a Monday
		t.Error("weeks before 1970 misnumbered")
	}
}

// Linear interpolation in tenor (common practice for a missing tenor),
// the end yield outside the observed tenors. Exact arithmetic: 1e-15.
func TestYieldAt(t *testing.T) {
	c := &YieldCurve{Tenors: []int{12, 60, 120}, Yields: []float64{0.03, 0.04, 0.046}}
	for _, tc := range []struct {
		tenor int
		want  float64
		extra bool
	}{
		{60, 0.04, false},
		{36, 0.035, false}, // halfway between 12 and 60 months
		{90, 0.043, false}, // halfway between 60 and 120 months
		{3, 0.03, true},    // below the first tenor
		{360, 0.046, true}, // beyond the last tenor
	} {
		got, extra := yieldAt(c, tc.tenor)
		if !relClose(got, tc.want, 1e-15) || extra != tc.extra {
			t.Errorf("yieldAt(%d) = %v %v, want %v %v", tc.tenor, got, extra, tc.want, tc.extra)
		}
	}
}

// Each nonsense parameter is refused with ErrParams.
func TestParamsValidate(t *testing.T) {
	if err := fxParams().Validate(); err != nil {
		t.Fatalf("fixture parameters: %v", err)
	}
	for name, edit := range map[string]func(*Params){
		"tenor 0":          func(p *Params) { p.RiskFreeTenorMonths = 0 },
		"convention":       func(p *Params) { p.GrowthConvention = "d2" },
		"window 1":         func(p *Params) { p.RollingWindows = []int{1} },
		"no window":        func(p *Params) { p.RollingWindows = nil },
		"lambda 0":         func(p *Params) { p.EWMALambda = 0 },
		"lookback 1":       func(p *Params) { p.VaRLookbackDays = 1 },
		"negative stale":   func(p *Params) { p.StalePriceDays = -1 },
		"scenario twice":   func(p *Params) { p.Scenarios = append(p.Scenarios, p.Scenarios[0]) },
		"replay backwards": func(p *Params) { p.Replays[0].From, p.Replays[0].To = p.Replays[0].To, p.Replays[0].From },
		"limit no breach":  func(p *Params) { p.Limits[0].BreachMax, p.Limits[0].WarnMax = nil, nil },
		"history 0":        func(p *Params) { p.HistoryDays = 0 },
		// Scenarios and replays share the scenario scope of Metrics.
		"replay named as a scenario":         func(p *Params) { p.Replays[0].Name = p.Scenarios[0].Name },
		"replay named as the worst window":   func(p *Params) { p.Replays[0].Name = "worst 10-day window" },
		"scenario named as the worst window": func(p *Params) { p.Scenarios[1].Name = "worst 10-day window" },
	} {
		p := fxParams()
		edit(&p)
		if err := p.Validate(); err == nil || !errors.Is(err, ErrParams) {
			t.Errorf("%s: %v", name, err)
		}
	}
	// The worst-window name is that of the configured length only.
	p := fxParams()
	p.Replays[0].Name = "worst 20-day window"
	if err := p.Validate(); err != nil {
		t.Errorf("a replay named after another window length: %v", err)
	}
}
