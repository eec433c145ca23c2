package stats

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// assetsMatrix reads assets.csv as a periods × holdings matrix.
func assetsMatrix(t *testing.T) *mat.Dense {
	header, cols := readColumns(t, "assets.csv")
	n := len(cols[header[0]])
	m := mat.NewDense(n, len(header), nil)
	for j, h := range header {
		for i, v := range cols[h] {
			m.Set(i, j, v)
		}
	}
	return m
}

// TestSampleCovarianceAgainstNumpy: numpy 1.24 numpy.cov(R, rowvar=False)
// (ddof=1) on assets.csv, 400 days × 8 holdings. Tolerance 1e-11 relative to
// the largest variance (12-digit JSON; both are two-pass).
func TestSampleCovarianceAgainstNumpy(t *testing.T) {
	ref := loadReference(t)
	c, err := SampleCovariance(assetsMatrix(t))
	if err != nil {
		t.Fatal(err)
	}
	checkMatrix(t, "sample", c, ref.CovSample, 1e-11)
}

// TestEWMACovarianceAgainstPandas: pandas 1.5 ewm(alpha=0.06,
// adjust=False).mean() of each product series r_i·r_j, last value. Tolerance
// 1e-11 relative to the largest element.
func TestEWMACovarianceAgainstPandas(t *testing.T) {
	ref := loadReference(t)
	r := assetsMatrix(t)
	c, err := EWMACovariance(r, 0.94)
	if err != nil {
		t.Fatal(err)
	}
	checkMatrix(t, "ewma", c, ref.CovEWMA094, 1e-11)
	// Its diagonal is the last EWMAVariance of each column (same recursion).
	for j := 0; j < c.SymmetricDim(); j++ {
		s, err := EWMAVariance(mat.Col(nil, j, r), 0.94)
		if err != nil {
			t.Fatal(err)
		}
		if !closeTo(c.At(j, j), s[len(s)-1], 1e-12, 0) {
			t.Errorf("diag %d = %v, EWMAVariance %v", j, c.At(j, j), s[len(s)-1])
		}
	}
}

func checkMatrix(t *testing.T, name string, got mat.Symmetric, want [][]float64, rel float64) {
	t.Helper()
	n := got.SymmetricDim()
	if n != len(want) {
		t.Fatalf("%s: dim %d, want %d", name, n, len(want))
	}
	var scale float64
	for i := range want {
		scale = math.Max(scale, math.Abs(want[i][i]))
	}
	for i := range want {
		for j := range want[i] {
			if !closeTo(got.At(i, j), want[i][j], rel, scale) {
				t.Errorf("%s[%d][%d] = %v, want %v", name, i, j, got.At(i, j), want[i][j])
			}
		}
	}
}

// TestCovarianceSmall: x = (1, 2, 3, 4), y = (2, 4, 6, 9): var x = 5/3,
// cov = (Σ dx dy)/3 = 11.5/3 (hand computation, deviations of x are
// -1.5, -0.5, 0.5, 1.5 and of y -3.25, -1.25, 0.75, 3.75).
func TestCovarianceSmall(t *testing.T) {
	r := mat.NewDense(4, 2, []float64{1, 2, 2, 4, 3, 6, 4, 9})
	c, err := SampleCovariance(r)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(c.At(0, 0), 5.0/3, 1e-15, 0) || !closeTo(c.At(0, 1), 11.5/3, 1e-15, 0) {
		t.Errorf("cov %v", mat.Formatted(c))
	}
}

func TestCovarianceErrors(t *testing.T) {
	if _, err := SampleCovariance(mat.NewDense(1, 3, nil)); !errors.Is(err, ErrTooShort) {
		t.Errorf("one row: %v", err)
	}
	if _, err := SampleCovariance(mat.NewDense(2, 2, []float64{1, math.NaN(), 2, 3})); !errors.Is(err, ErrNonFinite) {
		t.Errorf("NaN: %v", err)
	}
	if _, err := EWMACovariance(mat.NewDense(2, 2, nil), 1); !errors.Is(err, ErrLambda) {
		t.Errorf("lambda 1: %v", err)
	}
	if _, err := SampleCovariance(nil); !errors.Is(err, ErrEmpty) {
		t.Errorf("nil: %v", err)
	}
}

func BenchmarkSampleCovariance500x2520(b *testing.B) {
	x := benchSeries(2520 * 500)
	r := mat.NewDense(2520, 500, x)
	b.ResetTimer()
	for range b.N {
		if _, err := SampleCovariance(r); err != nil {
			b.Fatal(err)
		}
	}
}
