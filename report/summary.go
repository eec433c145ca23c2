package report

import (
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strconv"
	"strings"

	"plumbline/risk/pack"
)

// Figures of the summary page beyond which the rest is in the appendix.
const (
	summaryFindings = 5
	summaryLimits   = 12
)

// textData gathers what the templates see.
func textData(doc *pack.Document, meta Meta, fsys fs.FS) (TextData, error) {
	d := TextData{Doc: doc, Meta: meta, Headline: headline(doc)}
	for _, l := range doc.Limits {
		switch l.Status {
		case "breach":
			d.Breaches = append(d.Breaches, l)
		case "warning":
			d.Warnings = append(d.Warnings, l)
		}
	}
	for _, it := range doc.Drift {
		if it.Flagged {
			d.Flagged = append(d.Flagged, it)
		}
	}
	c, err := newTexts(fsys, d).section(SectionCautions, "body")
	if err != nil {
		return d, err
	}
	d.Cautions = c
	return d, nil
}

// headlineVaR picks the VaR figure the summary shows: historical, 99%,
// one day when present, else the first.
func headlineVaR(doc *pack.Document) *pack.VaRFigure {
	if v := pack.FindVaR(doc, "historical", 0.99, 1); v != nil {
		return v
	}
	if len(doc.VaR) > 0 {
		return &doc.VaR[0]
	}
	return nil
}

// headlineES picks the expected shortfall the summary shows: historical,
// 97.5%, one day when present (the level the limits use), else that of
// the headline VaR.
func headlineES(doc *pack.Document) *pack.VaRFigure {
	if v := pack.FindVaR(doc, "historical", 0.975, 1); v != nil {
		return v
	}
	return headlineVaR(doc)
}

// headline builds the summary's figures with their change since the
// previous run, taken from Document.Drift. A figure pack follows across
// runs (pack.Headline, or found in the history) shows n/a for a previous
// value or change the document lacks; the others leave them blank.
func headline(doc *pack.Document) []Figure {
	s := doc.Summary
	ccy := doc.BaseCurrency
	drift := map[string]pack.DriftItem{}
	for _, it := range doc.Drift {
		drift[it.Metric] = it
	}
	tracked := pack.Headline(doc)
	for _, h := range doc.History {
		for k, v := range h.Metrics {
			if _, ok := tracked[k]; !ok {
				tracked[k] = v
			}
		}
	}
	var out []Figure
	add := func(metric, label, value string) {
		f := Figure{Label: label, Value: value}
		if metric != "" {
			mi := metricOf(metric)
			if f.Label == "" {
				f.Label = mi.label
			}
			it, inDrift := drift[metric]
			if _, ok := tracked[metric]; ok || inDrift {
				f.Metric = metric
				f.Previous, f.Change = NA, NA
			}
			if inDrift {
				f.Previous = Opt(it.Previous, func(x float64) string { return mi.format(x, ccy) })
				f.Change = Opt(it.Change, func(x float64) string { return mi.change(x, ccy) })
				f.Z = Opt(it.Z, func(x float64) string { return NumSigned(x, 1) })
				f.Flagged = it.Flagged
			}
		}
		out = append(out, f)
	}
	pct := func(p *float64) string { return Opt(p, Pct) }
	money := func(x float64) string { return Money(x, ccy) }

	add(pack.MetricValue, "", money(s.Value))
	add("", "Cash", money(s.Cash))
	r := s.Returns
	add(pack.MetricReturnWeek, "", pct(r.Week))
	add(pack.MetricReturnMTD, "", pct(r.MonthToDate))
	add(pack.MetricReturnQTD, "", pct(r.QuarterToDate))
	add(pack.MetricReturnYTD, "", pct(r.YearToDate))
	si := "Return since inception"
	if r.InceptionDate != "" {
		si += " (" + r.InceptionDate + ")"
	}
	add(pack.MetricReturnSI, si, pct(r.SinceInception))
	add("", "  annualised", pct(r.SinceInceptionAnn))
	add("", "Benchmark return, week", pct(r.BenchmarkWeek))
	add("", "Benchmark return, year to date", pct(r.BenchmarkYearToDate))
	for _, w := range s.Volatility {
		add(pack.VolatilityMetric(w.WindowDays), "", pct(w.Discrete))
	}
	add(pack.MetricEWMA, "", pct(s.EWMAVolatility))
	if v, e := headlineVaR(doc), headlineES(doc); v != nil {
		lbl := fmt.Sprintf("VaR %s, %d day%s (%s)", confidence(v.Confidence), v.HorizonDays, plural(v.HorizonDays), methodLabel(v.Method))
		add(pack.LossMetric("var", v), lbl, Pct(v.VaR)+" ("+money(v.VaRAmount)+")")
		lbl = fmt.Sprintf("ES %s, %d day%s (%s)", confidence(e.Confidence), e.HorizonDays, plural(e.HorizonDays), methodLabel(e.Method))
		add(pack.LossMetric("es", e), lbl, Pct(e.ES)+" ("+money(e.ESAmount)+")")
	} else {
		add(pack.LossMetric("var", &pack.VaRFigure{Method: "historical", Confidence: 0.99, HorizonDays: 1}), "", NA)
		add(pack.LossMetric("es", &pack.VaRFigure{Method: "historical", Confidence: 0.975, HorizonDays: 1}), "", NA)
	}
	add(pack.MetricDurModified, "Modified duration (model)", Opt(s.ModifiedDuration, Years))
	emp := NA
	if s.Empirical != nil {
		emp = Years(s.Empirical.Value) + " (s.e. " + Years(s.Empirical.StdErr) + ")"
	}
	add(pack.MetricDurEmpirical, "Empirical duration (regression)", emp)
	add(pack.MetricConvexity, "", Opt(s.Convexity, Convexity))
	add(pack.MetricGrowthDuration, "", Opt(s.GrowthDuration, Years))
	add(pack.MetricBeta, "", Opt(s.Beta, func(x float64) string { return Num(x, 2) }))
	add(pack.MetricTrackingError, "", pct(s.TrackingError))
	add(pack.MetricMaxDrawdown, "", pct(s.MaxDrawdown))
	return out
}

// confidence prints a confidence level: 0.99 -> "99%", 0.975 -> "97.5%".
func confidence(c float64) string {
	return strconv.FormatFloat(math.Round(c*1000)/10, 'f', -1, 64) + "%"
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

func methodLabel(m string) string {
	switch m {
	case "historical":
		return "historical"
	case "normal":
		return "normal"
	case "cornish_fisher":
		return "Cornish-Fisher"
	}
	return m
}

func statusLabel(s string) string {
	switch s {
	case "ok":
		return "OK"
	case "warning":
		return "Warning"
	case "breach":
		return "BREACH"
	case "no_data":
		return "No data"
	}
	return s
}

func statusTone(s string) tone {
	switch s {
	case "ok":
		return toneGood
	case "warning":
		return toneWarn
	case "breach":
		return toneBad
	}
	return toneMuted
}

func statusRank(s string) int {
	switch s {
	case "breach":
		return 0
	case "warning":
		return 1
	case "no_data":
		return 2
	}
	return 3
}

// sortedLimits returns the limits, breaches first, then warnings, missing
// data and limits met, each group in configuration order.
func sortedLimits(ls []pack.LimitStatus) []pack.LimitStatus {
	out := append([]pack.LimitStatus(nil), ls...)
	sort.SliceStable(out, func(i, j int) bool { return statusRank(out[i].Status) < statusRank(out[j].Status) })
	return out
}

// summary prints the one-page summary.
func (b *builder) summary() error {
	const sec = SectionSummary
	d := b.doc
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "intro"))

	b.subheading(b.text(sec, "headline"), 20)
	cols := []column{
		{"Figure", 8, false, false}, {"This run", 6, true, false}, {"Previous run", 4, true, false},
		{"Change", 3, true, false}, {"z-score", 3, true, false},
	}
	var rows []tableRow
	data := b.tx.data
	for _, f := range data.Headline {
		r := tableRow{cells: []string{f.Label, f.Value, f.Previous, f.Change, f.Z}}
		if f.Flagged {
			r.tones = []tone{toneNone, toneNone, toneNone, toneWarn, toneWarn}
			r.cells[4] = f.Z + " flag"
		}
		rows = append(rows, r)
	}
	b.table(cols, rows)

	b.subheading(b.text(sec, "limits"), 10)
	if len(d.Limits) == 0 {
		b.note(b.text(sec, "no_limits"))
	} else {
		ls := sortedLimits(d.Limits)
		if len(ls) > summaryLimits {
			b.table(limitColumns(), b.limitRows(ls[:summaryLimits-1]))
			b.note(moreLimits(ls[summaryLimits-1:]))
		} else {
			b.table(limitColumns(), b.limitRows(ls))
		}
	}

	b.subheading(b.text(sec, "drift"), 6)
	if len(data.Flagged) == 0 {
		b.note(b.text(sec, "no_flags"))
	} else {
		var lines []string
		for _, it := range data.Flagged {
			lines = append(lines, "- "+b.driftSentence(it))
		}
		b.paragraphs(joinLines(lines))
	}

	b.subheading(b.text(sec, "quality"), 6)
	if len(d.DataQuality) == 0 {
		b.note(b.text(sec, "no_findings"))
	} else {
		fs := append([]pack.Finding(nil), d.DataQuality...)
		sort.SliceStable(fs, func(i, j int) bool { return fs[i].ValueShare > fs[j].ValueShare })
		rows := findingRows(fs, summaryFindings)
		// Details wrap, two lines at most; the appendix has them in full.
		w := b.colWidth(findingColumns(true)[2].span) - 2*cellPad
		for i := range rows {
			rows[i].cells[2] = b.meas.fitLines(rows[i].cells[2], w, sizeTable, 2)
		}
		b.table(findingColumns(true), rows)
		if n := len(fs) - summaryFindings; n > 0 {
			b.note(fmt.Sprintf("%d more findings in the appendix.", n))
		}
	}
	b.note(b.text(sec, "footnote"))
	return b.err
}

func limitColumns() []column {
	return []column{
		{"Limit", 6, false, false}, {"Measure", 6, false, false}, {"Value", 3, true, false},
		{"Breach level", 3, true, false}, {"Headroom", 3, true, false}, {"Status", 3, false, false},
	}
}

// limitRows formats limits.
func (b *builder) limitRows(ls []pack.LimitStatus) []tableRow {
	var rows []tableRow
	for _, l := range ls {
		mi := metricOf(l.Metric)
		f := func(x float64) string { return mi.format(x, b.ccy) }
		measure := mi.label
		if l.Scenario != "" {
			measure += ": " + l.Scenario
		}
		// The side says whether the level is a ceiling ("max") or a floor
		// ("min"); documents stored before pack recorded it show the level
		// alone.
		level := Opt(l.Level, f)
		if l.Side != "" && l.Level != nil {
			level = l.Side + " " + level
		}
		rows = append(rows, tableRow{
			cells: []string{l.Name, measure, Opt(l.Value, f), level,
				Opt(l.Headroom, func(x float64) string { return mi.change(x, b.ccy) }), statusLabel(l.Status)},
			tones: []tone{toneNone, toneNone, toneNone, toneNone, toneNone, statusTone(l.Status)},
		})
	}
	return rows
}

// moreLimits counts the limits left off the summary by status.
func moreLimits(ls []pack.LimitStatus) string {
	n := map[string]int{}
	for _, l := range ls {
		n[l.Status]++
	}
	var parts []string
	for _, s := range []string{"breach", "warning", "no_data", "ok"} {
		if n[s] > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", n[s], strings.ToLower(statusLabel(s))))
		}
	}
	return fmt.Sprintf("%d more limits (%s) are listed in the appendix.", len(ls), strings.Join(parts, ", "))
}

// driftSentence says how a flagged metric moved.
func (b *builder) driftSentence(it pack.DriftItem) string {
	mi := metricOf(it.Metric)
	s := mi.label + ": " + mi.format(it.Value, b.ccy)
	if it.Previous != nil {
		s += ", previous run " + mi.format(*it.Previous, b.ccy)
	}
	if it.Change != nil {
		s += ", change " + mi.change(*it.Change, b.ccy)
	}
	if it.Z != nil {
		s += fmt.Sprintf(" (%s standard deviations of its %d earlier weekly changes)", NumSigned(*it.Z, 1), it.History)
	}
	return s + "."
}

// findingColumns are the columns of the findings table; wrap prints the
// details in full.
func findingColumns(wrap bool) []column {
	return []column{{"Finding", 5, false, false}, {"Holding", 3, false, false}, {"Detail", 12, false, wrap}, {"Value share", 4, true, false}}
}

func findingRows(fs []pack.Finding, max int) []tableRow {
	var rows []tableRow
	for i, f := range fs {
		if max > 0 && i >= max {
			break
		}
		id := f.ID
		if id == "" {
			id = "-"
		}
		rows = append(rows, tableRow{cells: []string{kindLabel(f.Kind), id, tidyText(f.Detail), Pct(f.ValueShare)}})
	}
	return rows
}

// kindLabel turns a finding kind such as "stale_price" into "Stale price".
func kindLabel(k string) string { return humanize(k) }

func joinLines(ls []string) string {
	s := ""
	for i, l := range ls {
		if i > 0 {
			s += "\n"
		}
		s += l
	}
	return s
}
