package demo

import (
	"math"
	"math/rand/v2"
	"slices"
)

// Market model parameters (daily unless stated).
const (
	tradingDays     = 252.0
	marketDrift     = 0.10 / tradingDays  // expected log return, normal times
	risingDrift     = -0.04 / tradingDays // while rates rise
	cashLikeReturn  = 0.03                // annual log return of a zero-beta stock
	calmVol         = 0.0075              // about 12% a year
	stressVol       = 0.019               // about 30% a year
	toStress        = 0.008               // P(calm -> stressed) per day
	toCalm          = 0.04                // P(stressed -> calm) per day: spells of ~5 weeks
	crashDays       = 25                  // about five weeks
	crashLogDrop    = 0.42                // exp(-0.42)-1 = -34% for a beta of 1
	stressAfter     = 40                  // days the stressed regime is forced after the crash
	recoveryDays    = 150
	recoveryLogGain = 0.24
	sectorVol       = 0.004
	stressMultiple  = 1.5 // idiosyncratic and sector volatility in stress
	marketPin       = 63  // market noise sums to zero over each quarter ...
	sectorPin       = 126 // ... sector noise over each half-year ...
	idioPin         = 252 // ... and a stock's own noise over each year
	minClose        = 0.5
)

// pin subtracts from x, segment by segment, the segment's mean, so the
// noise adds up to zero between consecutive bounds and the path keeps the
// shape its drift gives it (a discrete Brownian bridge between the bounds).
// Day 0 carries no return and is left alone.
func pin(x []float64, bounds []int) {
	for i := 0; i+1 < len(bounds); i++ {
		a, b := max(bounds[i], 1), bounds[i+1]
		if b <= a {
			continue
		}
		mean := 0.0
		for _, v := range x[a:b] {
			mean += v
		}
		mean /= float64(b - a)
		for t := a; t < b; t++ {
			x[t] -= mean
		}
	}
}

// everyN returns 0, n, 2n, ... and end, plus extra, sorted and unique.
func everyN(n, end int, extra ...int) []int {
	var b []int
	for t := 0; t < end; t += n {
		b = append(b, t)
	}
	b = append(b, end)
	for _, e := range extra {
		if e > 0 && e < end {
			b = append(b, e)
		}
	}
	slices.Sort(b)
	return slices.Compact(b)
}

// marketPath draws the market factor m_t (daily log return) and the
// stressed-regime flags. The drift gives the designed shape (growth, crash,
// recovery, a soft patch while rates rise); the noise is pinned so the
// shape survives any seed.
func marketPath(cal calendar, crashStart int, rng *rand.Rand) (m []float64, stressed []bool) {
	n := cal.n()
	m = make([]float64, n)
	stressed = make([]bool, n)
	crashEnd := crashStart + crashDays
	rise0, rise1 := cal.atFraction(risingFrom), cal.atFraction(risingTo)
	stress := false
	for t := 1; t < n; t++ {
		switch {
		case t >= crashStart && t < crashEnd+stressAfter:
			stress = true
		case stress:
			stress = rng.Float64() >= toCalm
		default:
			stress = rng.Float64() < toStress
		}
		stressed[t] = stress
		vol := calmVol
		if stress {
			vol = stressVol
		}
		m[t] = vol * rng.NormFloat64()
	}
	pin(m, everyN(marketPin, n, crashStart, crashEnd, crashEnd+recoveryDays, rise0, rise1))
	for t := 1; t < n; t++ {
		switch {
		case t >= crashStart && t < crashEnd:
			m[t] -= crashLogDrop / crashDays
		case t >= crashEnd && t < crashEnd+recoveryDays:
			m[t] += recoveryLogGain / recoveryDays
		case t >= rise0 && t < rise1:
			m[t] += risingDrift
		default:
			m[t] += marketDrift
		}
	}
	return m, stressed
}

// simulateCloses returns unadjusted closes [security][day], rounded to
// cents. The daily log total return is
//
//	r = (alpha + (1-beta)*0.03)/252 + beta*m_t + f_sector,t + e_t
//
// (a CAPM-like drift plus the stock's own alpha) and the close follows the
// contract's total return with split ratio s and dividend D:
// P_t = P_{t-1}/s * exp(r) - D.
func simulateCloses(cal calendar, crashStart int, ca corporateActions, rng *rand.Rand) [][]float64 {
	n := cal.n()
	m, stressed := marketPath(cal, crashStart, rng)
	sector := make(map[string][]float64, len(sectors))
	for _, name := range sectors {
		f := make([]float64, n)
		for t := 1; t < n; t++ {
			vol := sectorVol
			if stressed[t] {
				vol *= stressMultiple
			}
			f[t] = vol * rng.NormFloat64()
		}
		pin(f, everyN(sectorPin, n))
		sector[name] = f
	}
	closes := make([][]float64, len(universe))
	e := make([]float64, n)
	for k, s := range universe {
		for t := 1; t < n; t++ {
			vol := s.idioVol
			if stressed[t] {
				vol *= stressMultiple
			}
			e[t] = vol * rng.NormFloat64()
		}
		pin(e, everyN(idioPin, n))
		f := sector[s.sector]
		drift := (s.alpha + (1-s.beta)*cashLikeReturn) / tradingDays
		c := make([]float64, n)
		c[0] = round(s.price0, 2)
		p := c[0]
		for t := 1; t < n; t++ {
			r := drift + s.beta*m[t] + f[t] + e[t]
			p = p/ca.split[k][t]*math.Exp(r) - ca.div[k][t]
			p = max(round(p, 2), minClose)
			c[t] = p
		}
		closes[k] = c
	}
	return closes
}
