package pack

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"plumbline/risk/limits"
	"plumbline/risk/stress"
)

// benchInputs builds a deterministic book of nHeld holdings among
// nHeld+50 securities with nDays weekdays of prices (quarterly dividends,
// a 2-for-1 split in every fifth security), a snapshot every quarter, a
// flow every month, daily curves and premiums, and assumptions of every
// kind: constant growth with a beta, three-stage growth, no beta (so
// estimated) and, one in twenty, k <= g.
func benchInputs(nHeld, nDays int) *Inputs {
	rng := rand.New(rand.NewPCG(7, 11))
	nSec := nHeld + 50
	var days []time.Time
	for d := time.Date(2015, 6, 1, 0, 0, 0, 0, time.UTC); len(days) < nDays; d = d.AddDate(0, 0, 1) {
		if wd := d.Weekday(); wd != time.Saturday && wd != time.Sunday {
			days = append(days, d)
		}
	}
	asOf := days[len(days)-1]
	in := &Inputs{AsOf: asOf, BaseCurrency: "USD", Sources: []string{"bench.csv"},
		Portfolio: PortfolioInfo{ID: "BENCH", Name: "Bench", Strategy: "x", Inception: days[0].Format(time.DateOnly), BenchmarkMethod: "value"}}
	sectors := []string{"Industrials", "Staples", "Utilities", "Technology", "Materials", "Energy"}
	for i := range nSec {
		id := fmt.Sprintf("S%04d", i)
		in.Securities = append(in.Securities, Security{ID: id, Name: "Company " + id, Sector: sectors[i%len(sectors)], Currency: "USD", SharesOutstanding: 1e6 + float64(rng.IntN(1e7))})
		ps := PriceSeries{SecurityID: id, Dates: days, Close: make([]float64, nDays), Dividend: make([]float64, nDays), Split: make([]float64, nDays)}
		p := 20 + 80*rng.Float64()
		splitAt := -1
		if i%5 == 0 {
			splitAt = nDays/3 + rng.IntN(nDays/3)
		}
		for t := range days {
			p *= math.Exp(0.0002 + 0.015*rng.NormFloat64())
			ps.Split[t] = 1
			if t == splitAt {
				p /= 2
				ps.Split[t] = 2
			}
			ps.Close[t] = p
			if t%63 == 30 {
				ps.Dividend[t] = p * 0.008
			}
		}
		in.Prices = append(in.Prices, ps)
		beta := 0.6 + 0.8*rng.Float64()
		a := Assumption{SecurityID: id, Effective: days[0], AnnualDividend: 0.5 + 2*rng.Float64(), Frequency: []int{1, 2, 4, 12}[i%4], Growth: 0.01 + 0.03*rng.Float64()}
		switch i % 4 {
		case 0:
			a.Beta = &beta
		case 1:
			a.Beta = &beta
			a.Stages = []Stage{{Years: 2, Growth: 0.10}, {Years: 3, Growth: 0.07}, {Years: 2.5, Growth: 0.045}}
		case 2: // no beta: estimated
		case 3:
			a.Beta = &beta
			if i%20 == 3 {
				k := a.Growth - 0.005
				a.DiscountRate = &k
			}
		}
		in.Assumptions = append(in.Assumptions, a)
	}
	for q := 0; q*63 < nDays; q++ {
		s := Snapshot{AsOf: days[q*63], Cash: 1e5}
		for i := range nHeld {
			s.Lines = append(s.Lines, Line{SecurityID: fmt.Sprintf("S%04d", i), Quantity: float64(100 + 10*((i+q)%50))})
		}
		in.Snapshots = append(in.Snapshots, s)
	}
	for t := 21; t < nDays; t += 21 {
		in.Flows = append(in.Flows, DatedValue{Date: days[t], Value: 5e4 * (rng.Float64() - 0.4)})
	}
	for t, d := range days {
		c := YieldCurve{Date: d, Tenors: []int{3, 12, 24, 60, 120, 360}}
		for _, tn := range c.Tenors {
			c.Yields = append(c.Yields, 0.03+0.01*(1-math.Exp(-float64(tn)/30))+0.005*math.Sin(float64(t)/50)+0.0005*rng.NormFloat64())
		}
		in.Yields = append(in.Yields, c)
		in.Premiums = append(in.Premiums, DatedValue{Date: d, Value: 0.05})
	}
	return in
}

func benchParams() Params {
	p := fxParams()
	p.RollingWindows = []int{21, 63, 252}
	p.VaRLookbackDays = 500
	p.BacktestDays = 250
	p.EmpiricalWindowWeeks = 104
	p.Scenarios = stress.Standard()
	p.Replays = []NamedWindow{{Name: "w", From: time.Date(2018, 10, 1, 0, 0, 0, 0, time.UTC), To: time.Date(2018, 12, 31, 0, 0, 0, 0, time.UTC)}}
	p.Limits = []limits.Limit{{Name: "dur", Metric: "duration_modified", BreachMax: f64(40)}}
	return p
}

// BenchmarkCompute200x2520 is one portfolio of 200 holdings with ten
// years (2,520 days) of daily prices; the goal is well under 300 ms.
func BenchmarkCompute200x2520(b *testing.B) {
	in, p := benchInputs(200, 2520), benchParams()
	if _, err := Compute(in, p); err != nil {
		b.Fatal(err)
	}
	var cpu0 time.Duration
	if processCPU != nil {
		cpu0 = processCPU()
	}
	n := 0
	for b.Loop() {
		if _, err := Compute(in, p); err != nil {
			b.Fatal(err)
		}
		n++
	}
	if processCPU != nil && n > 0 {
		b.ReportMetric(float64(processCPU()-cpu0)/float64(n)/1e6, "cpu-ms/op")
	}
}

// processCPU returns the process's CPU time where the platform tells it.
var processCPU func() time.Duration
