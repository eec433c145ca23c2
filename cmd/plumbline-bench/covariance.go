package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"text/tabwriter"
	"time"

	"gonum.org/v1/gonum/mat"

	"plumbline/risk/stats"
)

func init() { register("covariance", runCovariance) }

// covariancePy times numpy.cov on the same matrix: argv = input file, output
// file, days, assets, runs. It prints one JSON line.
const covariancePy = `
import json, sys, time
import numpy as np
src, dst, t, n, runs = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4]), int(sys.argv[5])
X = np.fromfile(src, dtype="<f8").reshape(t, n)
best = float("inf")
for _ in range(runs):
    s = time.perf_counter()
    c = np.cov(X, rowvar=False)
    best = min(best, time.perf_counter() - s)
c.astype("<f8").tofile(dst)
blas = ""
with open("/proc/self/maps") as f:
    libs = sorted({l.split()[-1] for l in f if "blas" in l.lower() and ".so" in l})
blas = " ".join(libs)
print(json.dumps({"seconds": best, "numpy": np.__version__, "blas": blas}))
`

// runCovariance compares stats.SampleCovariance (gonum/mat) with numpy.cov
// on the same generated returns, --days rows by --assets columns, in one run:
// the matrix goes to a temporary file as raw little-endian float64 (row
// major), each side is timed --runs times and the best counts, and the two
// matrices must agree to 1e-9 relative to the largest variance.
func runCovariance(ctx context.Context, args []string, stdout io.Writer) error {
	fs := flag.NewFlagSet("covariance", flag.ContinueOnError)
	days := fs.Int("days", 2520, "rows: daily returns per asset")
	assets := fs.Int("assets", 500, "columns: assets")
	runs := fs.Int("runs", 3, "timed runs of each side; the best counts")
	seed := fs.Uint64("seed", 2, "seed of the generated returns")
	python := fs.String("python", "/usr/bin/python3", "Python interpreter with numpy")
	nativeBLAS := fs.Bool("native-blas", false, "drop OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE from Python's environment")
	fs.Usage = func() {
		fmt.Fprintln(fs.Output(), "Usage: plumbline-bench covariance [flags]\n\n"+
			"Times the sample covariance matrix of Plumbline (risk/stats, gonum) and numpy.cov on\n"+
			"the same generated returns, checks that they agree to 1e-9 relative and prints both\n"+
			"timings and their ratio.\n\nFlags:")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if *days < 2 || *assets < 1 || *runs < 1 {
		return errors.New("need --days >= 2, --assets >= 1 and --runs >= 1")
	}

	x := benchReturns(*days**assets, *seed)
	work, err := os.MkdirTemp("", "plumbline-bench-covariance-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(work)
	src, dst := filepath.Join(work, "r.f64"), filepath.Join(work, "numpy.f64")
	if err := writeFloats(src, x); err != nil {
		return err
	}

	r := mat.NewDense(*days, *assets, x)
	var c *mat.SymDense
	goBest := math.Inf(1)
	for range *runs {
		start := time.Now()
		if c, err = stats.SampleCovariance(r); err != nil {
			return err
		}
		goBest = min(goBest, time.Since(start).Seconds())
	}

	py, err := runPythonBench(ctx, *python, *nativeBLAS, covariancePy, src, dst,
		fmt.Sprint(*days), fmt.Sprint(*assets), fmt.Sprint(*runs))
	if err != nil {
		return err
	}
	ref, err := readFloats(dst)
	if err != nil {
		return err
	}
	k := *assets
	if len(ref) != k*k {
		return fmt.Errorf("numpy returned %d values, want %d", len(ref), k*k)
	}
	got := make([]float64, k*k)
	var scale float64
	for i := 0; i < k; i++ {
		scale = max(scale, math.Abs(ref[i*k+i]))
		for j := 0; j < k; j++ {
			got[i*k+j] = c.At(i, j)
		}
	}
	worst := maxRelDiff(got, ref, scale)

	blas := py.BLAS
	if blas == "" {
		blas = "?"
	}
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "sample covariance\t%d days x %d assets\tbest of %d\n", *days, *assets, *runs)
	fmt.Fprintf(tw, "Go risk/stats.SampleCovariance (gonum)\t%.1f ms\t\n", goBest*1e3)
	fmt.Fprintf(tw, "numpy %s cov\t%.1f ms\t\n", py.Numpy, py.Seconds*1e3)
	fmt.Fprintf(tw, "numpy time / Go time\t%.2f\t(above 1: Go is faster)\n", py.Seconds/goBest)
	fmt.Fprintf(tw, "max relative difference\t%.2g\t(limit 1e-9, relative to the largest variance)\n", worst)
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "numpy BLAS: %s\n", blas)
	if !(worst <= 1e-9) {
		return fmt.Errorf("Go and numpy differ by %.3g relative", worst)
	}
	return nil
}
