package report

import (
	"sort"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"plumbline/risk/pack"
)

// sensitivity prints rate and growth sensitivities, the curve factors and
// the week's return explanation.
func (b *builder) sensitivity() error {
	const sec = SectionSensitivity
	d := b.doc
	s := d.Summary
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "intro"))

	b.subheading(b.text(sec, "portfolio"), 15)
	emp, se, r2, n := NA, NA, NA, NA
	if s.Empirical != nil {
		emp = Years(s.Empirical.Value)
		se = Years(s.Empirical.StdErr)
		r2 = Num(s.Empirical.R2, 2)
		n = strconv.Itoa(s.Empirical.N) + " weeks"
	}
	b.pairs([]pair{
		{"Modified duration", Opt(s.ModifiedDuration, Years)},
		{"Macaulay duration", Opt(s.MacaulayDuration, Years)},
		{"Convexity", Opt(s.Convexity, Convexity)},
		{"Value change, k +1 bp", Opt(s.DollarDuration01, func(x float64) string { return MoneySigned(x, b.ccy) })},
		{"Growth duration", Opt(s.GrowthDuration, Years)},
		{"Growth convexity", Opt(s.GrowthConvexity, Convexity)},
		{"Beta (CAPM)", Opt(s.Beta, num2)},
		{"Beta to benchmark", Opt(s.BenchmarkBeta, num2)},
		{"Empirical duration", emp},
		{"Its standard error", se},
		{"R-squared", r2},
		{"Regression sample", n},
	}, 3)

	hs := append([]pack.Holding(nil), d.Holdings...)
	sort.SliceStable(hs, func(i, j int) bool { return hs[i].Weight > hs[j].Weight })

	b.subheading(b.text(sec, "per_holding"), 20)
	var rows []tableRow
	for _, h := range hs {
		rows = append(rows, tableRow{cells: []string{
			h.ID, Pct(h.Weight), modelLabel(h.Model), Opt(h.K, Pct), Opt(h.G, Pct), Opt(h.Beta, num2),
			Opt(h.ModDuration, num2), Opt(h.MacDuration, num2), Opt(h.Convexity, num1), Opt(h.GrowthDur, num2),
			Opt(h.ContribDuration, num2), Opt(h.ContribGrowthDuration, num2),
		}})
	}
	b.table([]column{
		{"ID", 2, false, false}, {"Weight", 2, true, false}, {"Model", 2, false, false}, {"k", 2, true, false}, {"g", 2, true, false},
		{"Beta", 2, true, false}, {"Mod. dur. (yrs)", 2, true, false}, {"Mac. dur. (yrs)", 2, true, false},
		{"Convexity (yrs^2)", 2, true, false}, {"Growth dur. (yrs)", 2, true, false},
		{"Contrib. dur. (yrs)", 2, true, false}, {"Contrib. growth (yrs)", 2, true, false},
	}, rows)

	if d.Curve != nil {
		// Title, factors and chart belong together; the table of factor
		// durations by holding may start on the next page.
		b.ensure(42 + curveChartH)
	}
	b.subheading(b.text(sec, "curve"), 30)
	if d.Curve == nil {
		b.note(b.text(sec, "no_curve"))
	} else {
		if err := b.curve(sec, hs); err != nil {
			return err
		}
	}

	b.subheading(b.text(sec, "explain"), 20)
	if d.Explain == nil {
		b.note(b.text(sec, "no_explain"))
	} else {
		b.explain(sec, hs)
	}
	return b.err
}

// curveChartH is the height of the yield curve chart, mm: a smooth curve
// reads well low.
const curveChartH = 50.0

func (b *builder) curve(sec string, hs []pack.Holding) error {
	c := b.doc.Curve
	s := b.doc.Summary
	b.paragraphs(b.text(sec, "curve_intro"))
	b.pairs([]pair{
		{"Curve date", c.Date},
		{"Level", Pct(c.Level)},
		{"Slope", Pct(c.Slope)},
		{"Curvature", Pct(c.Curvature)},
		{"Decay (lambda)", Num(c.Lambda, 3) + " per year"},
		{"Fit error (RMSE)", Num(c.RMSE*1e4, 1) + " bp"},
		{"Level duration", Opt(s.LevelDuration, Years)},
		{"Slope duration", Opt(s.SlopeDuration, Years)},
		{"Curvature duration", Opt(s.CurvatureDuration, Years)},
	}, 3)
	if len(c.Points) > 0 {
		png, err := b.curveChart(b.width, curveChartH)
		if err != nil {
			return err
		}
		b.chartRow(curveChartH, png)
	}
	var rows []tableRow
	for _, h := range hs {
		if h.LevelDur == nil && h.SlopeDur == nil && h.CurveDur == nil && h.Empirical == nil {
			continue
		}
		emp, se, r2 := NA, NA, NA
		if h.Empirical != nil {
			emp, se, r2 = num2(h.Empirical.Value), num2(h.Empirical.StdErr), num2(h.Empirical.R2)
		}
		rows = append(rows, tableRow{cells: []string{
			h.ID, Opt(h.LevelDur, num2), Opt(h.SlopeDur, num2), Opt(h.CurveDur, num2),
			emp, se, r2, numErr(h),
		}})
	}
	if len(rows) > 0 {
		b.table([]column{
			{"ID", 3, false, false}, {"Level dur. (yrs)", 3, true, false}, {"Slope dur. (yrs)", 3, true, false},
			{"Curvature dur. (yrs)", 3, true, false}, {"Empirical dur. (yrs)", 3, true, false}, {"Std. error (yrs)", 3, true, false},
			{"R-squared", 3, true, false}, {"Numerical error (yrs)", 3, true, false},
		}, rows)
	}
	return nil
}

// numErr prints the estimated error of a holding's numerical durations;
// the constant-growth model's are closed forms and have none.
func numErr(h pack.Holding) string {
	if h.NumericalError == nil && h.Model == "constant_growth" {
		return "closed form"
	}
	return Opt(h.NumericalError, Sci)
}

// curveChart plots observed yields beside the Nelson-Siegel fit.
func (b *builder) curveChart(w, h float64) (*chartJob, error) {
	c := b.doc.Curve
	p := newPlot("Yield curve on "+c.Date+": observed and fitted", "Tenor (years)", "Yield (%)")
	obs := make(plotter.XYs, len(c.Points))
	fit := make(plotter.XYs, len(c.Points))
	for i, pt := range c.Points {
		t := float64(pt.TenorMonths) / 12
		obs[i] = plotter.XY{X: t, Y: pt.Yield * 100}
		fit[i] = plotter.XY{X: t, Y: pt.Fitted * 100}
	}
	l, err := plotter.NewLine(fit)
	if err != nil {
		return nil, err
	}
	styleLine(l, 0)
	sc, err := plotter.NewScatter(obs)
	if err != nil {
		return nil, err
	}
	sc.GlyphStyle.Color = palette[1]
	sc.GlyphStyle.Radius = vg.Points(2.2)
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	// A log scale of tenors spreads the short end, where the curve bends.
	p.X.Scale = plot.LogScale{}
	var ticks []plot.Tick
	for _, t := range []float64{0.25, 0.5, 1, 2, 3, 5, 7, 10, 20, 30} {
		ticks = append(ticks, plot.Tick{Value: t, Label: strconv.FormatFloat(t, 'f', -1, 64)})
	}
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	p.X.Label.Text = "Tenor (years, log scale)"
	p.Add(l, sc)
	p.Legend.Add("Nelson-Siegel fit", l)
	p.Legend.Add("Observed", sc)
	p.Legend.Left = false
	p.Legend.Top = false
	p.Legend.XOffs = -vg.Points(4)
	p.Legend.YOffs = vg.Points(4)
	return b.png(p, w, h)
}

func (b *builder) explain(sec string, hs []pack.Holding) {
	e := b.doc.Explain
	b.paragraphs(b.text(sec, "explain_intro"))
	// The portfolio has no single change in k or g (each holding has its
	// own, in the table), so the document's portfolio DeltaK and DeltaG
	// are not printed.
	b.pairs([]pair{
		{"From", e.From},
		{"To", e.To},
		{"Taylor estimate", PctSigned(e.Taylor)},
		{"Full revaluation", PctSigned(e.Full)},
		{"Residual", PctSigned(e.Residual)},
		{"Realised return", Opt(e.Actual, PctSigned)},
	}, 3)
	var rows []tableRow
	for _, h := range hs {
		x := h.Explain
		if x == nil {
			continue
		}
		rows = append(rows, tableRow{cells: []string{
			h.ID, Pct(h.Weight), BP(x.DeltaK), BP(x.DeltaG), PctSigned(x.Taylor), PctSigned(x.Full),
			PctSigned(x.Residual), Opt(x.Actual, PctSigned),
		}})
	}
	if len(rows) > 0 {
		b.table([]column{
			{"ID", 3, false, false}, {"Weight", 3, true, false}, {"Change in k", 3, true, false}, {"Change in g", 3, true, false},
			{"Taylor", 3, true, false}, {"Full revaluation", 3, true, false}, {"Residual", 3, true, false}, {"Realised", 3, true, false},
		}, rows)
	}
}
