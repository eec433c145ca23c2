package curve

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/optimize"
)

// FitOptions controls Fit. The zero value selects the defaults.
type FitOptions struct {
	// LambdaMin and LambdaMax bound the decay searched, per month. Zero
	// selects [x*/τmax, x*/τmin], the decays whose curvature hump lies inside
	// the observed tenors; outside it the three loadings become nearly
	// collinear and the betas explode (a known weakness of free-λ fits).
	LambdaMin, LambdaMax float64
	// GridPoints is the number of log-spaced decays tried before polishing.
	// Zero selects 60.
	GridPoints int
}

// FitResult is the outcome of Fit.
type FitResult struct {
	Curve      NelsonSiegel
	SSE        float64 // Σ (y − ŷ)², decimal²
	RMSE       float64 // √(SSE/n), decimal
	N          int     // observations used
	GridLambda float64 // best decay on the grid, per month
	Polished   bool    // the optimizer improved on the grid point
}

// Fit fits a Nelson–Siegel curve to zero yields by least squares,
//
//	minimise Σ_i (y_i − y(τ_i; β0, β1, β2, λ))²
//
// with τ in months and y decimal annually compounded zero yields. For fixed λ
// the problem is linear in the betas, so Fit
//
//  1. evaluates a log-spaced grid of λ, solving the betas at each by QR
//     (modified Gram–Schmidt, reorthogonalised) and keeping the best;
//  2. polishes all four parameters (λ as log λ) with BFGS from
//     gonum.org/v1/gonum/optimize using the analytic gradient;
//  3. keeps the polished λ only if it stays in range and lowers the sum of
//     squares, and re-solves the betas linearly at the λ kept.
//
// The result is deterministic. At least 4 distinct positive tenors are needed.
func Fit(tenorsMonths, yields []float64, opt FitOptions) (FitResult, error) {
	n := len(tenorsMonths)
	if n != len(yields) {
		return FitResult{}, &InputError{Field: "yields length", Value: float64(len(yields)), Err: ErrLengthMismatch}
	}
	for i := range n {
		t, y := tenorsMonths[i], yields[i]
		if math.IsNaN(t) || math.IsInf(t, 0) {
			return FitResult{}, &InputError{Field: "tenor", Value: t, Err: ErrNotFinite}
		}
		if math.IsNaN(y) || math.IsInf(y, 0) {
			return FitResult{}, &InputError{Field: "yield", Value: y, Err: ErrNotFinite}
		}
		if t <= 0 {
			return FitResult{}, &InputError{Field: "tenor", Value: t, Err: ErrTenor}
		}
		if y <= -1 {
			return FitResult{}, &InputError{Field: "yield", Value: y, Err: ErrYield}
		}
	}
	sorted := append([]float64(nil), tenorsMonths...)
	sort.Float64s(sorted)
	distinct := 0
	for i, t := range sorted {
		if i == 0 || t != sorted[i-1] {
			distinct++
		}
	}
	if distinct < 4 {
		return FitResult{}, &InputError{Field: "distinct tenors", Value: float64(distinct), Err: ErrTooFewTenors}
	}

	lo, hi := opt.LambdaMin, opt.LambdaMax
	if lo == 0 {
		lo = curvaturePeakX / sorted[n-1]
	}
	if hi == 0 {
		hi = curvaturePeakX / sorted[0]
	}
	if !(lo > 0) || !(hi >= lo) || math.IsInf(hi, 0) {
		return FitResult{}, &InputError{Field: "lambda range", Value: hi, Err: ErrLambdaRange}
	}
	grid := opt.GridPoints
	if grid <= 0 {
		grid = 60
	}

	// Work in percent: parameters and residuals of order one keep the
	// optimizer's default tolerances meaningful.
	w := newLSWork(n)
	for i, y := range yields {
		w.y[i] = 100 * y
	}
	w.tau = tenorsMonths

	bestSSE := math.Inf(1)
	var best [3]float64
	bestLambda := 0.0
	for i := range grid {
		lam := lo
		if grid > 1 {
			lam = lo * math.Pow(hi/lo, float64(i)/float64(grid-1))
		}
		b, sse, ok := w.solve(lam)
		if ok && sse < bestSSE {
			bestSSE, best, bestLambda = sse, b, lam
		}
	}
	if math.IsInf(bestSSE, 1) {
		return FitResult{}, ErrSingular
	}

	res := FitResult{GridLambda: bestLambda, N: n}
	lambda := bestLambda
	if lam, ok := w.polish(best, bestLambda); ok && lam >= lo && lam <= hi {
		if b, sse, ok := w.solve(lam); ok && sse < bestSSE {
			bestSSE, best, lambda = sse, b, lam
			res.Polished = true
		}
	}
	res.Curve = NelsonSiegel{Level: best[0] / 100, Slope: best[1] / 100, Curvature: best[2] / 100, Lambda: lambda}
	res.SSE = bestSSE / 1e4
	res.RMSE = math.Sqrt(res.SSE / float64(n))
	return res, nil
}

// lsWork holds the scratch space of one fit.
type lsWork struct {
	tau []float64 // months
	y   []float64 // percent
	c   [3][]float64
	q   [3][]float64
}

func newLSWork(n int) *lsWork {
	buf := make([]float64, 7*n)
	w := &lsWork{y: buf[:n]}
	for j := range 3 {
		w.c[j] = buf[(1+j)*n : (2+j)*n]
		w.q[j] = buf[(4+j)*n : (5+j)*n]
	}
	return w
}

func dot(a, b []float64) float64 {
	var s float64
	for i, v := range a {
		s += v * b[i]
	}
	return s
}

// solve returns the least-squares betas (percent) for a fixed λ and the sum
// of squared residuals (percent²); ok is false when the loadings are
// numerically collinear.
func (w *lsWork) solve(lambda float64) (b [3]float64, sse float64, ok bool) {
	for i, t := range w.tau {
		l1, l2 := Loadings(lambda, t)
		w.c[0][i], w.c[1][i], w.c[2][i] = 1, l1, l2
	}
	var r [3][3]float64
	for j := range 3 {
		v := w.q[j]
		copy(v, w.c[j])
		for range 2 { // "twice is enough" reorthogonalisation
			for i := range j {
				d := dot(w.q[i], v)
				for t := range v {
					v[t] -= d * w.q[i][t]
				}
			}
		}
		norm := math.Sqrt(dot(v, v))
		if norm <= 1e-10*math.Sqrt(dot(w.c[j], w.c[j])) {
			return b, 0, false
		}
		for t := range v {
			v[t] /= norm
		}
		for i := 0; i <= j; i++ {
			r[i][j] = dot(w.q[i], w.c[j])
		}
	}
	var z [3]float64
	for i := range 3 {
		z[i] = dot(w.q[i], w.y)
	}
	for i := 2; i >= 0; i-- {
		s := z[i]
		for j := i + 1; j < 3; j++ {
			s -= r[i][j] * b[j]
		}
		b[i] = s / r[i][i]
	}
	for i, y := range w.y {
		e := y - b[0] - b[1]*w.c[1][i] - b[2]*w.c[2][i]
		sse += e * e
	}
	return b, sse, !math.IsNaN(sse)
}

// polish runs BFGS on (β0, β1, β2, log λ) from the grid optimum and returns
// the decay found.
func (w *lsWork) polish(b [3]float64, lambda float64) (float64, bool) {
	obj := func(x []float64) float64 {
		lam := math.Exp(x[3])
		var s float64
		for i, t := range w.tau {
			l1, l2 := Loadings(lam, t)
			e := w.y[i] - x[0] - x[1]*l1 - x[2]*l2
			s += e * e
		}
		return s
	}
	grad := func(g, x []float64) {
		lam := math.Exp(x[3])
		g[0], g[1], g[2], g[3] = 0, 0, 0, 0
		for i, t := range w.tau {
			l1, l2 := Loadings(lam, t)
			e := w.y[i] - x[0] - x[1]*l1 - x[2]*l2
			// x·d/dx of the loadings at x = λτ, i.e. their derivative in log λ:
			// slope: e^{−x} − L1; curvature: e^{−x} − L1 + x e^{−x}.
			xx := lam * t
			ex := math.Exp(-xx)
			d1 := ex - l1
			d2 := d1 + xx*ex
			g[0] -= 2 * e
			g[1] -= 2 * e * l1
			g[2] -= 2 * e * l2
			g[3] -= 2 * e * (x[1]*d1 + x[2]*d2)
		}
	}
	p := optimize.Problem{Func: obj, Grad: grad}
	settings := &optimize.Settings{
		GradientThreshold: 1e-12,
		Converger:         &optimize.FunctionConverge{Absolute: 1e-18, Relative: 1e-14, Iterations: 20},
		MajorIterations:   500,
	}
	res, err := optimize.Minimize(p, []float64{b[0], b[1], b[2], math.Log(lambda)}, settings, &optimize.BFGS{})
	if res == nil {
		_ = err
		return 0, false
	}
	// A line-search stall reports an error but still returns the best point,
	// which is all we need: the caller accepts it only if it is better.
	lam := math.Exp(res.Location.X[3])
	return lam, !math.IsNaN(lam) && !math.IsInf(lam, 0)
}
