package stress

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// BenchmarkStandardSetPlusReplays200 runs what a weekly pack asks of this
// package for a 200-holding book with Gordon closures: the standard set,
// the worst 10-day window over 10 years (2520 days) and one named window.
func BenchmarkStandardSetPlusReplays200(b *testing.B) {
	const m, n = 200, 2520
	rng := rand.New(rand.NewPCG(7, 11))
	sectors := []string{"Utilities", "Energy", "Materials", "Industrials", "Health", "Staples"}
	ps := make([]Position, m)
	rets := make([][]float64, m)
	for i := range ps {
		h := gordon{d0: 1 + rng.Float64(), rf: 0.035, beta: 0.6 + rng.Float64(), erp: 0.05,
			g: 0.01 + 0.02*rng.Float64(), sector: sectors[i%len(sectors)]}
		ps[i] = h.position(fmt.Sprintf("S%03d", i), 1e5+1e6*rng.Float64())
		row := make([]float64, n)
		for t := range row {
			row[t] = 0.015 * rng.NormFloat64()
		}
		rets[i] = row
	}
	std := Standard()
	for b.Loop() {
		if _, err := Run(ps, std, 0.05); err != nil {
			b.Fatal(err)
		}
		if _, err := WorstWindow(ps, rets, 10); err != nil {
			b.Fatal(err)
		}
		if _, err := Replay(ps, rets, 1200, 1263); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkWorstWindow compares the prefix-sum search with the direct
// reference on the same 200 × 2520 book, for two window lengths.
func BenchmarkWorstWindow(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 5))
	ps, rets := randomBook(rng, 2520, 200)
	for _, days := range []int{10, 63} {
		b.Run(fmt.Sprintf("prefix/%d", days), func(b *testing.B) {
			for b.Loop() {
				if _, err := WorstWindow(ps, rets, days); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("brute/%d", days), func(b *testing.B) {
			for b.Loop() {
				bruteWorst(ps, rets, days)
			}
		})
	}
}
