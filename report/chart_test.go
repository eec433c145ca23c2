package report

import (
	"bytes"
	"image/png"
	"testing"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
)

// Nice tick steps are 1, 2, 2.5 or 5 times a power of ten (Heckbert,
// "Nice numbers for graph labels", Graphics Gems, 1990, with 2.5 added as
// is common practice).
func TestNiceNum(t *testing.T) {
	for _, tt := range []struct{ in, want float64 }{
		{0.013, 0.01}, {0.019, 0.02}, {0.3, 0.25}, {0.4, 0.5}, {7.2, 5}, {8, 10}, {120, 100}, {2600, 2500},
	} {
		if got := niceNum(tt.in); got != tt.want {
			t.Errorf("niceNum(%v) = %v, want %v", tt.in, got, tt.want)
		}
	}
}

func TestNiceTicks(t *testing.T) {
	ticks := niceTicks{n: 6}.Ticks(45.1, 58.9)
	var labels []string
	for _, tk := range ticks {
		labels = append(labels, tk.Label)
	}
	// Range 13.8 over 5 steps: 2.76, rounded to 2.5; labels need one decimal.
	want := []string{"47.5", "50.0", "52.5", "55.0", "57.5"}
	if len(labels) != len(want) {
		t.Fatalf("labels %q, want %q", labels, want)
	}
	for i := range want {
		if labels[i] != want[i] {
			t.Fatalf("labels %q, want %q", labels, want)
		}
	}
}

// Date ticks fall on the first day of a month and read as ISO 8601
// calendar months, YYYY-MM (ISO 8601).
func TestDateTicks(t *testing.T) {
	lo := time.Date(2024, 1, 15, 0, 0, 0, 0, time.UTC)
	hi := time.Date(2025, 1, 10, 0, 0, 0, 0, time.UTC)
	ticks := dateTicker{max: 6}.Ticks(float64(lo.Unix()), float64(hi.Unix()))
	var labels []string
	for _, tk := range ticks {
		d := time.Unix(int64(tk.Value), 0).UTC()
		if d.Day() != 1 || d.Hour() != 0 {
			t.Errorf("tick at %v is not a month start", d)
		}
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	// Eleven and a half months in at most 6 labels: every second month
	// (January, March, ...), from the first month start in the range.
	want := []string{"2024-03", "2024-05", "2024-07", "2024-09", "2024-11", "2025-01"}
	if len(labels) != len(want) {
		t.Fatalf("labels %q, want %q", labels, want)
	}
	for i := range want {
		if labels[i] != want[i] {
			t.Fatalf("labels %q, want %q", labels, want)
		}
	}
}

// The same chart gives the same PNG bytes; successive charts of a pack
// differ in width by one pixel (see png).
func TestChartPNGDeterministic(t *testing.T) {
	mk := func() *plot.Plot {
		p := newPlot("Test", "Date", "%")
		dateAxis(p, 6)
		xs, _ := parseDates([]string{"2025-01-02", "2025-02-03", "2025-03-03", "2025-04-01"})
		if err := addSeries(p, []plotter.XYs{{{X: xs[0], Y: 1}, {X: xs[1], Y: 3}, {X: xs[2], Y: 2}, {X: xs[3], Y: 4}}}, "a", 0); err != nil {
			t.Fatal(err)
		}
		return p
	}
	b1, b2 := &builder{}, &builder{}
	draw := func(b *builder) []byte {
		j, err := b.png(mk(), 90, 50)
		if err != nil {
			t.Fatal(err)
		}
		png, err := j.wait()
		if err != nil {
			t.Fatal(err)
		}
		return png
	}
	p1, p2 := draw(b1), draw(b2)
	if !bytes.Equal(p1, p2) {
		t.Error("same chart, different PNG bytes")
	}
	p3 := draw(b2)
	w := func(b []byte) int {
		img, err := png.Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		return img.Bounds().Dx()
	}
	// 90 mm at 150 dpi is 90/25.4*150 = 531.496 pixels, rounded to 531,
	// plus the chart's sequence number.
	if w(p1) != 532 || w(p3) != 533 {
		t.Errorf("widths %d, %d; want 532, 533", w(p1), w(p3))
	}
}
