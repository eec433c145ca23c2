package main

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"
)

func TestParsePackSize(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want packSize
		ok   bool
	}{
		{"100x200x10", packSize{100, 200, 10}, true},
		{"1x1x1", packSize{1, 1, 1}, true},
		{"0x200x10", packSize{}, false},
		{"100x200", packSize{}, false},
		{"100x200x10x5", packSize{}, false},
		{"100x200x010", packSize{}, false},
		{"ax2x3", packSize{}, false},
		{"", packSize{}, false},
	} {
		got, err := parsePackSize(tc.in)
		if (err == nil) != tc.ok || (tc.ok && got != tc.want) {
			t.Errorf("parsePackSize(%q) = %v, %v", tc.in, got, err)
		}
		if tc.ok && got.String() != tc.in {
			t.Errorf("%v.String() = %q", got, got.String())
		}
	}
}

// TestPackStages runs both stages of a tiny size in this process: the
// generated files are all accepted, and every portfolio gets a full pack.
// Row counts follow from the generator's definition: 252 weekdays a year
// (common practice for trading days), two securities per holding, a
// snapshot every 63 trading days plus one on the last day.
func TestPackStages(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	s := packSize{Portfolios: 3, Holdings: 4, Years: 1}
	var reps [2]stageReport
	for i, stage := range []string{"ingest", "build"} {
		var out bytes.Buffer
		if err := runPackStage(ctx, stage, s, dir, 2, "", &out); err != nil {
			t.Fatalf("%s: %v", stage, err)
		}
		if err := json.Unmarshal(out.Bytes(), &reps[i]); err != nil {
			t.Fatalf("%s: %v\n%s", stage, err, out.String())
		}
	}
	in, b := reps[0], reps[1]
	if in.Data.Securities != 8 || in.Data.Days != 252 || in.Data.PriceRows != 8*252 || in.Data.Snapshots != 5 ||
		in.Data.HoldingRows != 3*5*(4+1) {
		t.Errorf("data %+v", in.Data)
	}
	if b.Packs != 3 || b.AsOf != packDataEnd.Format("2006-01-02") || b.PDFPages < 1 || b.PeakRSS <= 0 || b.TotalAlloc == 0 {
		t.Errorf("build report %+v", b)
	}
	var w strings.Builder
	if err := printPackRuns(&w, []packRun{{Size: s, Ingest: in, Build: b}, {Size: s, Ingest: in, Build: b}}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(w.String(), "3x4x1") || !strings.Contains(w.String(), "1.00x") {
		t.Errorf("table:\n%s", w.String())
	}
}
