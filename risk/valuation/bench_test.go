package valuation

import (
	"math/rand/v2"
	"testing"

	"plumbline/risk/curve"
)

// benchHoldings returns n deterministic three-stage holdings: three finite
// stages (high growth, fade, transition) then the terminal stage, mixed
// payment frequencies and stubs, a third with an explicit rate on the
// second stage.
func benchHoldings(n int) []Assumptions {
	rng := rand.New(rand.NewPCG(1, 2))
	freqs := []int{1, 2, 4, 12}
	out := make([]Assumptions, n)
	for i := range out {
		beta := 0.6 + rng.Float64()
		a := Assumptions{
			D0:           0.5 + 2.5*rng.Float64(),
			Frequency:    freqs[i%len(freqs)],
			StubFraction: rng.Float64() * 0.99,
			Growth:       0.02 + 0.02*rng.Float64(),
			Beta:         &beta,
			Stages: []Stage{
				{Years: 1 + float64(rng.IntN(5)), Growth: 0.15 * rng.Float64()},
				{Years: 1 + float64(rng.IntN(5)), Growth: 0.10 * rng.Float64()},
				{Years: 2.5, Growth: 0.05 * rng.Float64()},
			},
		}
		if i%3 == 0 {
			r := 0.08 + 0.04*rng.Float64()
			a.Stages[1].Rate = &r
		}
		out[i] = a
	}
	return out
}

// BenchmarkAllMeasuresThreeStage computes the full numerical set (value,
// modified and Macaulay duration, convexity, growth duration and convexity,
// cross term, CAPM sensitivities, per-stage rate and growth durations, error
// estimates) for 10,000 holdings; ns/holding is the figure to watch (goal
// < 50,000).
func BenchmarkAllMeasuresThreeStage(b *testing.B) {
	const n = 10000
	hs := benchHoldings(n)
	mkt := Market{RiskFree: 0.035, ERP: 0.05}
	res := make([]Sensitivities, n)
	var z Analyzer
	b.ReportAllocs()
	for b.Loop() {
		for i := range hs {
			if err := z.Analyze(&res[i], hs[i], mkt, Options{}); err != nil {
				b.Fatal(err)
			}
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/holding")
}

// BenchmarkConstantGrowthClosedForm is the closed-form path for comparison.
func BenchmarkConstantGrowthClosedForm(b *testing.B) {
	beta := 1.1
	a := Assumptions{D0: 2, Growth: 0.03, Beta: &beta, Frequency: 4, StubFraction: 0.4}
	mkt := Market{RiskFree: 0.035, ERP: 0.05}
	var z Analyzer
	var s Sensitivities
	b.ReportAllocs()
	for b.Loop() {
		if err := z.Analyze(&s, a, mkt, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTermStructure is one holding on the curve model (quarterly, 30
// years explicit, three stages), including Nelson–Siegel factor durations.
func BenchmarkTermStructure(b *testing.B) {
	a := benchHoldings(1)[0]
	a.Frequency = 4
	mkt := Market{RiskFree: 0.035, ERP: 0.05,
		Curve: &curve.NelsonSiegel{Level: 0.045, Slope: -0.015, Curvature: 0.01, Lambda: curve.DieboldLiLambda}}
	var z Analyzer
	var s Sensitivities
	b.ReportAllocs()
	for b.Loop() {
		if err := z.Analyze(&s, a, mkt, Options{UseCurve: true}); err != nil {
			b.Fatal(err)
		}
	}
}
