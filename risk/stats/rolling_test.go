package stats

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// TestRollingAgainstPandas compares with pandas 1.5 Series.rolling(w).mean()
// and .std() (ddof=1) on the discrete, log and dollar series built from
// returns.csv. pandas uses its own online add/remove algorithm, accurate to
// about 1e-13 relative on these data; the JSON keeps 12 significant digits.
// Tolerance: 1e-10 relative; means, which cross zero, relative to the
// series' typical size (its standard deviation) rather than to themselves.
func TestRollingAgainstPandas(t *testing.T) {
	ref := loadReference(t)
	asset, _ := assetReturns(t)
	series := map[string][]float64{"discrete": asset}
	logs := make([]float64, len(asset))
	dollar := make([]float64, len(asset))
	p := 100.0
	for i, r := range asset {
		logs[i] = math.Log1p(r)
		np := p * (1 + r)
		dollar[i] = np - p
		p = np
	}
	series["log"], series["dollar"] = logs, dollar
	for name, x := range series {
		scale, _ := StdDev(x)
		for _, w := range []int{21, 63, 252} {
			key := fmt.Sprintf("%s_%d", name, w)
			want, ok := ref.Rolling[key]
			if !ok {
				t.Fatalf("reference %s missing", key)
			}
			m, s, err := RollingMeanStd(x, w)
			if err != nil {
				t.Fatal(err)
			}
			// RollingStd has its own std-only loop: check it too.
			s2, err := RollingStd(x, w)
			if err != nil {
				t.Fatal(err)
			}
			if len(m) != len(want.Mean) || len(s) != len(want.Std) || len(s2) != len(want.Std) {
				t.Fatalf("%s: lengths %d, %d, %d, want %d, %d", key, len(m), len(s), len(s2), len(want.Mean), len(want.Std))
			}
			for j := range m {
				if !closeTo(m[j], want.Mean[j], 1e-10, scale) {
					t.Errorf("%s mean[%d] = %v, pandas %v", key, j, m[j], want.Mean[j])
				}
				if !closeTo(s[j], want.Std[j], 1e-10, 0) || !closeTo(s2[j], want.Std[j], 1e-10, 0) {
					t.Errorf("%s std[%d] = %v / %v, pandas %v", key, j, s[j], s2[j], want.Std[j])
				}
			}
		}
	}
}

// exactMeanVar computes the mean and sample variance of x with big.Float at
// 2000 bits: every float64 sum and square of a few hundred values is exact at
// that precision, so the result is the true value rounded once.
func exactMeanVar(x []float64) (float64, float64) {
	const prec = 2000
	sum := new(big.Float).SetPrec(prec)
	for _, v := range x {
		sum.Add(sum, new(big.Float).SetPrec(prec).SetFloat64(v))
	}
	n := new(big.Float).SetPrec(prec).SetInt64(int64(len(x)))
	m := new(big.Float).SetPrec(prec).Quo(sum, n)
	ss := new(big.Float).SetPrec(prec)
	for _, v := range x {
		d := new(big.Float).SetPrec(prec).SetFloat64(v)
		d.Sub(d, m)
		ss.Add(ss, new(big.Float).SetPrec(prec).Mul(d, d))
	}
	ss.Quo(ss, new(big.Float).SetPrec(prec).SetInt64(int64(len(x)-1)))
	mf, _ := m.Float64()
	vf, _ := ss.Float64()
	return mf, vf
}

// naiveStd is the textbook two-pass sample standard deviation of one window.
func naiveStd(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	m := s / float64(len(x))
	var q float64
	for _, v := range x {
		q += (v - m) * (v - m)
	}
	return math.Sqrt(q / float64(len(x)-1))
}

func maxAbs(x []float64) float64 {
	var m float64
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	return m
}

// hostile returns series that break careless rolling algorithms.
func hostile() map[string][]float64 {
	rng := rand.New(rand.NewPCG(7, 11))
	const n = 1500
	out := map[string][]float64{}

	// A large offset with a tiny variance: 1e9 + N(0, 1e-6).
	x := make([]float64, n)
	for i := range x {
		x[i] = 1e9 + 1e-3*rng.NormFloat64()
	}
	out["offset1e9_var1e-6"] = x

	// Long constant runs between noisy stretches, at an awkward level.
	x = make([]float64, n)
	for i := range x {
		switch {
		case i%500 < 300:
			x[i] = 0.1 // constant run of 300
		default:
			x[i] = 0.1 + 0.05*rng.NormFloat64()
		}
	}
	out["constant_runs"] = x

	// A lone spike of 1e12 in data of size 1: once it leaves the window,
	// add/remove updates are left with cancellation error of order 1e24·ε.
	x = make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	x[400] = 1e12
	out["spike1e12"] = x

	// Level shifts across many orders of magnitude.
	x = make([]float64, n)
	for i := range x {
		x[i] = math.Pow(10, float64(i/150)) * (1 + 1e-4*rng.NormFloat64())
	}
	out["level_shifts"] = x

	// Tiny numbers: 1e-150 scale, whose squares are near the bottom of the
	// float64 range.
	x = make([]float64, n)
	for i := range x {
		x[i] = 1e-150 * (1 + rng.NormFloat64())
	}
	out["tiny"] = x
	return out
}

// TestRollingStdHostile compares every window with the exact result (big.Float)
// and with a naive two-pass computation in float64.
//
// Tolerances: against the exact value 1e-12 relative — shifting each block by
// a nearby observation makes the arithmetic well conditioned, so only a few
// hundred roundings of relative size 1.1e-16 remain. Against naive two-pass
// 1e-6: the naive mean of data at 1e9 is itself off by up to an ulp (1.2e-7),
// which moves the variance of a 1e-3 spread by about (1.2e-7/1e-3)² ≈ 1e-8.
// Means against the exact value: 1e-13 relative to the larger of the mean
// and the window's standard deviation (a mean near zero carries rounding of
// the size of the data, not of itself).
func TestRollingStdHostile(t *testing.T) {
	for name, x := range hostile() {
		for _, w := range []int{21, 63, 252} {
			t.Run(fmt.Sprintf("%s/w%d", name, w), func(t *testing.T) {
				m, s, err := RollingMeanStd(x, w)
				if err != nil {
					t.Fatal(err)
				}
				s2, err := RollingStd(x, w) // the std-only loop
				if err != nil {
					t.Fatal(err)
				}
				for j := range s {
					win := x[j : j+w]
					if s[j] < 0 || math.IsNaN(s[j]) {
						t.Fatalf("std[%d] = %v", j, s[j])
					}
					// The naive result is not exactly 0 on a constant window:
					// allow the rounding of its n-term sum, 2n ulps of the data.
					if nv := naiveStd(win); math.Abs(s[j]-nv) > 1e-6*nv+float64(2*w)*0x1p-52*maxAbs(win) {
						t.Errorf("std[%d] = %v, naive two-pass %v", j, s[j], nv)
					}
					if j%7 != 0 { // exact arithmetic is slow; every 7th window is enough
						continue
					}
					em, ev := exactMeanVar(win)
					es := math.Sqrt(ev)
					if !closeTo(s[j], es, 1e-12, 0) || !closeTo(s2[j], es, 1e-12, 0) {
						t.Errorf("std[%d] = %v / %v, exact %v", j, s[j], s2[j], es)
					}
					// Means near zero: relative to the window's spread.
					if !closeTo(m[j], em, 1e-13, es) {
						t.Errorf("mean[%d] = %v, exact %v", j, m[j], em)
					}
				}
			})
		}
	}
}

// TestRollingConstantRunsExactlyZero: a window of identical values has a
// standard deviation of exactly 0 (definition), not a tiny positive or
// negative number or NaN, and its mean is the value itself.
func TestRollingConstantRunsExactlyZero(t *testing.T) {
	x := hostile()["constant_runs"]
	const w = 63
	m, s, err := RollingMeanStd(x, w)
	if err != nil {
		t.Fatal(err)
	}
	s2, err := RollingStd(x, w)
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for j := range s {
		constant := true
		for _, v := range x[j : j+w] {
			if v != x[j] {
				constant = false
				break
			}
		}
		if !constant {
			continue
		}
		checked++
		if s[j] != 0 || s2[j] != 0 {
			t.Errorf("std of constant window %d = %v / %v, want exactly 0", j, s[j], s2[j])
		}
		if m[j] != x[j] {
			t.Errorf("mean of constant window %d = %v, want %v", j, m[j], x[j])
		}
	}
	if checked < 500 {
		t.Fatalf("only %d constant windows checked", checked)
	}
}

// TestRollingSmall checks a hand-worked example: x = 1, 2, 4, 7, 11 with
// window 3. Windows {1,2,4}, {2,4,7}, {4,7,11}: means 7/3, 13/3, 22/3;
// sample variances 7/3, 19/3, 37/3 (common practice: Σ(x-m)²/(n-1)).
// Exact closed forms: 1e-14 relative.
func TestRollingSmall(t *testing.T) {
	x := []float64{1, 2, 4, 7, 11}
	m, s, err := RollingMeanStd(x, 3)
	if err != nil {
		t.Fatal(err)
	}
	wantM := []float64{7.0 / 3, 13.0 / 3, 22.0 / 3}
	wantS := []float64{math.Sqrt(7.0 / 3), math.Sqrt(19.0 / 3), math.Sqrt(37.0 / 3)}
	for i := range wantM {
		if !closeTo(m[i], wantM[i], 1e-14, 0) || !closeTo(s[i], wantS[i], 1e-14, 0) {
			t.Errorf("window %d: mean %v std %v, want %v %v", i, m[i], s[i], wantM[i], wantS[i])
		}
	}
	// A window as long as the data gives the ordinary sample statistics:
	// mean 5, deviations -4, -3, -1, 2, 6, Σd² = 66, variance 66/4.
	all, _ := RollingStd(x, 5)
	if want := math.Sqrt(66.0 / 4); len(all) != 1 || !closeTo(all[0], want, 1e-14, 0) {
		t.Errorf("full window std %v, want %v", all, want)
	}
	m1, _ := RollingMean(x, 1)
	for i := range x {
		if m1[i] != x[i] {
			t.Errorf("window-1 mean %v, want %v", m1, x)
		}
	}
}

func TestRollingErrors(t *testing.T) {
	x := []float64{1, 2, 3, 4}
	cases := []struct {
		name string
		f    func() error
		want error
	}{
		{"window longer than data", func() error { _, err := RollingStd(x, 5); return err }, ErrWindow},
		{"std window 1", func() error { _, err := RollingStd(x, 1); return err }, ErrWindow},
		{"mean window 0", func() error { _, err := RollingMean(x, 0); return err }, ErrWindow},
		{"NaN", func() error { _, err := RollingMean([]float64{1, math.NaN(), 3}, 2); return err }, ErrNonFinite},
		{"Inf", func() error { _, _, err := RollingMeanStd([]float64{1, math.Inf(1), 3}, 2); return err }, ErrNonFinite},
		{"dst length", func() error { return RollingStdInto(make([]float64, 2), x, 2) }, ErrLength},
	}
	for _, c := range cases {
		if err := c.f(); !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.want)
		}
	}
}

func BenchmarkRollingStd10M(b *testing.B) {
	x := benchSeries(10_000_000)
	dst := make([]float64, len(x)-252+1)
	b.SetBytes(int64(8 * len(x)))
	b.ResetTimer()
	for range b.N {
		if err := RollingStdInto(dst, x, 252); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkRollingStd252x10k(b *testing.B) {
	x := benchSeries(10_000)
	b.ResetTimer()
	for range b.N {
		if _, err := RollingStd(x, 252); err != nil {
			b.Fatal(err)
		}
	}
}

func benchSeries(n int) []float64 {
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, n)
	for i := range x {
		x[i] = 0.01 * rng.NormFloat64()
	}
	return x
}
