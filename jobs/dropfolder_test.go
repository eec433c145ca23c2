package jobs

import (
	"context"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/jonboulle/clockwork"

	"plumbline/jobs/config"
	"plumbline/store"
)

func listDir(t *testing.T, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range ents {
		if !e.IsDir() {
			out = append(out, e.Name())
		}
	}
	sort.Strings(out)
	return out
}

func TestDropFolderIngest(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	cfg.Sources.StableFor = config.Every(10 * time.Second)
	drop := cfg.Sources.DropDir
	os.MkdirAll(drop, 0o750)
	db := openDB(t, cfg.Database)
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 6, 23, 30, 0, 0, time.UTC))
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock})

	write := func(name, content string) {
		if err := os.WriteFile(filepath.Join(drop, name), []byte(content), 0o640); err != nil {
			t.Fatal(err)
		}
	}
	// Input format 1 of the contract: portfolios.
	write("portfolios.csv", "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method\nGROWTH,Fictional Growth,Dividend growth,2020-01-02,value\n")
	write("bad.csv", "this,is,not,a,known,header\n1,2,3,4,5,6\n")
	write(".hidden.csv", "ignored")
	write("prices.csv.part", "ignored")
	write("growing.csv", "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method\n")

	done := make(chan string, 1)
	go func() {
		outcome, _ := d.RunIngest(context.Background())
		done <- outcome
	}()
	// Between the two scans (the job timeout timer and the stable_for
	// wait are on the clock) the producer appends to growing.csv.
	ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := clock.BlockUntilContext(ctx, 2); err != nil {
		t.Fatal(err)
	}
	f, _ := os.OpenFile(filepath.Join(drop, "growing.csv"), os.O_APPEND|os.O_WRONLY, 0)
	f.WriteString("VALUE,Fictional Value,Deep value,2021-01-04,equal\n")
	f.Close()
	clock.Advance(10 * time.Second)
	if outcome := <-done; outcome != store.JobError {
		t.Fatalf("first run outcome %s, want error (one file rejected)", outcome)
	}
	if got := strings.Join(listDir(t, drop), " "); got != ".hidden.csv growing.csv prices.csv.part" {
		t.Fatalf("left in the drop folder: %s", got)
	}
	if got := strings.Join(listDir(t, filepath.Join(drop, "processed")), " "); got != "portfolios.csv" {
		t.Fatalf("processed: %s", got)
	}
	if got := strings.Join(listDir(t, filepath.Join(drop, "rejected")), " "); got != "bad.csv" {
		t.Fatalf("rejected: %s", got)
	}
	recs, _ := db.JobRuns(context.Background(), JobIngest, 1)
	if len(recs) != 1 || !strings.Contains(recs[0].Error, "bad.csv") {
		t.Fatalf("job record %+v", recs)
	}

	// growing.csv is now stable: the next run takes it. A second file of
	// the same name goes to processed/ under a new name.
	write("portfolios.csv", "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method\nINCOME,Fictional Income,High yield,2019-06-03,price\n")
	go func() {
		outcome, _ := d.RunIngest(context.Background())
		done <- outcome
	}()
	if err := clock.BlockUntilContext(ctx, 2); err != nil {
		t.Fatal(err)
	}
	clock.Advance(10 * time.Second)
	if outcome := <-done; outcome != store.JobOK {
		t.Fatalf("second run outcome %s", outcome)
	}
	processed := listDir(t, filepath.Join(drop, "processed"))
	if len(processed) != 3 || processed[0] != "growing.csv" || processed[2] != "portfolios.csv" || !strings.HasPrefix(processed[1], "portfolios.2026") {
		t.Fatalf("processed: %v", processed)
	}
	// Nothing left: the run records a skip.
	go func() {
		outcome, _ := d.RunIngest(context.Background())
		done <- outcome
	}()
	if outcome := <-done; outcome != store.JobSkipped {
		t.Fatalf("empty run outcome %s", outcome)
	}
}

func TestIgnoredNames(t *testing.T) {
	// The marker convention documented in dropfolder.go.
	for name, want := range map[string]bool{
		"prices.csv": false, ".prices.csv": true, "prices.csv.part": true, ".x.part-123": true, "part.csv": false,
	} {
		if got := ignoredName(name); got != want {
			t.Errorf("ignoredName(%q) = %v", name, got)
		}
	}
}
