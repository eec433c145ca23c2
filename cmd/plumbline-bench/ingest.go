package main

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"
)

func init() { register("ingest", runIngest) }

// runIngest times `plumbline ingest` of a generated prices file against
// the sqlite3 shell's `.import --csv --skip 1` of the same file into a
// table with the same columns, constraints and primary key.
//
// The shell's tables are taken from the database plumbline created (its
// securities and prices tables as the migrations define them), less the
// two audit columns that tie a row to its source file and line, which a
// plain CSV import has no values for. Foreign keys are on in both. The
// shell runs twice: with plumbline's connection settings (WAL, 64 MiB
// page cache) and with its own defaults. Each tool runs --runs times,
// alternating which goes first, and the best time counts.
func runIngest(ctx context.Context, args []string, stdout io.Writer) error {
	fs := flag.NewFlagSet("ingest", flag.ContinueOnError)
	rows := fs.Int("rows", 1000000, "price rows to generate")
	nsec := fs.Int("securities", 400, "fictional securities in the file")
	runs := fs.Int("runs", 3, "runs of each tool; the best counts")
	dir := fs.String("dir", "", "work folder (default: a new temporary folder, removed after)")
	bin := fs.String("plumbline", "", "plumbline binary to time (default: go build ./cmd/plumbline)")
	shell := fs.String("sqlite3", "sqlite3", "sqlite3 command-line shell")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if *rows < 1 || *nsec < 1 || *runs < 1 {
		return errors.New("--rows, --securities and --runs must be positive")
	}
	shellPath, err := exec.LookPath(*shell)
	if err != nil {
		return fmt.Errorf("the sqlite3 shell is needed: %w", err)
	}
	work := *dir
	if work == "" {
		if work, err = os.MkdirTemp("", "plumbline-bench-ingest-"); err != nil {
			return err
		}
		defer os.RemoveAll(work)
	} else if err := os.MkdirAll(work, 0o755); err != nil {
		return err
	}
	if *bin == "" {
		*bin = filepath.Join(work, "plumbline")
		if err := buildPlumbline(ctx, *bin); err != nil {
			return err
		}
	}
	secCSV, priceCSV := filepath.Join(work, "securities.csv"), filepath.Join(work, "prices.csv")
	if err := writeBenchCSV(secCSV, priceCSV, *rows, *nsec); err != nil {
		return err
	}

	type tool struct {
		name  string
		time  func(i int) (time.Duration, error)
		best  time.Duration
		times []time.Duration
	}
	var ddl string // the shell's schema, from the first plumbline database
	plumb := &tool{name: "plumbline ingest", time: func(i int) (time.Duration, error) {
		db := filepath.Join(work, fmt.Sprintf("plumbline-%d.db", i))
		if err := runCmd(ctx, nil, *bin, "ingest", "--db", db, secCSV); err != nil {
			return 0, err
		}
		start := time.Now()
		err := runCmd(ctx, nil, *bin, "ingest", "--db", db, priceCSV)
		d := time.Since(start)
		if err != nil {
			return 0, err
		}
		if ddl == "" {
			if ddl, err = shellSchema(ctx, shellPath, db); err != nil {
				return 0, err
			}
		}
		return d, checkCount(ctx, shellPath, db, *rows)
	}}
	shellRun := func(label, key, pragmas string) *tool {
		return &tool{name: label, time: func(i int) (time.Duration, error) {
			db := filepath.Join(work, fmt.Sprintf("shell-%s-%d.db", key, i))
			setup := ddl + "\n.import --csv --skip 1 " + secCSV + " securities\n"
			if err := runCmd(ctx, strings.NewReader(setup), shellPath, "-bail", db); err != nil {
				return 0, err
			}
			script := pragmas + "PRAGMA foreign_keys=ON;\n.import --csv --skip 1 " + priceCSV + " prices\n"
			start := time.Now()
			err := runCmd(ctx, strings.NewReader(script), shellPath, "-bail", db)
			d := time.Since(start)
			if err != nil {
				return 0, err
			}
			return d, checkCount(ctx, shellPath, db, *rows)
		}}
	}
	same := shellRun("sqlite3 .import (same settings)", "same", "PRAGMA journal_mode=WAL;\nPRAGMA cache_size=-65536;\n")
	dflt := shellRun("sqlite3 .import (shell defaults)", "default", "")

	// The first plumbline run supplies the shell's schema, so it goes first.
	order := [][]*tool{{plumb, same, dflt}, {same, dflt, plumb}, {dflt, plumb, same}}
	for i := 0; i < *runs; i++ {
		for _, t := range order[i%len(order)] {
			if err := ctx.Err(); err != nil {
				return err
			}
			d, err := t.time(i)
			if err != nil {
				return fmt.Errorf("%s: %w", t.name, err)
			}
			t.times = append(t.times, d)
			if t.best == 0 || d < t.best {
				t.best = d
			}
		}
	}

	rate := func(d time.Duration) float64 { return float64(*rows) / d.Seconds() }
	fmt.Fprintf(stdout, "ingest of %d price rows (%d fictional securities), best of %d runs\n", *rows, *nsec, *runs)
	tw := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "tool\tbest s\trows/s\tplumbline/tool\truns s\t")
	for _, t := range []*tool{plumb, same, dflt} {
		var all []string
		for _, d := range t.times {
			all = append(all, strconv.FormatFloat(d.Seconds(), 'f', 2, 64))
		}
		fmt.Fprintf(tw, "%s\t%.2f\t%.0f\t%.2f\t%s\t\n", t.name, t.best.Seconds(), rate(t.best),
			rate(plumb.best)/rate(t.best), strings.Join(all, " "))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "goal: plumbline >= 0.8x the shell's rows/s with the same settings: %s\n",
		map[bool]string{true: "met", false: "NOT met"}[rate(plumb.best) >= 0.8*rate(same.best)])
	return nil
}

// buildPlumbline builds ./cmd/plumbline of the module in the current
// folder's tree into out.
func buildPlumbline(ctx context.Context, out string) error {
	gomod, err := exec.CommandContext(ctx, "go", "env", "GOMOD").Output()
	if err != nil {
		return fmt.Errorf("go env GOMOD: %w", err)
	}
	root := filepath.Dir(strings.TrimSpace(string(gomod)))
	if root == "." || root == "" {
		return errors.New("run from inside the plumbline module, or pass --plumbline")
	}
	cmd := exec.CommandContext(ctx, "go", "build", "-o", out, "./cmd/plumbline")
	cmd.Dir = root
	if b, err := cmd.CombinedOutput(); err != nil {
		return fmt.Errorf("go build ./cmd/plumbline: %w\n%s", err, b)
	}
	return nil
}

// runCmd runs name with args, feeding stdin, and returns its stderr in
// the error when it fails.
func runCmd(ctx context.Context, stdin io.Reader, name string, args ...string) error {
	cmd := exec.CommandContext(ctx, name, args...)
	cmd.Stdin = stdin
	var stderr bytes.Buffer
	cmd.Stdout = io.Discard
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		return fmt.Errorf("%s %s: %w\n%s", filepath.Base(name), strings.Join(args, " "), err, stderr.String())
	}
	if stderr.Len() > 0 && filepath.Base(name) != "plumbline" {
		// The shell reports refused rows on stderr and goes on.
		return fmt.Errorf("%s: %s", filepath.Base(name), firstLine(stderr.String()))
	}
	return nil
}

func firstLine(s string) string {
	s, _, _ = strings.Cut(s, "\n")
	return s
}

// shellSchema returns plumbline's securities and prices tables as CREATE
// statements without the source_file_id and source_line columns.
func shellSchema(ctx context.Context, shell, db string) (string, error) {
	out, err := exec.CommandContext(ctx, shell, db,
		"SELECT sql || ';' FROM sqlite_schema WHERE type = 'table' AND name IN ('securities', 'prices') ORDER BY name = 'prices'").Output()
	if err != nil {
		return "", fmt.Errorf("read schema: %w", err)
	}
	var keep []string
	for _, line := range strings.Split(string(out), "\n") {
		if strings.Contains(line, "source_file_id") || strings.Contains(line, "source_line") {
			continue
		}
		keep = append(keep, line)
	}
	// A dropped last column leaves a comma before the closing parenthesis.
	ddl := trailingComma.ReplaceAllString(strings.Join(keep, "\n"), "$1")
	if strings.Count(ddl, "CREATE TABLE") != 2 {
		return "", fmt.Errorf("unexpected schema:\n%s", out)
	}
	return ddl, nil
}

var trailingComma = regexp.MustCompile(`,(\s*\n\))`)

func checkCount(ctx context.Context, shell, db string, want int) error {
	out, err := exec.CommandContext(ctx, shell, db, "SELECT count(*) FROM prices").Output()
	if err != nil {
		return fmt.Errorf("count rows: %w", err)
	}
	if got := strings.TrimSpace(string(out)); got != strconv.Itoa(want) {
		return fmt.Errorf("%s has %s price rows, want %d", db, got, want)
	}
	return nil
}

// writeBenchCSV writes nsec fictional securities (SYN0000, ...) and n
// price rows for them on consecutive weekdays from 2000-01-03, with a
// deterministic pseudo-random walk, an occasional dividend and a rare
// split. Every field is written out (no empty optional fields), since the
// shell stores an empty field as ” rather than the column default.
func writeBenchCSV(secPath, pricePath string, n, nsec int) error {
	var sb strings.Builder
	sb.WriteString("security_id,security_name,sector,currency,shares_outstanding\n")
	sectors := []string{"Utilities", "Consumer Staples", "Industrials", "Health Care", "Financials", "Energy"}
	for i := 0; i < nsec; i++ {
		fmt.Fprintf(&sb, "SYN%04d,Synthetic Holdings %d,%s,USD,%d\n", i, i, sectors[i%len(sectors)], 10000000+7919*i)
	}
	if err := os.WriteFile(secPath, []byte(sb.String()), 0o644); err != nil {
		return err
	}
	f, err := os.Create(pricePath)
	if err != nil {
		return err
	}
	w := bufio.NewWriterSize(f, 1<<20)
	w.WriteString("date,security_id,close,dividend,split_ratio\n")
	px := make([]float64, nsec)
	for i := range px {
		px[i] = 20 + float64(i%80)
	}
	state := uint64(0x9E3779B97F4A7C15)
	next := func() float64 { // xorshift64*, uniform in [0, 1)
		state ^= state >> 12
		state ^= state << 25
		state ^= state >> 27
		return float64((state*2685821657736338717)>>11) / (1 << 53)
	}
	d := time.Date(2000, 1, 3, 0, 0, 0, 0, time.UTC)
	var line []byte
	for row := 0; row < n; d = d.AddDate(0, 0, 1) {
		if wd := d.Weekday(); wd == time.Saturday || wd == time.Sunday {
			continue
		}
		day := d.Format(time.DateOnly)
		for s := 0; s < nsec && row < n; s++ {
			px[s] *= 1 + (next()-0.5)*0.04
			div, split := "0", "1"
			if u := next(); u < 0.004 {
				div = strconv.FormatFloat(px[s]*0.01, 'f', 4, 64)
			} else if u > 0.99995 {
				split, px[s] = "2", px[s]/2
			}
			line = append(line[:0], day...)
			line = append(line, ",SYN"...)
			line = append(line, fmt.Sprintf("%04d", s)...)
			line = append(line, ',')
			line = strconv.AppendFloat(line, px[s], 'f', 4, 64)
			line = append(line, ',')
			line = append(line, div...)
			line = append(line, ',')
			line = append(line, split...)
			line = append(line, '\n')
			w.Write(line)
			row++
		}
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
