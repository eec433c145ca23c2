package returns

import (
	"errors"
	"math"
	"testing"
	"time"
)

// flowSeries builds 90 weekdays of values from 2024-01-29 with known daily
// returns r_t = 0.004·sin(t) + 0.0003 and end-of-day flows: small ones
// (2% of value) every 9th day, withdrawals of 3% every 13th day, and large
// ones (+15% on day 20, -12% on day 55). V_t = V_{t-1}(1+r_t) + F_t, so the
// true time-weighted return is Π(1+r_t) - 1 by construction.
func flowSeries() (ValueSeries, float64) {
	v := ValueSeries{}
	day := d("2024-01-29")
	val, g := 1_000_000.0, 1.0
	for t := 0; len(v.Dates) < 90; day = day.AddDate(0, 0, 1) {
		if wd := day.Weekday(); wd == time.Saturday || wd == time.Sunday {
			continue
		}
		var f float64
		if t > 0 {
			r := 0.004*math.Sin(float64(t)) + 0.0003
			val *= 1 + r
			g *= 1 + r
			switch {
			case t == 20:
				f = 0.15 * val
			case t == 55:
				f = -0.12 * val
			case t%9 == 0:
				f = 0.02 * val
			case t%13 == 0:
				f = -0.03 * val
			}
			val += f
		}
		v.Dates = append(v.Dates, day)
		v.Values = append(v.Values, val)
		v.Flows = append(v.Flows, f)
		t++
	}
	return v, g - 1
}

// TestLinkingEqualsUnitValue: on the same data, the linking method (GIPS
// sub-periods with revaluation at every flow, threshold 0), the linked daily
// returns and the unit-value method give the same time-weighted return,
// which is also the return built into the data. All are exact algebraic
// identities; 1e-12 relative covers 90 steps of rounding.
func TestLinkingEqualsUnitValue(t *testing.T) {
	v, want := flowSeries()
	twr, err := TimeWeightedReturn(v, 0)
	if err != nil {
		t.Fatal(err)
	}
	uv, err := UnitValueReturn(v)
	if err != nil {
		t.Fatal(err)
	}
	daily, err := DailyReturns(v)
	if err != nil {
		t.Fatal(err)
	}
	linked, _ := Link(daily)
	for name, got := range map[string]float64{"linking": twr.Return, "unit value": uv, "daily linked": linked} {
		if !closeTo(got, want, 1e-12, 0) {
			t.Errorf("%s: %v, want %v", name, got, want)
		}
	}
}

// TestTimeWeightedReturnLargeFlows: with a 10% threshold the sub-periods end
// at the two large flows, at each month end and on the last day, and only
// there; small flows are handled by Modified Dietz inside them, which only
// approximates the true TWR. Its error is of second order: about the flow
// as a fraction of value (2-3%) times how far the return up to the flow
// strays from the sub-period's average (under 1% here), summed over a dozen
// flows, so a few 1e-4; the test allows 1e-3 and requires a difference.
func TestTimeWeightedReturnLargeFlows(t *testing.T) {
	v, want := flowSeries()
	twr, err := TimeWeightedReturn(v, DefaultLargeFlow)
	if err != nil {
		t.Fatal(err)
	}
	var large []time.Time
	for _, sp := range twr.SubPeriods {
		if sp.LargeFlow {
			large = append(large, sp.End)
		}
	}
	if len(large) != 2 || !large[0].Equal(v.Dates[20]) || !large[1].Equal(v.Dates[55]) {
		t.Errorf("large-flow boundaries %v, want %v and %v", large, v.Dates[20], v.Dates[55])
	}
	// 2024-01-29 .. 2024-05-31: month ends Jan 31, Feb 29, Mar 29, Apr 30,
	// the last day May 31 and 2 large flows = 7 sub-periods.
	if len(twr.SubPeriods) != 7 || !v.Dates[len(v.Dates)-1].Equal(d("2024-05-31")) {
		t.Errorf("%d sub-periods, want 7", len(twr.SubPeriods))
	}
	g := 1.0
	for i, sp := range twr.SubPeriods {
		g *= 1 + sp.Return
		if i > 0 && !sp.Start.Equal(twr.SubPeriods[i-1].End) {
			t.Errorf("sub-period %d starts %v, previous ended %v", i, sp.Start, twr.SubPeriods[i-1].End)
		}
	}
	if !closeTo(g-1, twr.Return, 1e-14, 0) {
		t.Errorf("linked sub-periods %v, total %v", g-1, twr.Return)
	}
	if math.Abs(twr.Return-want) > 1e-3 || twr.Return == want {
		t.Errorf("TWR with MD sub-periods %v, true TWR %v", twr.Return, want)
	}
}

// TestTimeWeightedReturnRevaluation (hand computation): 1,000 at the end of
// March; a 200 contribution (20%, large) at the end of 10 April when the
// value becomes 1,250; 1,300 at the end of April.
//
//	sub-period 1: (1,250 - 1,000 - 200) / 1,000 = 5%   (flow weight 0)
//	sub-period 2: 1,300 / 1,250 - 1             = 4%
//	TWR = 1.05 · 1.04 - 1 = 9.2%
//
// Modified Dietz over the whole month would give 100 / (1,000 + 200·20/30)
// = 8.82%; with a 25% threshold the flow is small and that is the result.
func TestTimeWeightedReturnRevaluation(t *testing.T) {
	v := ValueSeries{
		Dates:  []time.Time{d("2024-03-31"), d("2024-04-10"), d("2024-04-30")},
		Values: []float64{1000, 1250, 1300},
		Flows:  []float64{0, 200, 0},
	}
	twr, err := TimeWeightedReturn(v, 0.10)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(twr.Return-0.092) > 1e-15 || len(twr.SubPeriods) != 2 || !twr.SubPeriods[0].LargeFlow {
		t.Errorf("%+v", twr)
	}
	md, _ := TimeWeightedReturn(v, 0.25)
	if want := 100 / (1000 + 200*20.0/30); math.Abs(md.Return-want) > 1e-15 || len(md.SubPeriods) != 1 {
		t.Errorf("25%% threshold: %+v, want %v", md, want)
	}
}

func TestTimeWeightedReturnErrors(t *testing.T) {
	v, _ := flowSeries()
	for _, th := range []float64{-0.1, math.NaN(), math.Inf(1)} {
		if _, err := TimeWeightedReturn(v, th); !errors.Is(err, ErrThreshold) {
			t.Errorf("threshold %v: %v", th, err)
		}
	}
	bad := ValueSeries{Dates: v.Dates[:3], Values: v.Values[:2], Flows: v.Flows[:3]}
	if _, err := TimeWeightedReturn(bad, 0.1); !errors.Is(err, ErrLength) {
		t.Errorf("lengths: %v", err)
	}
}
