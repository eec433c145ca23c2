package valuation

import "math"

func ptr(x float64) *float64 { return &x }

// relClose reports |got − want| ≤ tol·max(1, |want|).
func relClose(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// bruteStages values a stage model by summing payments one by one from the
// definitions in doc.go (payment j at τ = j/m pays (D0/m)·G(τ), discounted
// by Π(1+k_i)^{−τ_i} and carried to the valuation date at the first rate),
// until a payment adds less than 1e-17 of the running total. It shares no
// code with the closed-form stage sums.
func bruteStages(d0 float64, m int, f float64, stages []Stage, k, g float64) float64 {
	type st struct{ end, g, k float64 }
	var ss []st
	start := 0.0
	for _, s := range stages {
		r := k
		if s.Rate != nil {
			r = *s.Rate
		}
		start += s.Years
		ss = append(ss, st{start, s.Growth, r})
	}
	ss = append(ss, st{math.Inf(1), g, k})
	mf := float64(m)
	var pv float64
	for j := 1; j < 1e7; j++ {
		tau := float64(j) / mf
		lg, ld, prev := 0.0, 0.0, 0.0
		for _, s := range ss {
			if prev >= tau {
				break
			}
			dt := math.Min(tau, s.end) - prev
			lg += dt * math.Log(1+s.g)
			ld += dt * math.Log(1+s.k)
			prev = s.end
		}
		x := d0 / mf * math.Exp(lg-ld)
		pv += x
		if x < 1e-17*pv && tau > start+1 {
			break
		}
	}
	return pv * math.Pow(1+ss[0].k, f/mf)
}
