package stats

import (
	"fmt"
	"math"
)

// RollingMean returns the mean of every window of `window` consecutive
// observations:
//
//	out[j] = (1/w) Σ_{i=j}^{j+w-1} x_i,   j = 0 .. n-w
//
// so len(out) = n-w+1 and out[j] belongs to the observation x[j+w-1] (the
// window ends there, as pandas' rolling(w).mean() without its leading NaNs).
// It uses the same O(n) stable algorithm as RollingStd.
func RollingMean(x []float64, window int) ([]float64, error) {
	if err := checkRolling("rolling mean", x, window, 1); err != nil {
		return nil, err
	}
	out := make([]float64, len(x)-window+1)
	rollingMoments(x, window, out, nil)
	return out, nil
}

// RollingStd returns the sample standard deviation (n-1 divisor) of every
// window of `window` consecutive observations:
//
//	out[j] = sqrt( Σ_{i=j}^{j+w-1} (x_i - m_j)² / (w-1) ),   m_j = RollingMean(x, w)[j]
//
// with the same alignment as RollingMean (pandas' rolling(w).std()). The
// window must be at least 2.
//
// The computation is O(n) and never subtracts a departing observation from a
// running sum, so it has none of the cancellation of add/remove updates: see
// rollingMoments. A window of identical values gives exactly 0.
func RollingStd(x []float64, window int) ([]float64, error) {
	if err := checkRolling("rolling std", x, window, 2); err != nil {
		return nil, err
	}
	out := make([]float64, len(x)-window+1)
	rollingMoments(x, window, nil, out)
	return out, nil
}

// RollingMeanStd returns RollingMean and RollingStd of x in one pass.
func RollingMeanStd(x []float64, window int) (mean, std []float64, err error) {
	if err := checkRolling("rolling mean/std", x, window, 2); err != nil {
		return nil, nil, err
	}
	mean = make([]float64, len(x)-window+1)
	std = make([]float64, len(x)-window+1)
	rollingMoments(x, window, mean, std)
	return mean, std, nil
}

// RollingStdInto is RollingStd writing into dst, which must have length
// len(x)-window+1; it allocates only O(window) scratch space.
func RollingStdInto(dst, x []float64, window int) error {
	if err := checkRolling("rolling std", x, window, 2); err != nil {
		return err
	}
	if len(dst) != len(x)-window+1 {
		return fmt.Errorf("stats: rolling std: dst has %d elements, want %d: %w", len(dst), len(x)-window+1, ErrLength)
	}
	rollingMoments(x, window, nil, dst)
	return nil
}

func checkRolling(op string, x []float64, window, minWindow int) error {
	if window < minWindow {
		return fmt.Errorf("stats: %s: window %d, need at least %d: %w", op, window, minWindow, ErrWindow)
	}
	if window > len(x) {
		return fmt.Errorf("stats: %s: window %d longer than %d observations: %w", op, window, len(x), ErrWindow)
	}
	return checkFinite(op, x)
}

// rollingMoments fills mean and/or std (either may be nil) for every window of
// w observations of x.
//
// Algorithm: a sliding window is a queue; it is kept as two stacks (the
// "two-stack queue" of sliding-window aggregation). Each stack summarises
// its observations as (count, mean, M2), M2 = Σ (x - mean)², and two
// summaries are combined with the pairwise update of Chan, Golub and LeVeque
// (1979):
//
//	δ = mean_b - mean_a,  mean = mean_a + δ n_b/n,  M2 = M2_a + M2_b + δ² n_a n_b / n
//
// The back stack takes arriving observations with Welford's update. The
// front stack holds, for every position, the summary of the observations from
// that position to its end; when it runs empty (every w steps) it is rebuilt
// from the raw observations of the current window. Departing observations are
// therefore never subtracted: every summary is a sum of non-negative terms
// built from scratch, each observation enters three updates, and the cost is
// O(n) whatever the data. Before each rebuild the data are shifted by a
// reference value K (the median of the first, middle and last observation of
// the window, so a lone spike is not chosen) and all summaries of that block
// are of x - K, which removes the error a large common offset would cause.
// A window of identical values has δ = 0 and M2 = 0 exactly.
func rollingMoments(x []float64, w int, meanOut, stdOut []float64) {
	n := len(x)
	inv := make([]float64, w+1) // inv[k] = 1/k
	for k := 1; k <= w; k++ {
		inv[k] = 1 / float64(k)
	}
	invW := inv[w]
	var invW1 float64
	if w > 1 {
		invW1 = 1 / float64(w-1)
	}
	fm := make([]float64, w) // front suffix means (shifted)
	fq := make([]float64, w) // front suffix M2

	for lo := 0; lo+w <= n; lo += w {
		// Rebuild the front stack from the window x[lo : lo+w].
		blk := x[lo : lo+w]
		k0 := median3(blk[0], blk[w/2], blk[w-1])
		var m, q float64
		for j := w - 1; j >= 0; j-- {
			y := blk[j] - k0
			d := y - m
			m += d * inv[w-j]
			q += d * (y - m)
			fm[j] = m
			fq[j] = q
		}
		if meanOut != nil {
			meanOut[lo] = m + k0
		}
		if stdOut != nil {
			stdOut[lo] = math.Sqrt(q * invW1)
		}
		// Slide through the windows starting at lo+1 .. lo+cnt, pushing
		// x[lo+w .. lo+w+cnt-1] onto the back stack.
		cnt := min(w-1, n-w-lo)
		back := x[lo+w : lo+w+cnt]
		fms, fqs, invs := fm[1:cnt+1], fq[1:cnt+1], inv[1:cnt+1]
		var mb, qb float64
		switch {
		case stdOut != nil && meanOut == nil:
			out := stdOut[lo+1 : lo+1+cnt]
			for k, xv := range back {
				y := xv - k0
				d := y - mb
				mb += d * invs[k]
				qb += d * (y - mb)
				delta := mb - fms[k]
				nb := float64(k + 1)
				m2 := fqs[k] + qb + delta*delta*(float64(w)-nb)*nb*invW
				out[k] = math.Sqrt(m2 * invW1)
			}
		default:
			for k, xv := range back {
				y := xv - k0
				d := y - mb
				mb += d * invs[k]
				qb += d * (y - mb)
				delta := mb - fms[k]
				nb := float64(k + 1)
				fb := nb * invW
				if meanOut != nil {
					meanOut[lo+1+k] = fms[k] + delta*fb + k0
				}
				if stdOut != nil {
					m2 := fqs[k] + qb + delta*delta*(float64(w)-nb)*fb
					stdOut[lo+1+k] = math.Sqrt(m2 * invW1)
				}
			}
		}
	}
}

// median3 returns the median of a, b and c.
func median3(a, b, c float64) float64 {
	if a > b {
		a, b = b, a
	}
	if b > c {
		b = c
	}
	if a > b {
		return a
	}
	return b
}
