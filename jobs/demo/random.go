package demo

import (
	"math"
	"math/rand/v2"
)

// Independent random streams, one per part of the scenario, so changing one
// part does not reshuffle the numbers of another.
const (
	streamMarket uint64 = iota + 1
	streamDividends
	streamCurve
	streamAssumptions
	streamPortfolio // + portfolio index
)

func newStream(seed int64, stream uint64) *rand.Rand {
	return rand.New(rand.NewPCG(uint64(seed), 0x9e3779b97f4a7c15^stream))
}

// round rounds x half away from zero to the given number of decimals.
func round(x float64, decimals int) float64 {
	p := math.Pow(10, float64(decimals))
	return math.Round(x*p) / p
}

// roundTo rounds x to a multiple of step.
func roundTo(x, step float64) float64 { return math.Round(x/step) * step }
