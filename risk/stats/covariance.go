package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// SampleCovariance returns the sample covariance matrix of the returns r, one
// row per period and one column per holding:
//
//	C_ij = 1/(T-1) Σ_t (r_ti - mean_i)(r_tj - mean_j)
//
// (two-pass: columns are centred first, then C = XᵀX/(T-1) with gonum's
// symmetric rank-k update). It needs at least two periods.
func SampleCovariance(r mat.Matrix) (*mat.SymDense, error) {
	t, n, err := checkReturnsMatrix("sample covariance", r, 2)
	if err != nil {
		return nil, err
	}
	xt := transposeCopy(r, t, n)
	for i := 0; i < n; i++ {
		row := xt.RawRowView(i)
		m := mean(row)
		for k := range row {
			row[k] -= m
		}
	}
	c := mat.NewSymDense(n, nil)
	c.SymOuterK(1/float64(t-1), xt)
	return c, nil
}

// EWMACovariance returns the exponentially weighted covariance matrix of the
// returns r (rows are periods, oldest first; columns are holdings), with the
// zero-mean convention and the same recursion and seed as EWMAVariance:
//
//	S_0 = r_0 r_0ᵀ,   S_t = λ S_{t-1} + (1-λ) r_t r_tᵀ
//
// It returns S_{T-1}, the forecast for the period after the data, computed in
// closed form as Σ_t w_t r_t r_tᵀ with w_0 = λ^(T-1) and
// w_t = (1-λ) λ^(T-1-t), weights that sum to 1. Its diagonal equals the last
// element of EWMAVariance of each column.
func EWMACovariance(r mat.Matrix, lambda float64) (*mat.SymDense, error) {
	if !(lambda > 0 && lambda < 1) {
		return nil, fmt.Errorf("stats: ewma covariance: lambda %v: %w", lambda, ErrLambda)
	}
	t, n, err := checkReturnsMatrix("ewma covariance", r, 1)
	if err != nil {
		return nil, err
	}
	xt := transposeCopy(r, t, n)
	sw := make([]float64, t) // square roots of the weights
	for k := 0; k < t; k++ {
		w := (1 - lambda) * math.Pow(lambda, float64(t-1-k))
		if k == 0 {
			w = math.Pow(lambda, float64(t-1))
		}
		sw[k] = math.Sqrt(w)
	}
	for i := 0; i < n; i++ {
		row := xt.RawRowView(i)
		for k := range row {
			row[k] *= sw[k]
		}
	}
	c := mat.NewSymDense(n, nil)
	c.SymOuterK(1, xt)
	return c, nil
}

// checkReturnsMatrix checks that r has at least minRows rows, one column and
// only finite elements, and returns its dimensions.
func checkReturnsMatrix(op string, r mat.Matrix, minRows int) (t, n int, err error) {
	if r == nil {
		return 0, 0, fmt.Errorf("stats: %s: nil matrix: %w", op, ErrEmpty)
	}
	if d, ok := r.(interface{ IsEmpty() bool }); ok && d.IsEmpty() {
		return 0, 0, fmt.Errorf("stats: %s: empty matrix: %w", op, ErrEmpty)
	}
	t, n = r.Dims()
	if n == 0 {
		return 0, 0, fmt.Errorf("stats: %s: no columns: %w", op, ErrEmpty)
	}
	if t < minRows {
		return 0, 0, fmt.Errorf("stats: %s: %d periods, need %d: %w", op, t, minRows, ErrTooShort)
	}
	for i := 0; i < t; i++ {
		for j := 0; j < n; j++ {
			if v := r.At(i, j); math.IsNaN(v) || math.IsInf(v, 0) {
				return 0, 0, fmt.Errorf("stats: %s: element (%d, %d) is %v: %w", op, i, j, v, ErrNonFinite)
			}
		}
	}
	return t, n, nil
}

// transposeCopy returns a new n×t matrix holding rᵀ (holdings as rows, so
// each holding's series is contiguous).
func transposeCopy(r mat.Matrix, t, n int) *mat.Dense {
	xt := mat.NewDense(n, t, nil)
	if d, ok := r.(mat.RawMatrixer); ok {
		raw := d.RawMatrix()
		for i := 0; i < t; i++ {
			src := raw.Data[i*raw.Stride : i*raw.Stride+n]
			for j, v := range src {
				xt.Set(j, i, v)
			}
		}
		return xt
	}
	for i := 0; i < t; i++ {
		for j := 0; j < n; j++ {
			xt.Set(j, i, r.At(i, j))
		}
	}
	return xt
}
