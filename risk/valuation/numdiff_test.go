package valuation

import (
	"math"
	"testing"
)

func TestCentralDifferences(t *testing.T) {
	// Reference derivatives from calculus (common practice):
	//   e^x:        f'(0) = 1, f''(0) = 1
	//   1/(0.05−x): f'(0) = 1/0.05² = 400, f''(0) = 2/0.05³ = 16000
	//   ln(1+x) at x0 = 0.3: f' = 1/1.3, f'' = −1/1.69
	// The actual error must not exceed the reported estimate. With
	// Richardson extrapolation the truncation error is O((h/scale)⁴): below
	// 1e-8 relative for small steps; at the largest step the model allows
	// near a pole (a twentieth of the distance) about (1/20)⁴ ≈ 6e-6.
	var x float64
	cases := []struct {
		name       string
		f          func() float64
		h          float64
		d1, d2     float64
		tol1, tol2 float64
	}{
		{"exp", func() float64 { return math.Exp(x) }, 1e-3, 1, 1, 1e-8, 1e-7},
		{"pole", func() float64 { return 1 / (0.05 - x) }, 1e-4, 400, 16000, 1e-8, 1e-7},
		{"pole, step gap/20", func() float64 { return 1 / (0.05 - x) }, 0.0025, 400, 16000, 1e-5, 1e-5},
		{"log", func() float64 { return math.Log1p(0.3 + x) }, 1e-3, 1 / 1.3, -1 / 1.69, 1e-8, 1e-7},
	}
	for _, c := range cases {
		r, ok := central(c.f, &x, c.h, c.f())
		if !ok || x != 0 {
			t.Fatalf("%s: ok=%v x=%g", c.name, ok, x)
		}
		if e := math.Abs(r.d1 - c.d1); e > r.e1 || !relClose(r.d1, c.d1, c.tol1) {
			t.Errorf("%s: f' = %.15g (err %.3g, estimate %.3g), want %.15g", c.name, r.d1, e, r.e1, c.d1)
		}
		if e := math.Abs(r.d2 - c.d2); e > r.e2 || !relClose(r.d2, c.d2, c.tol2) {
			t.Errorf("%s: f'' = %.15g (err %.3g, estimate %.3g), want %.15g", c.name, r.d2, e, r.e2, c.d2)
		}
	}
	// f(x, y) = e^{x + xy}: ∂²f/∂x∂y = e^{x+xy}(1 + x(1+y)) = 1 at the origin.
	var y float64
	d, e, ok := centralCross(func() float64 { return math.Exp(x + x*y) }, &x, &y, 1e-3)
	if !ok || math.Abs(d-1) > e || math.Abs(d-1) > 1e-8 || x != 0 || y != 0 {
		t.Errorf("cross = %.15g (estimate %.3g), want 1", d, e)
	}
	// A non-finite evaluation is reported, not returned as a number.
	if _, ok := central(func() float64 { return math.Sqrt(-x) }, &x, 1e-3, 0); ok {
		t.Error("NaN evaluation not reported")
	}
}
