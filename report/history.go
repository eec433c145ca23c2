package report

import (
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"plumbline/risk/pack"
)

// metricOrder is the order of headline metrics in the history charts and
// tables, that of the summary; "volatility", "var" and "es" stand for
// their families. Other metrics follow by name.
var metricOrder = []string{
	pack.MetricValue, pack.MetricReturnWeek, pack.MetricReturnMTD, pack.MetricReturnQTD,
	pack.MetricReturnYTD, pack.MetricReturnSI, "volatility", pack.MetricEWMA, "var", "es",
	pack.MetricDurModified, pack.MetricDurMacaulay, pack.MetricDurEmpirical, pack.MetricConvexity,
	pack.MetricGrowthDuration, pack.MetricBeta, pack.MetricTrackingError, pack.MetricMaxDrawdown,
	pack.MetricHHI, pack.MetricMaxSingleName,
}

const historyChartH = 50.0

// metricRank places a metric name in metricOrder: its rank, and within a
// family the window (volatility) or the name.
func metricRank(m string) (int, int) {
	family := m
	win := 0
	if w, ok := strings.CutPrefix(m, "volatility_ann_"); ok {
		if n, err := strconv.Atoi(strings.TrimSuffix(w, "d")); err == nil {
			family, win = "volatility", n
		}
	} else if strings.HasPrefix(m, "var_") {
		family = "var"
	} else if strings.HasPrefix(m, "es_") {
		family = "es"
	}
	if i := slices.Index(metricOrder, family); i >= 0 {
		return i, win
	}
	return len(metricOrder), 0
}

// sortMetrics orders metric names as metricOrder says.
func sortMetrics(names []string) {
	sort.Slice(names, func(i, j int) bool {
		ri, wi := metricRank(names[i])
		rj, wj := metricRank(names[j])
		if ri != rj {
			return ri < rj
		}
		if wi != wj {
			return wi < wj
		}
		return names[i] < names[j]
	})
}

// historyMetrics lists the metrics found in the history, in chart order.
func historyMetrics(hist []pack.HistoryPoint) []string {
	seen := map[string]bool{}
	var out []string
	for _, h := range hist {
		for k := range h.Metrics {
			if !seen[k] {
				seen[k] = true
				out = append(out, k)
			}
		}
	}
	sortMetrics(out)
	return out
}

// history charts the headline metrics across the stored runs and lists
// the changes since the previous run.
func (b *builder) history() error {
	const sec = SectionHistory
	d := b.doc
	b.heading(b.text(sec, "title"))
	if len(d.History) < 2 {
		b.note(b.text(sec, "no_history"))
	} else {
		b.paragraphs(b.text(sec, "intro"))
		flagged := map[string]bool{}
		for _, it := range d.Drift {
			flagged[it.Metric] = it.Flagged
		}
		dates := make([]string, len(d.History))
		for i, h := range d.History {
			dates[i] = h.AsOf
		}
		xs, err := parseDates(dates)
		if err != nil {
			return err
		}
		w := b.colWidth(gridSize/2) - 2
		var row []*chartJob
		for _, m := range historyMetrics(d.History) {
			png, err := b.historyChart(xs, m, flagged[m], w)
			if err != nil {
				return err
			}
			row = append(row, png)
			if len(row) == 2 {
				b.chartRow(historyChartH, row...)
				row = nil
			}
		}
		if len(row) == 1 {
			b.chartRow(historyChartH, row[0], nil)
		}
	}

	if len(d.Drift) > 0 {
		b.subheading(b.text(sec, "changes"), 20)
		// Rows in the order of the charts.
		var names []string
		byName := map[string]pack.DriftItem{}
		for _, it := range d.Drift {
			names = append(names, it.Metric)
			byName[it.Metric] = it
		}
		sortMetrics(names)
		var rows []tableRow
		for _, name := range names {
			it := byName[name]
			mi := metricOf(it.Metric)
			f := func(x float64) string { return mi.format(x, b.ccy) }
			r := tableRow{cells: []string{
				mi.label, f(it.Value), Opt(it.Previous, f),
				Opt(it.Change, func(x float64) string { return mi.change(x, b.ccy) }),
				Opt(it.Z, func(x float64) string { return NumSigned(x, 1) }), strconv.Itoa(it.History), "",
			}}
			if it.Flagged {
				r.cells[6] = "flagged"
				r.tones = []tone{toneNone, toneNone, toneNone, toneWarn, toneWarn, toneNone, toneWarn}
			}
			rows = append(rows, r)
		}
		b.table([]column{
			{"Figure", 6, false, false}, {"This run", 4, true, false}, {"Previous run", 4, true, false}, {"Change", 3, true, false},
			{"z-score", 2, true, false}, {"Past changes", 3, true, false}, {"Flag", 2, false, false},
		}, rows)
	}
	return b.err
}

// historyChart plots one metric over the runs, the current run marked.
func (b *builder) historyChart(xs []float64, metric string, flagged bool, w float64) (*chartJob, error) {
	mi := metricOf(metric)
	title := mi.label
	if flagged {
		title += " - flagged this run"
	}
	var ys []*float64
	for _, h := range b.doc.History {
		if v, ok := h.Metrics[metric]; ok {
			ys = append(ys, &v)
		} else {
			ys = append(ys, nil)
		}
	}
	scale, unit := mi.scale(), mi.axis(b.ccy)
	if mi.unit == unitMoney {
		scale, unit = moneyScale(maxAbsPtr(ys), b.ccy)
	}
	p := newPlot(title, "Run date", unit)
	dateAxis(p, 5)
	segs := segments(xs, ys, scale)
	if err := addSeries(p, segs, "", 0); err != nil {
		return nil, err
	}
	var pts plotter.XYs
	for _, s := range segs {
		pts = append(pts, s...)
	}
	if len(pts) > 0 {
		sc, err := plotter.NewScatter(pts)
		if err != nil {
			return nil, err
		}
		sc.GlyphStyle.Color = palette[0]
		sc.GlyphStyle.Radius = vg.Points(1.2)
		sc.GlyphStyle.Shape = draw.CircleGlyph{}
		last, err := plotter.NewScatter(pts[len(pts)-1:])
		if err != nil {
			return nil, err
		}
		last.GlyphStyle.Color = palette[1]
		if flagged {
			last.GlyphStyle.Color = colorVaR
		}
		last.GlyphStyle.Radius = vg.Points(2.6)
		last.GlyphStyle.Shape = draw.CircleGlyph{}
		p.Add(sc, last)
		// The intro says what the large last point is: a legend here
		// would sit on the line wherever the series starts high.
		minSpan(p, pts, 0.05)
	}
	return b.png(p, w, historyChartH)
}

// minSpan widens the y axis, about the data's middle, to at least frac of
// the data's largest absolute value, so that a nearly flat series (a VaR
// that moved by a basis point) is not drawn as a cliff. The axis always
// holds every point.
func minSpan(p *plot.Plot, pts plotter.XYs, frac float64) {
	lo, hi, big := math.Inf(1), math.Inf(-1), 0.0
	for _, q := range pts {
		lo, hi, big = min(lo, q.Y), max(hi, q.Y), max(big, math.Abs(q.Y))
	}
	want := frac * big
	if !(hi >= lo) || hi-lo >= want || want == 0 {
		return
	}
	mid := (lo + hi) / 2
	p.Y.Min, p.Y.Max = mid-want/2, mid+want/2
}
