package valuation

import (
	"testing"
)

func TestMultiStageTextbookExample(t *testing.T) {
	// Ross, Westerfield and Jaffe, Corporate Finance, stock valuation
	// chapter, differential-growth example (from memory): next dividend
	// $1.15 growing 15% a year for four more years, then 10% forever,
	// required return 15%. In our terms D0 = 1.00 with a 5-year stage at 15%
	// (dividends 1.15¹ … 1.15⁵) then g = 10%. By hand:
	//   years 1–5: Σ 1.15^t / 1.15^t = 5 × 1 = 5.00
	//   terminal:  D6/(0.15 − 0.10) = 1.15⁵·1.10/0.05, discounted by 1.15⁵ → 1.10/0.05 = 22.00
	//   total 27.00.
	// Growth equals the rate in the stage, exercising the r = 1 series; exact
	// arithmetic apart from rounding: 1e-12 relative.
	v, err := MultiStage{D0: 1, Stages: []Stage{{Years: 5, Growth: 0.15}}, K: 0.15, G: 0.10}.Value()
	if err != nil || !relClose(v, 27.00, 1e-12) {
		t.Fatalf("RWJ differential growth: %.12f, %v; want 27.00", v, err)
	}
}

func TestMultiStageTwoStageHandExample(t *testing.T) {
	// Two-stage model as taught in the CFA Program's equity valuation
	// readings (common practice), numbers ours, computed by hand:
	// D0 = 2.00, 20% growth for 3 years, then 5%, k = 12%.
	//   D1 = 2.40, D2 = 2.88, D3 = 3.456
	//   PV = 2.40/1.12 + 2.88/1.2544 + 3.456/1.404928
	//      = 2.142857 + 2.295918 + 2.459913 = 6.898688
	//   P3 = D3·1.05/(0.12 − 0.05) = 3.6288/0.07 = 51.84; PV = 51.84/1.404928 = 36.898688
	//   V  = 6.898688 + 36.898688 = 43.797376
	// Hand values carry six decimals: 1e-6 absolute.
	v, err := MultiStage{D0: 2, Stages: []Stage{{Years: 3, Growth: 0.20}}, K: 0.12, G: 0.05}.Value()
	if err != nil || v-43.797376 > 1e-6 || 43.797376-v > 1e-6 {
		t.Fatalf("two-stage: %.6f, %v; want 43.797376", v, err)
	}
}

func TestMultiStageCollapsesToConstantGrowth(t *testing.T) {
	// With every stage at the terminal growth and rate the model is the
	// constant-growth model, for every frequency and stub (the stage sums
	// telescope); 1e-12 relative covers the different summation order.
	k, g := 0.095, 0.04
	for _, m := range []int{1, 2, 4, 12} {
		for _, f := range []float64{0, 0.3, 0.75} {
			stages := []Stage{{Years: 3, Growth: g}, {Years: 2.5, Growth: g, Rate: ptr(k)}, {Years: 0.25, Growth: g}}
			ms, err := MultiStage{D0: 1.8, Frequency: m, StubFraction: f, Stages: stages, K: k, G: g}.Value()
			if err != nil {
				t.Fatal(err)
			}
			cg, _ := ConstantGrowth{D0: 1.8, Frequency: m, StubFraction: f, K: k, G: g}.Value()
			if !relClose(ms, cg, 1e-12) {
				t.Errorf("m=%d f=%g: multi-stage %.15g, constant growth %.15g", m, f, ms, cg)
			}
		}
	}
	// Textbook case m = 1, no stub: Gordon D0(1+g)/(k−g).
	v, _ := MultiStage{D0: 1.8, Stages: []Stage{{Years: 7, Growth: g}}, K: k, G: g}.Value()
	if want := 1.8 * (1 + g) / (k - g); !relClose(v, want, 1e-12) {
		t.Errorf("m=1: %.15g, Gordon %.15g", v, want)
	}
}

func TestMultiStageMatchesPaymentSum(t *testing.T) {
	// Closed-form stage sums against the payment-by-payment definition
	// (helpers_test.go), including stage rates, negative growth, stages
	// ending between payment dates and monthly payments; the sum stops
	// below 1e-17 of the total, so 1e-11 relative.
	cases := []MultiStage{
		{D0: 1, Frequency: 4, StubFraction: 0.4, K: 0.09, G: 0.03,
			Stages: []Stage{{Years: 2.6, Growth: 0.18}, {Years: 1.1, Growth: -0.05, Rate: ptr(0.11)}, {Years: 5, Growth: 0.07, Rate: ptr(0.08)}}},
		{D0: 3, Frequency: 12, StubFraction: 0.9, K: 0.07, G: 0.01,
			Stages: []Stage{{Years: 1.0 / 12, Growth: 0.3}, {Years: 10, Growth: 0.07}}},
		{D0: 0.4, Frequency: 2, K: 0.10, G: 0.045,
			Stages: []Stage{{Years: 0.7, Growth: 0.5, Rate: ptr(0.2)}}},
		{D0: 0.4, Frequency: 1, StubFraction: 0.5, K: 0.10, G: 0.045,
			Stages: []Stage{{Years: 3, Growth: 0.10, Rate: ptr(0.10)}}},
	}
	for i, c := range cases {
		v, err := c.Value()
		if err != nil {
			t.Fatal(err)
		}
		want := bruteStages(c.D0, max(c.Frequency, 1), c.StubFraction, c.Stages, c.K, c.G)
		if !relClose(v, want, 1e-11) {
			t.Errorf("case %d: %.12f, payment sum %.12f", i, v, want)
		}
	}
}

func TestStageDurationsAddUp(t *testing.T) {
	// Per-stage shifts partition the parallel shift, so by linearity of the
	// first derivative they add up to the parallel duration (exact
	// identity); the sum of error estimates bounds the discrepancy.
	beta := 1.2
	a := Assumptions{D0: 1.3, Growth: 0.03, Beta: &beta, Frequency: 4, StubFraction: 0.2,
		Stages: []Stage{{Years: 2, Growth: 0.15}, {Years: 3, Growth: 0.08, Rate: ptr(0.1)}, {Years: 2.5, Growth: 0.05}}}
	for _, conv := range []GrowthConvention{D0Fixed, D1Fixed} {
		s, err := Analyze(a, Market{RiskFree: 0.03, ERP: 0.05}, Options{GrowthConvention: conv})
		if err != nil {
			t.Fatal(err)
		}
		if len(s.StageRateDurations) != 4 || len(s.StageGrowthDurations) != 4 {
			t.Fatalf("stage slices %d, %d; want 4 (three stages and terminal)", len(s.StageRateDurations), len(s.StageGrowthDurations))
		}
		var sr, sg float64
		for i := range s.StageRateDurations {
			sr += s.StageRateDurations[i]
			sg += s.StageGrowthDurations[i]
		}
		tolR := s.Errors.ModifiedDuration + 4*s.Errors.StageRate
		tolG := s.Errors.GrowthDuration + 4*s.Errors.StageGrowth
		if d := sr - s.ModifiedDuration; d > tolR || -d > tolR {
			t.Errorf("%v: Σ stage rate durations %.12g, modified %.12g", conv, sr, s.ModifiedDuration)
		}
		if d := sg - s.GrowthDuration; d > tolG || -d > tolG {
			t.Errorf("%v: Σ stage growth durations %.12g, growth duration %.12g", conv, sg, s.GrowthDuration)
		}
		// The stage with its own rate does not follow CAPM: the risk-free
		// duration is the parallel duration less that stage's share.
		if want := s.ModifiedDuration - s.StageRateDurations[1]; !relClose(s.RiskFreeDuration, want, 1e-6) {
			t.Errorf("%v: risk-free duration %.10g, want %.10g", conv, s.RiskFreeDuration, want)
		}
	}
}
