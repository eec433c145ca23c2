package returns

import (
	"errors"
	"math"
	"testing"
)

// TestMeansPriceRoundTrip: a price going 100 -> 200 -> 100 has returns +100%
// and -50%: arithmetic mean 25%, geometric mean 0% (common practice — the
// arithmetic mean overstates compound growth).
func TestMeansPriceRoundTrip(t *testing.T) {
	r := []float64{1, -0.5}
	a, _ := ArithmeticMean(r)
	g, err := GeometricMeanReturn(r)
	if err != nil {
		t.Fatal(err)
	}
	if a != 0.25 || math.Abs(g) > 1e-16 {
		t.Errorf("arithmetic %v, geometric %v", a, g)
	}
}

// TestMeansAgainstScipy: numpy mean, scipy 1.10 scipy.stats.gmean(1+r) - 1,
// hmean of the positive P/E ratios of pe.csv, and hmean with market-value
// weights. Tolerance 1e-11 relative (12-digit JSON).
func TestMeansAgainstScipy(t *testing.T) {
	ref := loadReference(t)
	asset := refAsset(t)
	a, _ := ArithmeticMean(asset)
	g, _ := GeometricMeanReturn(asset)
	if !closeTo(a, ref.Means.Arith, 1e-11, 0) || !closeTo(g, ref.Means.GeoReturn, 1e-11, 0) {
		t.Errorf("arithmetic %v geometric %v, numpy/scipy %v %v", a, g, ref.Means.Arith, ref.Means.GeoReturn)
	}
	var pe, mv []float64
	for _, r := range readCSV(t, "pe.csv") {
		shares, price, eps := num(t, r[1]), num(t, r[2]), num(t, r[3])
		if eps > 0 {
			pe = append(pe, price/eps)
			mv = append(mv, shares*price)
		}
	}
	h, _ := HarmonicMean(pe)
	wh, err := WeightedHarmonicMean(pe, mv)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(h, ref.Means.HmeanPEPositive, 1e-11, 0) || !closeTo(wh, ref.Means.WHmeanPEPositive, 1e-11, 0) {
		t.Errorf("hmean %v weighted %v, scipy %v %v", h, wh, ref.Means.HmeanPEPositive, ref.Means.WHmeanPEPositive)
	}
	gm, _ := GeometricMean([]float64{1, 4, 16})
	if !closeTo(gm, 4, 1e-15, 0) { // (1·4·16)^(1/3) = 4
		t.Errorf("gmean %v", gm)
	}
}

// TestValueWeightedRatio: the look-through P/E of the holdings in pe.csv,
// which include a tiny (0.001), a zero and a negative EPS, equals the
// market value held divided by the earnings owned, Σ q·P / Σ q·E (evaluated
// with numpy from totals, a different route from our earnings yields).
// Tolerance 1e-11 relative.
func TestValueWeightedRatio(t *testing.T) {
	ref := loadReference(t)
	var w, price, eps []float64
	for _, r := range readCSV(t, "pe.csv") {
		shares, p, e := num(t, r[1]), num(t, r[2]), num(t, r[3])
		w = append(w, shares*p)
		price = append(price, p)
		eps = append(eps, e)
	}
	got, err := ValueWeightedRatio(w, price, eps)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(got, ref.Means.PELookThrough, 1e-11, 0) {
		t.Errorf("look-through P/E %v, numpy %v", got, ref.Means.PELookThrough)
	}
	// With positive ratios it is the weighted harmonic mean of the ratios.
	pw, _ := ValueWeightedRatio([]float64{1, 3}, []float64{20, 30}, []float64{2, 1})
	wh, _ := WeightedHarmonicMean([]float64{10, 30}, []float64{1, 3})
	if !closeTo(pw, wh, 1e-15, 0) || !closeTo(pw, 4.0/(0.1+0.1), 1e-15, 0) {
		t.Errorf("ratio %v, harmonic %v, want 20", pw, wh)
	}
	// Aggregate earnings not positive: undefined, not a huge or negative P/E.
	if _, err := ValueWeightedRatio([]float64{1, 1}, []float64{10, 10}, []float64{1, -1}); !errors.Is(err, ErrUndefined) {
		t.Errorf("zero aggregate earnings: %v", err)
	}
}

// TestAnnualizeMean: 0.04% a day is 10.08% a year arithmetically (×252) and
// 1.0004^252 - 1 geometrically (the project's 252-day convention).
func TestAnnualizeMean(t *testing.T) {
	a, _ := AnnualizeMean(0.0004, 252, false)
	g, _ := AnnualizeMean(0.0004, 252, true)
	if !closeTo(a, 0.1008, 1e-14, 0) || !closeTo(g, math.Pow(1.0004, 252)-1, 1e-15, 0) {
		t.Errorf("arith %v geo %v", a, g)
	}
}

func TestMeansErrors(t *testing.T) {
	cases := []struct {
		name string
		err  error
		want error
	}{
		{"empty", func() error { _, err := ArithmeticMean(nil); return err }(), ErrEmpty},
		{"geo -100%", func() error { _, err := GeometricMeanReturn([]float64{0.1, -1}); return err }(), ErrReturn},
		{"hmean zero", func() error { _, err := HarmonicMean([]float64{1, 0}); return err }(), ErrNonPositive},
		{"weights negative", func() error { _, err := WeightedHarmonicMean([]float64{1, 2}, []float64{1, -1}); return err }(), ErrWeights},
		{"weights zero", func() error { _, err := WeightedHarmonicMean([]float64{1, 2}, []float64{0, 0}); return err }(), ErrWeights},
		{"length", func() error { _, err := ValueWeightedRatio([]float64{1}, []float64{1, 2}, []float64{1}); return err }(), ErrLength},
		{"price zero", func() error { _, err := ValueWeightedRatio([]float64{1}, []float64{0}, []float64{1}); return err }(), ErrNonPositive},
		{"periods", func() error { _, err := AnnualizeMean(0.01, 0, true); return err }(), ErrNonPositive},
	}
	for _, c := range cases {
		if !errors.Is(c.err, c.want) {
			t.Errorf("%s: %v, want %v", c.name, c.err, c.want)
		}
	}
}
