package report

import (
	"fmt"
	"sort"
	"strconv"

	"gonum.org/v1/plot"

	"plumbline/risk/pack"
)

// Chart heights in millimetres.
const (
	chartHalfH = 58.0
	chartFullH = 66.0
)

// returns prints the period returns, the volatilities and their charts.
func (b *builder) returns() error {
	const sec = SectionReturns
	d := b.doc
	s := d.Summary
	r := s.Returns
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "intro"))

	b.pairs([]pair{
		{"Week", Opt(r.Week, PctSigned)},
		{"Month to date", Opt(r.MonthToDate, PctSigned)},
		{"Quarter to date", Opt(r.QuarterToDate, PctSigned)},
		{"Year to date", Opt(r.YearToDate, PctSigned)},
		{"Since inception", Opt(r.SinceInception, PctSigned)},
		{"  annualised", Opt(r.SinceInceptionAnn, PctSigned)},
		{"Benchmark, week", Opt(r.BenchmarkWeek, PctSigned)},
		{"Benchmark, year to date", Opt(r.BenchmarkYearToDate, PctSigned)},
		{"Tracking error (ann.)", Opt(s.TrackingError, Pct)},
		{"Max. drawdown to date", Opt(s.MaxDrawdown, Pct)},
		{"Drawdown now", Opt(s.CurrentDrawdown, Pct)},
		{"Beta to benchmark", Opt(s.BenchmarkBeta, num2)},
	}, 3)

	var rows []tableRow
	for _, w := range s.Volatility {
		rows = append(rows, tableRow{cells: []string{
			strconv.Itoa(w.WindowDays) + " trading days", Opt(w.Discrete, Pct), Opt(w.Log, Pct),
			Opt(w.Dollar, func(x float64) string { return Money(x, b.ccy) }),
		}})
	}
	rows = append(rows, tableRow{cells: []string{"EWMA", Opt(s.EWMAVolatility, Pct), "", ""}})
	b.table([]column{
		{"Volatility window", 6, false, false}, {"Discrete returns (ann.)", 6, true, false},
		{"Log returns (ann.)", 6, true, false}, {"Value changes (per day)", 6, true, false},
	}, rows)

	if len(d.Series.Dates) < 2 {
		b.note(b.text(sec, "no_series"))
		return b.err
	}
	xs, err := parseDates(d.Series.Dates)
	if err != nil {
		return err
	}
	w := b.colWidth(gridSize/2) - 2
	half := [][2]func() (*plot.Plot, error){
		{func() (*plot.Plot, error) { return b.growthChart(xs) }, func() (*plot.Plot, error) { return b.valueChart(xs) }},
		{func() (*plot.Plot, error) {
			return b.dailyChart(xs, d.Series.Discrete, "Daily returns (discrete)", "Return (%)", 100)
		}, func() (*plot.Plot, error) {
			return b.dailyChart(xs, d.Series.Log, "Daily log returns", "Log return (%)", 100)
		}},
		{func() (*plot.Plot, error) { return b.dollarChart(xs) }, func() (*plot.Plot, error) { return b.drawdownChart(xs) }},
	}
	for _, pr := range half {
		var pngs []*chartJob
		for _, f := range pr {
			png, err := b.draw(f, w, chartHalfH)
			if err != nil {
				return err
			}
			pngs = append(pngs, png)
		}
		b.chartRow(chartHalfH, pngs...)
	}

	b.newPage()
	b.subheading(b.text(sec, "rolling"), chartFullH)
	b.paragraphs(b.text(sec, "rolling_intro"))
	for _, kind := range []string{"discrete", "log", "dollar"} {
		png, err := b.draw(func() (*plot.Plot, error) { return b.rollingChart(xs, kind) }, b.width, chartFullH)
		if err != nil {
			return err
		}
		if png != nil {
			b.chartRow(chartFullH, png)
		}
	}
	return b.err
}

// draw builds a chart with f and starts drawing it; a nil plot (nothing
// to show) gives a nil chart.
func (b *builder) draw(f func() (*plot.Plot, error), w, h float64) (*chartJob, error) {
	p, err := f()
	if err != nil || p == nil {
		return nil, err
	}
	return b.png(p, w, h)
}

// drawdownChart is the fall of the time-weighted index from its running
// peak.
func (b *builder) drawdownChart(xs []float64) (*plot.Plot, error) {
	sr := b.doc.Series
	if len(sr.Discrete) == 0 {
		return nil, nil
	}
	p := newPlot("Drawdown from the running peak of this period", "Date", "Drawdown (%)")
	dateAxis(p, 6)
	dd := make([]float64, min(len(xs), len(sr.Discrete)))
	idx, peak := 1.0, 1.0
	for i := range dd {
		if i > 0 {
			idx *= 1 + sr.Discrete[i]
		}
		peak = max(peak, idx)
		dd[i] = idx/peak - 1
	}
	return p, addSeries(p, segments(xs, ptrs(dd), 100), "", 0)
}

// growthChart is the time-weighted growth of 100 beside the benchmark
// rebased to 100 on the first date.
func (b *builder) growthChart(xs []float64) (*plot.Plot, error) {
	sr := b.doc.Series
	p := newPlot("Growth of 100 (time-weighted)", "Date", "Index, first date = 100")
	dateAxis(p, 6)
	if len(sr.Discrete) > 0 {
		idx := make([]float64, min(len(xs), len(sr.Discrete)))
		for i := range idx {
			if i == 0 {
				idx[i] = 100
				continue
			}
			idx[i] = idx[i-1] * (1 + sr.Discrete[i])
		}
		if err := addSeries(p, segments(xs, ptrs(idx), 1), "Portfolio", 0); err != nil {
			return nil, err
		}
	}
	if len(sr.Benchmark) > 0 && sr.Benchmark[0] > 0 {
		bm := make([]float64, len(sr.Benchmark))
		for i, v := range sr.Benchmark {
			bm[i] = v / sr.Benchmark[0] * 100
		}
		if err := addSeries(p, segments(xs, ptrs(bm), 1), "Benchmark", 1); err != nil {
			return nil, err
		}
	}
	legendRoom(p, 2)
	return p, nil
}

func (b *builder) valueChart(xs []float64) (*plot.Plot, error) {
	v := b.doc.Series.Value
	scale, unit := moneyScale(maxAbs(v), b.ccy)
	p := newPlot("Market value incl. cash", "Date", "Value ("+unit+")")
	dateAxis(p, 6)
	return p, addSeries(p, segments(xs, ptrs(v), scale), "", 0)
}

func (b *builder) dailyChart(xs, v []float64, title, ylabel string, scale float64) (*plot.Plot, error) {
	p := newPlot(title, "Date", ylabel)
	dateAxis(p, 6)
	// Daily series are dense: a finer line keeps single days visible.
	if err := addSeriesW(p, segments(xs, ptrs(v), scale), "", 0, 0.5); err != nil {
		return nil, err
	}
	return p, nil
}

func (b *builder) dollarChart(xs []float64) (*plot.Plot, error) {
	v := b.doc.Series.Dollar
	scale, unit := moneyScale(maxAbs(v), b.ccy)
	return b.dailyChart(xs, v, "Daily value change, flows removed", "Change ("+unit+")", scale)
}

// rollingChart plots every window of one kind of rolling statistic.
func (b *builder) rollingChart(xs []float64, kind string) (*plot.Plot, error) {
	var rs []pack.RollingSeries
	for _, r := range b.doc.Series.Rolling {
		if r.Kind == kind {
			rs = append(rs, r)
		}
	}
	sort.SliceStable(rs, func(i, j int) bool { return rs[i].WindowDays < rs[j].WindowDays })
	var p *plot.Plot
	scale := 100.0
	switch kind {
	case "dollar":
		m := 0.0
		for _, r := range rs {
			m = max(m, maxAbsPtr(r.Values))
		}
		var unit string
		scale, unit = moneyScale(m, b.ccy)
		p = newPlot("Rolling standard deviation of daily value changes", "Date", "Per day ("+unit+")")
	case "log":
		p = newPlot("Rolling volatility of log returns (annualised)", "Date", "Volatility (%)")
	default:
		p = newPlot("Rolling volatility of daily returns (annualised)", "Date", "Volatility (%)")
	}
	dateAxis(p, 12)
	if len(rs) == 0 {
		return nil, nil
	}
	for i, r := range rs {
		name := fmt.Sprintf("%d days", r.WindowDays)
		if err := addSeries(p, segments(xs, r.Values, scale), name, i); err != nil {
			return nil, err
		}
	}
	legendRoom(p, len(rs))
	return p, nil
}
