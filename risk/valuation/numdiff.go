package valuation

import "math"

// Effective (numerical) derivatives by central differences with Richardson
// extrapolation. Along a shift x with step h:
//
//	D(h) = (f(h) − f(−h)) / (2h)                    first derivative, error O(h²)
//	S(h) = (f(h) − 2f(0) + f(−h)) / h²              second derivative, error O(h²)
//	R    = E(h/2) + (E(h/2) − E(h)) / 3              for E = D or S, error O(h⁴)
//
// The error estimate is |E(h/2) − E(h)|/3, the truncation error of the h/2
// difference (which R improves on, so it is conservative), plus a rounding
// bound 64·ε·max|f| divided by h (first derivative) or h²/4 (second).

// roundoff is the relative error assumed for one model evaluation: a few
// dozen floating-point operations, each within one ulp.
const roundoff = 64 * 2.220446049250313e-16

type derivative struct {
	d1, e1 float64 // first derivative and its error estimate
	d2, e2 float64 // second derivative and its error estimate
}

// central differentiates f along *x (which must be 0 on entry and is 0 on
// return) at steps h and h/2; f0 = f() at x = 0. ok is false if any
// evaluation is not finite.
func central(f func() float64, x *float64, h, f0 float64) (derivative, bool) {
	*x = h
	fp := f()
	*x = -h
	fm := f()
	*x = h / 2
	fp2 := f()
	*x = -h / 2
	fm2 := f()
	*x = 0
	if !finite(fp) || !finite(fm) || !finite(fp2) || !finite(fm2) {
		return derivative{}, false
	}
	big := math.Max(math.Max(math.Abs(fp), math.Abs(fm)), math.Abs(f0)) * roundoff
	dh := (fp - fm) / (2 * h)
	dh2 := (fp2 - fm2) / h
	sh := (fp - 2*f0 + fm) / (h * h)
	sh2 := (fp2 - 2*f0 + fm2) / (h * h / 4)
	return derivative{
		d1: dh2 + (dh2-dh)/3,
		e1: math.Abs(dh2-dh)/3 + big/h,
		d2: sh2 + (sh2-sh)/3,
		e2: math.Abs(sh2-sh)/3 + 4*big/(h*h),
	}, true
}

// centralFirst returns only the first derivative; it costs the same four
// evaluations but needs no f0.
func centralFirst(f func() float64, x *float64, h float64) (d, e float64, ok bool) {
	r, ok := central(f, x, h, 0)
	return r.d1, r.e1, ok
}

// centralCross estimates ∂²f/∂x∂y with the four-point stencil
//
//	X(h) = (f(h,h) − f(h,−h) − f(−h,h) + f(−h,−h)) / (4h²)
//
// at steps h and h/2, extrapolated and error-estimated as above.
func centralCross(f func() float64, x, y *float64, h float64) (d, e float64, ok bool) {
	stencil := func(s float64) (float64, float64, bool) {
		*x, *y = s, s
		pp := f()
		*y = -s
		pm := f()
		*x = -s
		mm := f()
		*y = s
		mp := f()
		*x, *y = 0, 0
		big := math.Max(math.Max(math.Abs(pp), math.Abs(pm)), math.Max(math.Abs(mm), math.Abs(mp)))
		return (pp - pm - mp + mm) / (4 * s * s), big, finite(pp) && finite(pm) && finite(mm) && finite(mp)
	}
	xh, big, ok1 := stencil(h)
	xh2, _, ok2 := stencil(h / 2)
	if !ok1 || !ok2 {
		return 0, 0, false
	}
	return xh2 + (xh2-xh)/3, math.Abs(xh2-xh)/3 + big*roundoff/(h*h/4), true
}
