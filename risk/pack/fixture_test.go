package pack

import (
	"math"
	"time"

	"plumbline/risk/limits"
	"plumbline/risk/stress"
)

// The test fixture: a fictional book of four securities plus one that is
// only in the benchmark, weekday prices from 2024-05-01 to the as-of date
// 2025-06-13 (a Friday), two holdings snapshots, one ex-dividend date and
// one 2-for-1 split (both after the second snapshot), one large external
// flow in the last week, daily yield curves and premiums.

var (
	fxAsOf     = day("2025-06-13")
	fxStart    = day("2024-05-01")
	fxDivDay   = day("2025-02-14") // ALDR goes ex 0.50 per share
	fxSplitDay = day("2025-03-03") // ALDR splits 2 for 1
	fxFlowDay  = day("2025-06-11") // +50,000 external flow
	fxDUNELast = day("2025-06-10") // DUNE's last close: stale on the as-of date
)

const (
	fxDividend = 0.50
	fxSplit    = 2.0
	fxFlow     = 50_000.0
)

func day(s string) time.Time {
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		panic(err)
	}
	return t
}

func f64(x float64) *float64 { return &x }

// fxDays are the weekdays of the fixture.
func fxDays() []time.Time {
	var out []time.Time
	for d := fxStart; !d.After(fxAsOf); d = d.AddDate(0, 0, 1) {
		if wd := d.Weekday(); wd != time.Saturday && wd != time.Sunday {
			out = append(out, d)
		}
	}
	return out
}

// fxPath is a smooth deterministic price path: base·exp(a·t + b·sin(c·t + φ)).
func fxPath(base, a, b, c, phi float64) func(t int) float64 {
	return func(t int) float64 {
		ft := float64(t)
		return base * math.Exp(a*ft+b*math.Sin(c*ft+phi))
	}
}

var fxPaths = map[string]func(int) float64{
	"ALDR": fxPath(80, 0.0004, 0.05, 0.21, 0.3),
	"BRKW": fxPath(50, 0.0002, 0.04, 0.17, 1.1),
	"CVNT": fxPath(30, -0.0001, 0.03, 0.13, 2.0),
	"DUNE": fxPath(20, 0.0006, 0.07, 0.29, 0.7),
	"ESKR": fxPath(40, 0.0003, 0.05, 0.11, 2.5),
}

// fxClose is the unadjusted close of id on weekday index t (ALDR halves
// from the split on).
func fxClose(id string, t int, d time.Time) float64 {
	p := fxPaths[id](t)
	if id == "ALDR" && !d.Before(fxSplitDay) {
		p /= fxSplit
	}
	return p
}

// fxYield is the zero yield of weekday t at tenor months.
func fxYield(t, tenor int) float64 {
	return 0.035 + 0.01*(1-math.Exp(-float64(tenor)/30)) + 0.002*math.Sin(float64(t)/13)
}

func fxPremium(t int) float64 { return 0.05 + 0.001*math.Cos(float64(t)/20) }

var fxTenors = []int{3, 12, 24, 60, 120, 360}

func fxInputs() *Inputs {
	days := fxDays()
	in := &Inputs{
		AsOf:         fxAsOf,
		BaseCurrency: "USD",
		Portfolio: PortfolioInfo{ID: "HARBOUR", Name: "Harbour Dividend", Strategy: "Dividend growth",
			Inception: "2024-05-01", BenchmarkMethod: "value"},
		Securities: []Security{
			{ID: "ALDR", Name: "Alder Rail", Sector: "Industrials", Currency: "USD", SharesOutstanding: 5e6},
			{ID: "BRKW", Name: "Brookway Foods", Sector: "Staples", Currency: "USD", SharesOutstanding: 8e6},
			{ID: "CVNT", Name: "Covent Power", Sector: "Utilities", Currency: "USD", SharesOutstanding: 6e6},
			{ID: "DUNE", Name: "Dunmore Systems", Sector: "Technology", Currency: "USD", SharesOutstanding: 9e6},
			{ID: "ESKR", Name: "Eskerby Mills", Sector: "Materials", Currency: "USD", SharesOutstanding: 4e6},
		},
		Snapshots: []Snapshot{
			{AsOf: fxStart, Cash: 10_000, Lines: []Line{
				{SecurityID: "ALDR", Quantity: 1000, Price: fxClose("ALDR", 0, fxStart)},
				{SecurityID: "BRKW", Quantity: 2000, Price: fxClose("BRKW", 0, fxStart)},
				{SecurityID: "CVNT", Quantity: 500, Price: fxClose("CVNT", 0, fxStart)},
				{SecurityID: "DUNE", Quantity: 800, Price: fxClose("DUNE", 0, fxStart)},
			}},
			{AsOf: day("2025-01-15"), Cash: 5_000, Lines: []Line{
				{SecurityID: "ALDR", Quantity: 1200},
				{SecurityID: "BRKW", Quantity: 1500},
				{SecurityID: "CVNT", Quantity: 500},
				{SecurityID: "DUNE", Quantity: 1000},
			}},
		},
		Flows: []DatedValue{{Date: fxFlowDay, Value: fxFlow}},
		Assumptions: []Assumption{
			{SecurityID: "ALDR", Effective: day("2024-01-02"), AnnualDividend: 2.0, Frequency: 1, Growth: 0.03, Beta: f64(1.1)},
			{SecurityID: "ALDR", Effective: fxSplitDay, AnnualDividend: 1.0, Frequency: 1, Growth: 0.03, Beta: f64(1.1)},
			{SecurityID: "BRKW", Effective: day("2024-01-02"), AnnualDividend: 1.5, Frequency: 1, Growth: 0.025, Beta: f64(0.8),
				Stages: []Stage{{Years: 3, Growth: 0.08}}},
			// k <= g: an explicit discount rate below growth.
			{SecurityID: "CVNT", Effective: day("2024-01-02"), AnnualDividend: 1.0, Frequency: 1, Growth: 0.05, DiscountRate: f64(0.04)},
			// No beta: estimated from weekly returns.
			{SecurityID: "DUNE", Effective: day("2024-01-02"), AnnualDividend: 0.5, Frequency: 4, Growth: 0.02},
		},
		Sources: []string{"fixture.csv"},
	}
	for _, id := range []string{"ALDR", "BRKW", "CVNT", "DUNE", "ESKR"} {
		ps := PriceSeries{SecurityID: id}
		for t, d := range days {
			if id == "DUNE" && d.After(fxDUNELast) {
				break
			}
			div, split := 0.0, 1.0
			if id == "ALDR" && d.Equal(fxDivDay) {
				div = fxDividend
			}
			if id == "ALDR" && d.Equal(fxSplitDay) {
				split = fxSplit
			}
			ps.Dates = append(ps.Dates, d)
			ps.Close = append(ps.Close, fxClose(id, t, d))
			ps.Dividend = append(ps.Dividend, div)
			ps.Split = append(ps.Split, split)
		}
		in.Prices = append(in.Prices, ps)
	}
	for t, d := range days {
		c := YieldCurve{Date: d, Tenors: fxTenors}
		for _, tn := range fxTenors {
			c.Yields = append(c.Yields, fxYield(t, tn))
		}
		in.Yields = append(in.Yields, c)
		in.Premiums = append(in.Premiums, DatedValue{Date: d, Value: fxPremium(t)})
	}
	return in
}

func fxParams() Params {
	return Params{
		RiskFreeTenorMonths:  120,
		GrowthConvention:     "d0",
		RollingWindows:       []int{21, 63},
		EWMALambda:           0.94,
		VaRLookbackDays:      100,
		BacktestDays:         50,
		LargeFlowFraction:    0.10,
		EmpiricalTenorMonths: 120,
		EmpiricalWindowWeeks: 52,
		BetaWindowWeeks:      104,
		StalePriceDays:       5,
		Scenarios:            stress.Standard(),
		WorstWindowDays:      10,
		Replays: []NamedWindow{
			{Name: "autumn", From: day("2024-09-02"), To: day("2024-10-31")},
			{Name: "before history", From: day("2020-03-02"), To: day("2020-03-31")},
		},
		Limits: []limits.Limit{
			{Name: "single name", Metric: "max_single_name_weight", WarnMax: f64(0.3), BreachMax: f64(0.4)},
			{Name: "rates shock", Metric: "scenario_loss", Scenario: "rates +100bp", BreachMax: f64(0.5)},
			{Name: "tracking", Metric: "tracking_error_ann", BreachMax: f64(1)},
		},
		Drift:       DriftParams{ZThreshold: 2.5, MinHistory: 4},
		HistoryDays: 504,
	}
}

// fxIndex is the weekday index of date d in the fixture.
func fxIndex(d time.Time) int {
	for t, x := range fxDays() {
		if x.Equal(d) {
			return t
		}
	}
	panic("not a fixture day: " + d.Format(time.DateOnly))
}
