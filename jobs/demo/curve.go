package demo

import (
	"math"
	"math/rand/v2"
)

// tenorsMonths are the maturities written to yields.csv.
var tenorsMonths = []int{3, 6, 12, 24, 60, 120, 360}

// Curve model parameters (daily unless stated). Nelson-Siegel (1987):
//
//	y(tau) = L + S*(1-exp(-tau/lambda))/(tau/lambda)
//	           + C*((1-exp(-tau/lambda))/(tau/lambda) - exp(-tau/lambda))
//
// with tau and lambda in years; L, S and C revert to targets with speed
// curveKappa (Ornstein-Uhlenbeck, Euler step of one day).
const (
	nsLambdaYears = 1.8
	curveKappa    = 0.012 // half-life about 58 business days
	levelVol      = 0.0003
	slopeVol      = 0.0003
	curvatureVol  = 0.0006
	levelCalm     = 0.025 // target level before the rate rise
	levelPeak     = 0.046 // target level at the end of the rise
	levelAfter    = 0.043
	levelFloor    = 0.018
	slopeNormal   = -0.014 // negative: upward sloping curve
	slopeCrash    = -0.022 // short rates cut in the crash
	slopeRising   = 0.004  // flat to inverted while rates rise
	slopeAfter    = -0.008
	curvatureMean = -0.004
	crashRateDays = 120
	minYield      = 0.001
	maxYield      = 0.085

	erpMean   = 0.048
	erpCrash  = 0.064
	erpKappa  = 0.03
	erpVol    = 0.0004
	erpMin    = 0.038
	erpMax    = 0.075
	erpStress = 60 // days after the crash the premium stays wide
)

// marketRates are the daily zero-coupon yields [day][tenor] and equity
// risk premium [day], decimals.
type marketRates struct {
	yields [][]float64
	erp    []float64
}

func simulateRates(cal calendar, crashStart int, rng *rand.Rand) marketRates {
	n := cal.n()
	rise0, rise1 := cal.atFraction(risingFrom), cal.atFraction(risingTo)
	crashEnd := crashStart + crashDays
	targets := func(t int) (l, s float64) {
		switch {
		case t < rise0:
			l = levelCalm
		case t < rise1:
			l = levelCalm + (levelPeak-levelCalm)*float64(t-rise0)/float64(rise1-rise0)
		default:
			l = levelAfter
		}
		switch {
		case t >= crashStart && t < crashStart+crashRateDays:
			l -= 0.003
			s = slopeCrash
		case t >= rise0 && t < rise1+crashRateDays:
			s = slopeRising
		case t >= rise1+crashRateDays:
			s = slopeAfter
		default:
			s = slopeNormal
		}
		return l, s
	}
	out := marketRates{yields: make([][]float64, n), erp: make([]float64, n)}
	l, s := targets(0)
	c := curvatureMean
	e := erpMean
	for t := range n {
		if t > 0 {
			tl, ts := targets(t)
			l += curveKappa*(tl-l) + levelVol*rng.NormFloat64()
			s += curveKappa*(ts-s) + slopeVol*rng.NormFloat64()
			c += curveKappa*(curvatureMean-c) + curvatureVol*rng.NormFloat64()
			te := erpMean
			if t >= crashStart && t < crashEnd+erpStress {
				te = erpCrash
			}
			e += erpKappa*(te-e) + erpVol*rng.NormFloat64()
			l = max(l, levelFloor)
			e = min(max(e, erpMin), erpMax)
		}
		row := make([]float64, len(tenorsMonths))
		for j, mo := range tenorsMonths {
			x := float64(mo) / 12 / nsLambdaYears
			h1 := (1 - math.Exp(-x)) / x
			h2 := h1 - math.Exp(-x)
			row[j] = round(min(max(l+s*h1+c*h2, minYield), maxYield), 6)
		}
		out.yields[t] = row
		out.erp[t] = round(e, 5)
	}
	return out
}
