package main

import (
	"bufio"
	"context"
	"encoding/binary"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"text/tabwriter"
	"time"

	"plumbline/risk/stats"
)

func init() { register("rolling", runRolling) }

// rollingPy times pandas' rolling standard deviation on the same data:
// argv = input file, output file, window, runs. It prints one JSON line.
const rollingPy = `
import json, sys, time
import numpy as np, pandas as pd
src, dst, w, runs = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4])
x = np.fromfile(src, dtype="<f8")
s = pd.Series(x)
best = float("inf")
for _ in range(runs):
    t = time.perf_counter()
    r = s.rolling(w).std()
    best = min(best, time.perf_counter() - t)
r.values[w - 1:].astype("<f8").tofile(dst)
print(json.dumps({"seconds": best, "numpy": np.__version__, "pandas": pd.__version__}))
`

// runRolling compares the rolling 252-day sample standard deviation of
// stats.RollingStd with pandas' Series.rolling(252).std() on the same
// generated data in one run.
//
// It draws --n daily returns (normal, 1% volatility, PCG seeded by --seed),
// writes them to a temporary file as raw little-endian float64, times the Go
// computation --runs times, then runs --python with an inline script that
// loads the file with numpy.fromfile and times pandas the same number of
// times. The best run of each counts. The two results must agree to 1e-9
// relative, element by element, or the command fails.
func runRolling(ctx context.Context, args []string, stdout io.Writer) error {
	fs := flag.NewFlagSet("rolling", flag.ContinueOnError)
	n := fs.Int("n", 10_000_000, "number of data points")
	window := fs.Int("window", 252, "rolling window length")
	runs := fs.Int("runs", 3, "timed runs of each side; the best counts")
	seed := fs.Uint64("seed", 1, "seed of the generated returns")
	python := fs.String("python", "/usr/bin/python3", "Python interpreter with numpy and pandas")
	nativeBLAS := fs.Bool("native-blas", false, "drop OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE from Python's environment")
	fs.Usage = func() {
		fmt.Fprintln(fs.Output(), "Usage: plumbline-bench rolling [flags]\n\n"+
			"Times the rolling sample standard deviation of Plumbline (risk/stats) and of pandas\n"+
			"on the same generated data, checks that they agree to 1e-9 relative and prints both\n"+
			"timings and their ratio.\n\nFlags:")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if *n < 2 || *window < 2 || *window > *n || *runs < 1 {
		return errors.New("need --n >= --window >= 2 and --runs >= 1")
	}

	x := benchReturns(*n, *seed)
	work, err := os.MkdirTemp("", "plumbline-bench-rolling-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(work)
	src, dst := filepath.Join(work, "x.f64"), filepath.Join(work, "pandas.f64")
	if err := writeFloats(src, x); err != nil {
		return err
	}

	out := make([]float64, *n-*window+1)
	goBest := math.Inf(1)
	for range *runs {
		start := time.Now()
		if err := stats.RollingStdInto(out, x, *window); err != nil {
			return err
		}
		goBest = min(goBest, time.Since(start).Seconds())
	}

	py, err := runPythonBench(ctx, *python, *nativeBLAS, rollingPy, src, dst, fmt.Sprint(*window), fmt.Sprint(*runs))
	if err != nil {
		return err
	}
	ref, err := readFloats(dst)
	if err != nil {
		return err
	}
	if len(ref) != len(out) {
		return fmt.Errorf("pandas returned %d values, Go %d", len(ref), len(out))
	}
	worst := maxRelDiff(out, ref, 0)

	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "rolling sample std\tn=%d\twindow=%d\tbest of %d\n", *n, *window, *runs)
	fmt.Fprintf(tw, "Go risk/stats.RollingStd\t%.1f ms\t\n", goBest*1e3)
	fmt.Fprintf(tw, "pandas %s rolling().std()\t%.1f ms\t\n", py.Pandas, py.Seconds*1e3)
	fmt.Fprintf(tw, "pandas time / Go time\t%.2f\t(above 1: Go is faster)\n", py.Seconds/goBest)
	fmt.Fprintf(tw, "max relative difference\t%.2g\t(limit 1e-9)\n", worst)
	if err := tw.Flush(); err != nil {
		return err
	}
	if !(worst <= 1e-9) {
		return fmt.Errorf("Go and pandas differ by %.3g relative", worst)
	}
	return nil
}

// benchReturns draws n normal returns with 1% volatility.
func benchReturns(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	x := make([]float64, n)
	for i := range x {
		x[i] = 0.01 * rng.NormFloat64()
	}
	return x
}

// pyResult is the JSON line the inline Python scripts print.
type pyResult struct {
	Seconds float64 `json:"seconds"`
	Numpy   string  `json:"numpy"`
	Pandas  string  `json:"pandas"`
	BLAS    string  `json:"blas"`
}

// runPythonBench runs an inline script with python -c and decodes the JSON
// line it prints last.
func runPythonBench(ctx context.Context, python string, nativeBLAS bool, script string, args ...string) (pyResult, error) {
	cmd := exec.CommandContext(ctx, python, append([]string{"-c", script}, args...)...)
	if nativeBLAS {
		for _, kv := range os.Environ() {
			if !strings.HasPrefix(kv, "OPENBLAS_CORETYPE=") && !strings.HasPrefix(kv, "OPENBLAS_L2_SIZE=") {
				cmd.Env = append(cmd.Env, kv)
			}
		}
	}
	var stderr strings.Builder
	cmd.Stderr = &stderr
	b, err := cmd.Output()
	if err != nil {
		return pyResult{}, fmt.Errorf("%s: %w: %s", python, err, strings.TrimSpace(stderr.String()))
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	var r pyResult
	if err := json.Unmarshal([]byte(lines[len(lines)-1]), &r); err != nil {
		return pyResult{}, fmt.Errorf("%s: reading its result: %w", python, err)
	}
	return r, nil
}

// writeFloats writes x as raw little-endian float64.
func writeFloats(path string, x []float64) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriterSize(f, 1<<20)
	if err := binary.Write(w, binary.LittleEndian, x); err != nil {
		f.Close()
		return err
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// readFloats reads a file of raw little-endian float64.
func readFloats(path string) ([]float64, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if len(b)%8 != 0 {
		return nil, fmt.Errorf("%s: %d bytes is not a whole number of float64", path, len(b))
	}
	x := make([]float64, len(b)/8)
	for i := range x {
		x[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
	}
	return x, nil
}

// maxRelDiff returns max |a_i - b_i| / max(|b_i|, floor); NaN anywhere
// makes it NaN.
func maxRelDiff(a, b []float64, floor float64) float64 {
	var worst float64
	for i := range a {
		d := math.Abs(a[i]-b[i]) / math.Max(math.Abs(b[i]), floor)
		if math.IsNaN(d) {
			return math.NaN()
		}
		worst = max(worst, d)
	}
	return worst
}
