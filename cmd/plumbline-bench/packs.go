package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"runtime/pprof"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"text/tabwriter"
	"time"

	"plumbline/jobs"
	"plumbline/jobs/config"
	"plumbline/store"
)

func init() { register("packs", runPacks) }

// Goals of the full size (issue "Pack runs").
const (
	packGoalSeconds = 30
	packGoalRSSMB   = 500
)

// runPacks times pack runs over synthetic data of several sizes: a base
// size, the base with each dimension doubled on its own, and the full
// size. Each size is generated into its own folder, then ingested with
// jobs.Ingest in one child process and packed with jobs.BuildPacks
// (compute and persist, no PDF) in another, so that each stage's peak
// resident memory is its own process's. After the packs the PDF of one
// portfolio is rendered from its stored run and timed on its own.
func runPacks(ctx context.Context, args []string, stdout io.Writer) error {
	fs := flag.NewFlagSet("packs", flag.ContinueOnError)
	base := fs.String("base", "25x100x5", "base size, PORTFOLIOSxHOLDINGSxYEARS")
	full := fs.String("full", "100x200x10", "full size, PORTFOLIOSxHOLDINGSxYEARS")
	sizes := fs.String("sizes", "", "comma-separated sizes to run instead of base, base with each dimension doubled, full; ratios are taken to the first")
	perHolding := fs.Int("securities-per-holding", 2, "securities in the store per holding of a portfolio (all form the benchmark)")
	dir := fs.String("dir", "", "work folder (default: a new temporary folder, removed after)")
	keep := fs.Bool("keep", false, "keep the generated files and databases")
	stage := fs.String("stage", "", "internal: run one stage (ingest or build) in this process and print JSON")
	size := fs.String("size", "", "internal: the size of --stage")
	cpuprofile := fs.String("cpuprofile", "", "write a CPU profile of each size's pack stage to FILE.<size>")
	fs.Usage = func() {
		fmt.Fprintln(fs.Output(), `Usage: plumbline-bench packs [flags]

Generates fictional portfolios, securities and prices in the input CSV
formats, ingests them, and builds the pack of every portfolio (compute and
store, no PDF). Prints ingest and pack times, per-portfolio time, peak
resident memory and Go heap figures for each size, and how each grows
against the first size. The PDF of one portfolio is rendered and timed
separately.

Flags:`)
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if *perHolding < 1 {
		return errors.New("--securities-per-holding must be positive")
	}
	if *stage != "" {
		s, err := parsePackSize(*size)
		if err != nil {
			return err
		}
		return runPackStage(ctx, *stage, s, *dir, *perHolding, *cpuprofile, stdout)
	}

	var runs []packSize
	if *sizes != "" {
		for _, v := range strings.Split(*sizes, ",") {
			s, err := parsePackSize(strings.TrimSpace(v))
			if err != nil {
				return err
			}
			runs = append(runs, s)
		}
	} else {
		b, err := parsePackSize(*base)
		if err != nil {
			return err
		}
		f, err := parsePackSize(*full)
		if err != nil {
			return err
		}
		runs = []packSize{b,
			{b.Portfolios * 2, b.Holdings, b.Years},
			{b.Portfolios, b.Holdings * 2, b.Years},
			{b.Portfolios, b.Holdings, b.Years * 2},
			f}
	}
	work := *dir
	var err error
	if work == "" {
		if work, err = os.MkdirTemp("", "plumbline-bench-packs-"); err != nil {
			return err
		}
		if !*keep {
			defer os.RemoveAll(work)
		}
	} else if err := os.MkdirAll(work, 0o755); err != nil {
		return err
	}
	self, err := os.Executable()
	if err != nil {
		return err
	}

	fmt.Fprintf(stdout, "pack runs on %d CPUs (GOMAXPROCS %d), %d securities in the store per holding\n",
		runtime.NumCPU(), runtime.GOMAXPROCS(0), *perHolding)
	var results []packRun
	for _, s := range runs {
		sub := filepath.Join(work, s.String())
		if err := os.MkdirAll(sub, 0o755); err != nil {
			return err
		}
		var r packRun
		r.Size = s
		for _, st := range []struct {
			name string
			out  *stageReport
		}{{"ingest", &r.Ingest}, {"build", &r.Build}} {
			if err := ctx.Err(); err != nil {
				return err
			}
			var out, errb bytes.Buffer
			args := []string{"packs", "--stage", st.name, "--size", s.String(),
				"--dir", sub, "--securities-per-holding", strconv.Itoa(*perHolding)}
			if *cpuprofile != "" && st.name == "build" {
				prof, err := filepath.Abs(*cpuprofile + "." + s.String())
				if err != nil {
					return err
				}
				args = append(args, "--cpuprofile", prof)
			}
			cmd := exec.CommandContext(ctx, self, args...)
			cmd.Stdout, cmd.Stderr = &out, &errb
			if err := cmd.Run(); err != nil {
				return fmt.Errorf("%s %s: %w\n%s", s, st.name, err, errb.String())
			}
			if err := json.Unmarshal(out.Bytes(), st.out); err != nil {
				return fmt.Errorf("%s %s: %w", s, st.name, err)
			}
		}
		results = append(results, r)
		if !*keep && *dir == "" {
			os.RemoveAll(sub)
		}
	}
	return printPackRuns(stdout, results)
}

// packRun is one size's two stages.
type packRun struct {
	Size   packSize
	Ingest stageReport
	Build  stageReport
}

// stageReport is what a stage process measured.
type stageReport struct {
	Data       dataStats `json:"data"`
	GenSeconds float64   `json:"gen_s,omitempty"`
	Seconds    float64   `json:"s"`     // wall time of the stage's work
	CPUSeconds float64   `json:"cpu_s"` // user + system over the same span
	PeakRSS    int64     `json:"peak_rss"`
	PeakHeap   uint64    `json:"peak_heap"`   // sampled live heap objects
	HeapSys    uint64    `json:"heap_sys"`    // heap memory obtained from the OS
	TotalAlloc uint64    `json:"total_alloc"` // bytes allocated during the work
	NumGC      uint32    `json:"num_gc"`
	Packs      int       `json:"packs,omitempty"`
	// FirstSeconds is the time to the first stored pack: reading and
	// hashing the shared market data, then one portfolio.
	FirstSeconds float64 `json:"first_s,omitempty"`
	AsOf         string  `json:"as_of,omitempty"`
	PDFSeconds   float64 `json:"pdf_s,omitempty"`
	PDFBytes     int     `json:"pdf_bytes,omitempty"`
	PDFPages     int     `json:"pdf_pages,omitempty"`
}

// runPackStage runs one stage in this process and prints its report as
// JSON: "ingest" generates the files and ingests them into a new
// database, "build" packs every portfolio of that database.
func runPackStage(ctx context.Context, stage string, s packSize, dir string, perHolding int, cpuprofile string, stdout io.Writer) error {
	if dir == "" {
		return errors.New("--stage needs --dir")
	}
	dbPath := filepath.Join(dir, "plumbline.db")
	inputs := filepath.Join(dir, "inputs")
	var rep stageReport
	switch stage {
	case "ingest":
		os.RemoveAll(inputs)
		for _, f := range []string{dbPath, dbPath + "-wal", dbPath + "-shm"} {
			os.Remove(f)
		}
		if err := os.MkdirAll(inputs, 0o755); err != nil {
			return err
		}
		t0 := time.Now()
		st, err := writePackData(inputs, s, perHolding)
		if err != nil {
			return fmt.Errorf("generate: %w", err)
		}
		rep.Data, rep.GenSeconds = st, time.Since(t0).Seconds()
		db, err := store.Open(ctx, dbPath)
		if err != nil {
			return err
		}
		defer db.Close()
		err = measure(&rep, func() error {
			res, err := jobs.Ingest(ctx, db, []string{inputs}, jobs.IngestOptions{})
			if err != nil {
				return err
			}
			for _, f := range res {
				if f.Outcome == store.Rejected {
					return fmt.Errorf("%s rejected: %v", f.Name, f.Errors)
				}
			}
			return nil
		})
		if err != nil {
			return fmt.Errorf("ingest: %w", err)
		}
	case "build":
		db, err := store.Open(ctx, dbPath)
		if err != nil {
			return err
		}
		defer db.Close()
		cfg := config.Default()
		cfg.Database = dbPath
		if err := cfg.Validate(); err != nil {
			return err
		}
		created := time.Date(2025, 6, 30, 6, 0, 0, 0, time.UTC)
		var res []jobs.PackResult
		err = measure(&rep, func() error {
			if cpuprofile != "" {
				f, err := os.Create(cpuprofile)
				if err != nil {
					return err
				}
				defer f.Close()
				if err := pprof.StartCPUProfile(f); err != nil {
					return err
				}
				defer pprof.StopCPUProfile()
			}
			var err error
			t0 := time.Now()
			res, err = jobs.BuildPacks(ctx, db, cfg, jobs.PackOptions{Version: "bench",
				Now: func() time.Time { return created },
				Progress: func(done, _ int, _ string) {
					if done == 1 {
						rep.FirstSeconds = time.Since(t0).Seconds()
					}
				}})
			return err
		})
		if err != nil {
			return fmt.Errorf("build packs: %w", err)
		}
		if len(res) != s.Portfolios {
			return fmt.Errorf("%d packs built, want %d", len(res), s.Portfolios)
		}
		for _, r := range res {
			if r.Document.Summary.Returns.SinceInception == nil || len(r.Document.Holdings) != s.Holdings {
				return fmt.Errorf("pack of %s: %d holdings, since-inception return %v: the synthetic data did not give a full pack",
					r.Portfolio, len(r.Document.Holdings), r.Document.Summary.Returns.SinceInception)
			}
		}
		rep.Packs, rep.AsOf = len(res), res[0].AsOf
		// Rendering is its own benchmark: one portfolio, after the peak
		// figures above are taken.
		run, err := db.GetRun(ctx, res[0].RunID)
		if err != nil {
			return err
		}
		t0 := time.Now()
		pdf, pages, err := jobs.RenderRun(run)
		if err != nil {
			return err
		}
		rep.PDFSeconds, rep.PDFBytes, rep.PDFPages = time.Since(t0).Seconds(), len(pdf), pages
	default:
		return fmt.Errorf("unknown stage %q", stage)
	}
	return json.NewEncoder(stdout).Encode(rep)
}

// measure runs work and fills rep with its wall and CPU time, the Go heap
// figures over it and the process's peak resident memory after it.
func measure(rep *stageReport, work func() error) error {
	runtime.GC()
	var m0 runtime.MemStats
	runtime.ReadMemStats(&m0)
	stop := sampleHeap(&rep.PeakHeap)
	cpu0, t0 := processCPU(), time.Now()
	err := work()
	rep.Seconds, rep.CPUSeconds = time.Since(t0).Seconds(), (processCPU() - cpu0).Seconds()
	stop()
	var m1 runtime.MemStats
	runtime.ReadMemStats(&m1)
	rep.HeapSys, rep.TotalAlloc, rep.NumGC = m1.HeapSys, m1.TotalAlloc-m0.TotalAlloc, m1.NumGC-m0.NumGC
	rep.PeakRSS = peakRSS()
	return err
}

// sampleHeap records the largest live heap (runtime/metrics, which does
// not stop the world) every 5 ms until the returned stop is called.
func sampleHeap(peak *uint64) (stop func()) {
	s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	read := func() {
		metrics.Read(s)
		if s[0].Value.Kind() == metrics.KindUint64 {
			*peak = max(*peak, s[0].Value.Uint64())
		}
	}
	go func() {
		defer wg.Done()
		t := time.NewTicker(5 * time.Millisecond)
		defer t.Stop()
		for {
			select {
			case <-done:
				read()
				return
			case <-t.C:
				read()
			}
		}
	}()
	return func() { close(done); wg.Wait() }
}

// peakRSS is the process's peak resident set in bytes: VmHWM from
// /proc/self/status, else getrusage's maxrss (KiB on Linux).
func peakRSS() int64 {
	if f, err := os.Open("/proc/self/status"); err == nil {
		defer f.Close()
		sc := bufio.NewScanner(f)
		for sc.Scan() {
			if v, ok := strings.CutPrefix(sc.Text(), "VmHWM:"); ok {
				kb, err := strconv.ParseInt(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(v), "kB")), 10, 64)
				if err == nil {
					return kb << 10
				}
			}
		}
	}
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) == nil {
		return ru.Maxrss << 10
	}
	return 0
}

func processCPU() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func mb(b int64) float64 { return float64(b) / (1 << 20) }

func printPackRuns(w io.Writer, runs []packRun) error {
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "size PxHxY\tsecurities\tprice rows\tall rows\tingest s\tingest RSS MB\tpack s\tfirst s\tpack cpu s\tms/portfolio\tpeak RSS MB\tpeak heap MB\talloc MB\tGCs\tPDF s (1)\t")
	for _, r := range runs {
		in, b := r.Ingest, r.Build
		fmt.Fprintf(tw, "%s\t%d\t%d\t%d\t%.2f\t%.0f\t%.2f\t%.2f\t%.2f\t%.0f\t%.0f\t%.0f\t%.0f\t%d\t%.2f\t\n",
			r.Size, in.Data.Securities, in.Data.PriceRows, in.Data.TotalRows, in.Seconds, mb(in.PeakRSS),
			b.Seconds, b.FirstSeconds, b.CPUSeconds, 1000*b.Seconds/float64(r.Size.Portfolios), mb(b.PeakRSS),
			mb(int64(b.PeakHeap)), mb(int64(b.TotalAlloc)), b.NumGC, b.PDFSeconds)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if len(runs) > 1 {
		b0 := runs[0]
		fmt.Fprintf(w, "\ngrowth against %s (linear: pack time grows as P·H·Y, time per portfolio as H·Y, memory at most as the data)\n", b0.Size)
		tw = tabwriter.NewWriter(w, 0, 4, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "size PxHxY\tP·H·Y\tingest\tpack\tpack cpu\tH·Y\tper portfolio\tprice rows\tpeak RSS\tpeak heap\t")
		for _, r := range runs[1:] {
			p := float64(r.Size.Portfolios) / float64(b0.Size.Portfolios)
			h := float64(r.Size.Holdings) / float64(b0.Size.Holdings)
			y := float64(r.Size.Years) / float64(b0.Size.Years)
			per := func(x packRun) float64 { return x.Build.Seconds / float64(x.Size.Portfolios) }
			fmt.Fprintf(tw, "%s\t%.0fx\t%.2fx\t%.2fx\t%.2fx\t%.0fx\t%.2fx\t%.2fx\t%.2fx\t%.2fx\t\n", r.Size, p*h*y,
				r.Ingest.Seconds/b0.Ingest.Seconds, r.Build.Seconds/b0.Build.Seconds,
				r.Build.CPUSeconds/b0.Build.CPUSeconds, h*y, per(r)/per(b0),
				float64(r.Ingest.Data.PriceRows)/float64(b0.Ingest.Data.PriceRows),
				float64(r.Build.PeakRSS)/float64(b0.Build.PeakRSS),
				float64(r.Build.PeakHeap)/float64(b0.Build.PeakHeap))
		}
		if err := tw.Flush(); err != nil {
			return err
		}
	}
	last := runs[len(runs)-1]
	ok := last.Build.Seconds < packGoalSeconds && mb(last.Build.PeakRSS) < packGoalRSSMB
	fmt.Fprintf(w, "\ngoal at %s: packs under %d s and under %d MB peak RSS: %.1f s, %.0f MB: %s\n", last.Size,
		packGoalSeconds, packGoalRSSMB, last.Build.Seconds, mb(last.Build.PeakRSS),
		map[bool]string{true: "met", false: "NOT met"}[ok])
	return nil
}
