package report

import (
	"fmt"
	"image/color"
	"slices"
	"strings"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"plumbline/risk/pack"
)

// stress prints the scenarios (full revaluation beside the Taylor
// estimate), their largest contributors and the historical replays.
func (b *builder) stress() error {
	const sec = SectionStress
	d := b.doc
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "intro"))
	money := func(x float64) string { return MoneySigned(x, b.ccy) }
	if len(d.Stress) == 0 {
		b.note(b.text(sec, "no_stress"))
	} else {
		var rows []tableRow
		for _, s := range d.Stress {
			rows = append(rows, tableRow{cells: []string{
				s.Name, money(s.PnL), PctSigned(s.PnLPct), Opt(s.Taylor, money), Opt(s.TaylorPct, PctSigned), Opt(s.Error, money),
			}})
		}
		b.table([]column{
			{"Scenario", 6, false, false}, {"Full revaluation (" + b.ccy + ")", 4, true, false}, {"Full (% of value)", 3, true, false},
			{"Taylor estimate (" + b.ccy + ")", 4, true, false}, {"Taylor (% of value)", 3, true, false}, {"Full minus Taylor (" + b.ccy + ")", 4, true, false},
		}, rows)
		h := 14 + 7*float64(len(d.Stress))
		png, err := b.stressChart(b.width, h)
		if err != nil {
			return err
		}
		b.chartRow(h, png)

		var notes []string
		for _, s := range d.Stress {
			if s.Description != "" {
				notes = append(notes, "- "+s.Name+": "+s.Description)
			}
		}
		if len(notes) > 0 {
			b.paragraphs(strings.Join(notes, "\n"))
		}

		b.subheading(b.text(sec, "contributors"), 20)
		rows = nil
		for _, s := range d.Stress {
			for i, c := range s.Top {
				name := ""
				if i == 0 {
					name = s.Name
				}
				rows = append(rows, tableRow{cells: []string{
					name, c.ID, c.Sector, money(c.PnL), PctSigned(c.Pct), Opt(c.Taylor, money),
				}})
			}
		}
		b.groupedTable([]column{
			{"Scenario", 6, false, false}, {"Holding", 3, false, false}, {"Sector", 4, false, false},
			{"Full P&L (" + b.ccy + ")", 4, true, false}, {"% of holding value", 3, true, false}, {"Taylor P&L (" + b.ccy + ")", 4, true, false},
		}, rows)
		if failed := failedNotes(d.Stress); len(failed) > 0 {
			b.subheading(b.text(sec, "failed"), 10)
			b.paragraphs(b.text(sec, "failed_intro"))
			b.paragraphs(strings.Join(failed, "\n"))
		}
	}

	b.subheading(b.text(sec, "replays"), 15)
	if len(d.Replays) == 0 {
		b.note(b.text(sec, "no_replays"))
		return b.err
	}
	b.paragraphs(b.text(sec, "replays_intro"))
	var rows []tableRow
	var notes []string
	for _, r := range d.Replays {
		rows = append(rows, tableRow{cells: []string{
			r.Name, r.From + " to " + r.To, money(r.PnL), PctSigned(r.PnLPct),
		}})
		if r.Description != "" {
			notes = append(notes, "- "+r.Name+": "+r.Description)
		}
	}
	b.table([]column{
		{"Replay", 7, false, false}, {"Period", 7, false, false}, {"P&L (" + b.ccy + ")", 6, true, false},
		{"% of value", 4, true, false},
	}, rows)
	if len(notes) > 0 {
		b.paragraphs(strings.Join(notes, "\n"))
	}
	return b.err
}

// failedNotes lists the holdings some scenarios could not revalue, one
// line per holding and reason with the scenarios it concerns, rather than
// one line per scenario and holding.
func failedNotes(ss []pack.StressResult) []string {
	type key struct{ id, reason string }
	var keys []key
	share := map[key]float64{}
	in := map[key][]string{}
	for _, s := range ss {
		for _, f := range s.Failed {
			k := key{f.ID, f.Reason}
			if _, ok := in[k]; !ok {
				keys = append(keys, k)
			}
			in[k] = append(in[k], s.Name)
			share[k] = f.ValueShare
		}
	}
	var out []string
	for _, k := range keys {
		where := "in every scenario"
		if sc := in[k]; len(sc) < len(ss) {
			var rest []string
			for _, s := range ss {
				if !slices.Contains(sc, s.Name) {
					rest = append(rest, s.Name)
				}
			}
			if len(rest) < len(sc) {
				where = "in every scenario but " + strings.Join(rest, ", ")
			} else {
				where = "in " + strings.Join(sc, ", ")
			}
		}
		out = append(out, fmt.Sprintf("- %s (%s of value), %s: %s.", k.id, Pct(share[k]), where, strings.TrimSuffix(tidyText(k.reason), ".")))
	}
	return out
}

// stressChart shows each scenario's loss or gain in percent of value,
// full revaluation beside the Taylor estimate.
func (b *builder) stressChart(w, h float64) (*chartJob, error) {
	ss := b.doc.Stress
	n := len(ss)
	full := make(plotter.Values, n)
	tay := make(plotter.Values, n)
	names := make([]string, n)
	// The first scenario is drawn at the top.
	for i, s := range ss {
		k := n - 1 - i
		full[k] = s.PnLPct * 100
		if s.TaylorPct != nil {
			tay[k] = *s.TaylorPct * 100
		}
		names[k] = b.meas.fit(s.Name, 45, 7, false)
	}
	p := newPlot("Scenario P&L: full revaluation and Taylor estimate", "P&L (% of value)", "")
	bw := vg.Length(h/float64(n)*0.28) * vg.Millimeter
	bf, err := plotter.NewBarChart(full, bw)
	if err != nil {
		return nil, fmt.Errorf("report: stress chart: %w", err)
	}
	bf.Horizontal = true
	bf.Color = palette[0]
	bf.LineStyle.Width = 0
	bf.Offset = bw / 2
	bt, err := plotter.NewBarChart(tay, bw)
	if err != nil {
		return nil, fmt.Errorf("report: stress chart: %w", err)
	}
	bt.Horizontal = true
	bt.Color = color.RGBA{R: 240, G: 170, B: 110, A: 255}
	bt.LineStyle.Width = 0
	bt.Offset = -bw / 2
	p.Add(bf, bt)
	p.Legend.Add("Full revaluation", bf)
	p.Legend.Add("Taylor estimate", bt)
	p.Legend.Left = false
	p.Legend.Top = false
	p.Legend.XOffs = -vg.Points(4)
	p.Legend.YOffs = vg.Points(4)
	padX(p, 0.04)
	p.NominalY(names...)
	// An empty band under the last scenario keeps the legend off the bars.
	p.Y.Min = -1.6
	p.Y.Tick.Label.Font = sans(chartTick, false)
	return b.png(p, w, h)
}
