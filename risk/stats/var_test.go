package stats

import (
	"errors"
	"math"
	"testing"
)

// unitSample returns four returns with sample mean 0 and sample standard
// deviation exactly 1: ±sqrt(3)/2 twice (variance 4·(3/4)/3 = 1).
func unitSample() []float64 {
	a := math.Sqrt(3) / 2
	return []float64{-a, a, -a, a}
}

// TestNormalQuantiles: standard normal quantiles z_0.95 = 1.6449 and
// z_0.99 = 2.3263 as printed in normal tables (common practice, 4 decimals:
// tolerance 5e-5), and scipy 1.10 scipy.stats.norm.ppf to 1e-11 relative.
func TestNormalQuantiles(t *testing.T) {
	ref := loadReference(t)
	for _, c := range []struct {
		conf  float64
		table float64
		key   string
	}{{0.95, 1.6449, "0.95"}, {0.99, 2.3263, "0.99"}} {
		e, err := NormalVaR(unitSample(), c.conf)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(e.VaR-c.table) > 5e-5 {
			t.Errorf("z_%v = %v, table %v", c.conf, e.VaR, c.table)
		}
		if !closeTo(e.VaR, ref.NormPPF[c.key], 1e-11, 0) {
			t.Errorf("z_%v = %v, scipy %v", c.conf, e.VaR, ref.NormPPF[c.key])
		}
	}
}

// TestVaRAgainstReference compares every method with the reference values on
// the asset returns of returns.csv:
//   - historical: numpy 1.24 quantile(losses, c, method="inverted_cdf"), and
//     the Acerbi-Tasche tail mean evaluated with numpy on sorted losses;
//   - 5-day overlapping: the same on pandas rolling(5) products of (1+r);
//   - normal: z σ - μ and σ φ(z)/(1-c) - μ with scipy.stats.norm;
//   - Cornish-Fisher: VaR from the expansion with scipy skew/kurtosis
//     (bias=False); ES by scipy.integrate.quad of the expanded quantile
//     function over (0, 1-c), independent of our closed form.
//
// Tolerance 1e-10 relative: order statistics are copied exactly, the rest
// are short sums; quad's requested accuracy is 1e-13 and the JSON keeps 12
// digits.
func TestVaRAgainstReference(t *testing.T) {
	ref := loadReference(t)
	asset, _ := assetReturns(t)
	for key, conf := range map[string]float64{"0.95": 0.95, "0.99": 0.99} {
		want := ref.VaR[key]
		cases := []struct {
			name string
			spec VaRSpec
			r    []float64
			ref  varRef
		}{
			{"hist_n600", VaRSpec{Method: Historical, Confidence: conf}, asset, want["hist_n600"]},
			{"hist_n250", VaRSpec{Method: Historical, Confidence: conf}, asset[:250], want["hist_n250"]},
			{"hist_5d_overlap", VaRSpec{Method: Historical, Confidence: conf, HorizonDays: 5, Rule: Overlapping}, asset, want["hist_5d_overlap"]},
			{"normal", VaRSpec{Method: Normal, Confidence: conf}, asset, want["normal"]},
			{"cornish_fisher", VaRSpec{Method: CornishFisher, Confidence: conf}, asset, want["cornish_fisher"]},
		}
		for _, c := range cases {
			e, err := EstimateVaR(c.r, c.spec)
			if err != nil {
				t.Fatalf("%s %s: %v", key, c.name, err)
			}
			if !closeTo(e.VaR, c.ref.VaR, 1e-10, 0) || !closeTo(e.ES, c.ref.ES, 1e-10, 0) {
				t.Errorf("%s %s: VaR %v ES %v, reference %v %v", key, c.name, e.VaR, e.ES, c.ref.VaR, c.ref.ES)
			}
			if c.ref.N != 0 && e.Observations != c.ref.N {
				t.Errorf("%s %s: %d observations, reference %d", key, c.name, e.Observations, c.ref.N)
			}
			if e.ES < e.VaR {
				t.Errorf("%s %s: ES %v below VaR %v", key, c.name, e.ES, e.VaR)
			}
		}
	}
}

// TestHistoricalWorkedExample: 250 daily returns -0.001·k, k = 1..250, so
// the losses are 0.001 .. 0.250. At 99%: ⌈250·0.99⌉ = 248, VaR = the 248th
// smallest loss = the third worst = 0.248; m = 2.5,
// ES = (0.250 + 0.249 + 0.5·0.248) / 2.5 = 0.2492 (hand computation from the
// stated definitions). At 95%: ⌈237.5⌉ = 238 → 0.238; m = 12.5,
// ES = (Σ_{k=239}^{250} k/1000 + 0.5·0.238) / 12.5 = (2.934 + 0.119)/12.5.
func TestHistoricalWorkedExample(t *testing.T) {
	r := make([]float64, 250)
	for k := range r {
		r[k] = -0.001 * float64(k+1)
	}
	for _, c := range []struct{ conf, varWant, esWant float64 }{
		{0.99, 0.248, 0.2492},
		{0.95, 0.238, (2.934 + 0.119) / 12.5},
	} {
		e, err := HistoricalVaR(r, c.conf)
		if err != nil {
			t.Fatal(err)
		}
		if !closeTo(e.VaR, c.varWant, 1e-14, 0) || !closeTo(e.ES, c.esWant, 1e-13, 0) {
			t.Errorf("%v: VaR %v ES %v, want %v %v", c.conf, e.VaR, e.ES, c.varWant, c.esWant)
		}
	}
}

// TestEmpiricalQuantile: Hyndman and Fan (1996) type 1 on 1..10: Q(0.25) =
// x_(⌈2.5⌉) = 3, Q(0.3) = x_(3) = 3 (n·p = 3 exactly, although 0.3 is not
// exact in binary), Q(0.31) = 4, Q(1) = 10; numpy quantile with
// method="inverted_cdf" gives the same (hand check of its definition).
func TestEmpiricalQuantile(t *testing.T) {
	x := []float64{7, 3, 1, 10, 2, 9, 4, 8, 6, 5}
	for _, c := range []struct{ p, want float64 }{{0.25, 3}, {0.3, 3}, {0.31, 4}, {0.1, 1}, {1, 10}, {0.01, 1}} {
		got, err := EmpiricalQuantile(x, c.p)
		if err != nil || got != c.want {
			t.Errorf("Q(%v) = %v, %v; want %v", c.p, got, err, c.want)
		}
	}
}

// TestHorizonRules: the square-root-of-time rule multiplies the 1-day
// figures by sqrt(5) exactly (definition), and is the default rule.
func TestHorizonRules(t *testing.T) {
	asset, _ := assetReturns(t)
	for _, m := range []VaRMethod{Historical, Normal, CornishFisher} {
		one, err := EstimateVaR(asset, VaRSpec{Method: m, Confidence: 0.99})
		if err != nil {
			t.Fatal(err)
		}
		five, err := EstimateVaR(asset, VaRSpec{Method: m, Confidence: 0.99, HorizonDays: 5})
		if err != nil {
			t.Fatal(err)
		}
		if !closeTo(five.VaR, math.Sqrt(5)*one.VaR, 1e-15, 0) || !closeTo(five.ES, math.Sqrt(5)*one.ES, 1e-15, 0) {
			t.Errorf("%v: 5-day %+v, 1-day %+v", m, five, one)
		}
	}
	// Overlapping 2-day returns of 10%, -10%, 20%: 1.1·0.9 - 1 = -0.01 and
	// 0.9·1.2 - 1 = 0.08 (hand computation). Subtracting 1 from the growth
	// factor leaves rounding of order ε·1, hence an absolute 1e-15.
	o, err := OverlappingReturns([]float64{0.1, -0.1, 0.2}, 2)
	if err != nil || len(o) != 2 || !closeTo(o[0], -0.01, 1e-15, 1) || !closeTo(o[1], 0.08, 1e-15, 1) {
		t.Errorf("overlapping %v %v", o, err)
	}
}

func TestVaRErrors(t *testing.T) {
	r := make([]float64, 50)
	for i := range r {
		r[i] = 0.001 * float64(i%7-3)
	}
	cases := []struct {
		name string
		spec VaRSpec
		want error
	}{
		{"confidence 1", VaRSpec{Method: Normal, Confidence: 1}, ErrConfidence},
		{"confidence 0", VaRSpec{Method: Historical}, ErrConfidence},
		{"confidence NaN", VaRSpec{Method: CornishFisher, Confidence: math.NaN()}, ErrConfidence},
		{"tail empty", VaRSpec{Method: Historical, Confidence: 0.99}, ErrTooShort},
		{"negative horizon", VaRSpec{Method: Normal, Confidence: 0.95, HorizonDays: -1}, ErrHorizon},
		{"horizon too long", VaRSpec{Method: Normal, Confidence: 0.95, HorizonDays: 60, Rule: Overlapping}, ErrTooShort},
		{"method", VaRSpec{Method: VaRMethod(9), Confidence: 0.95}, ErrMethod},
		{"rule", VaRSpec{Method: Normal, Confidence: 0.95, Rule: HorizonRule(7)}, ErrMethod},
	}
	for _, c := range cases {
		if _, err := EstimateVaR(r, c.spec); !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.want)
		}
	}
	if _, err := NormalVaR([]float64{0.1, math.Inf(-1)}, 0.95); !errors.Is(err, ErrNonFinite) {
		t.Errorf("Inf: %v", err)
	}
}

func BenchmarkHistoricalVaR2520(b *testing.B) {
	x := benchSeries(2520)
	b.ResetTimer()
	for range b.N {
		if _, err := HistoricalVaR(x, 0.99); err != nil {
			b.Fatal(err)
		}
	}
}
