package report

import (
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"plumbline/risk/pack"
)

// historyOrder is the order of the history charts; other metrics follow
// by name.
var historyOrder = []string{
	mValue, mReturnWeek, mReturnYTD, mEWMA,
	"var_99_1d", "es_975_1d", "es_99_1d", mDurModified, mDurEmp,
	mConvexity, mGrowthDur, mBeta, mTracking,
}

const historyChartH = 50.0

// historyMetrics lists the metrics found in the history, in chart order.
func historyMetrics(hist []pack.HistoryPoint) []string {
	seen := map[string]bool{}
	for _, h := range hist {
		for k := range h.Metrics {
			seen[k] = true
		}
	}
	var out []string
	rank := map[string]int{}
	for i, m := range historyOrder {
		rank[m] = i
	}
	for k := range seen {
		out = append(out, k)
	}
	sort.Slice(out, func(i, j int) bool {
		ri, oki := rank[out[i]]
		rj, okj := rank[out[j]]
		// Volatilities sort after the week's return, by window.
		if strings.HasPrefix(out[i], "volatility_ann_") && !oki {
			ri, oki = rank[mReturnYTD], true
		}
		if strings.HasPrefix(out[j], "volatility_ann_") && !okj {
			rj, okj = rank[mReturnYTD], true
		}
		switch {
		case oki && okj && ri != rj:
			return ri < rj
		case oki != okj:
			return oki
		}
		return volOrder(out[i]) < volOrder(out[j]) || (volOrder(out[i]) == volOrder(out[j]) && out[i] < out[j])
	})
	return out
}

// volOrder is the window of a volatility metric, for sorting, else 0.
func volOrder(m string) int {
	s := strings.TrimSuffix(strings.TrimPrefix(m, "volatility_ann_"), "d")
	n, _ := strconv.Atoi(s)
	return n
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
		hist := []pack.HistoryPoint{{Metrics: map[string]float64{}}}
		for _, n := range names {
			hist[0].Metrics[n] = 0
		}
		var rows []tableRow
		for _, name := range historyMetrics(hist) {
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
			{"z", 2, true, false}, {"Past changes", 3, true, false}, {"Flag", 2, false, false},
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
		p.Legend.Add("This run", last)
		legendRoom(p, 1)
	}
	return b.png(p, w, historyChartH)
}
