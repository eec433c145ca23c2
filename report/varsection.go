package report

import (
	"fmt"
	"image/color"
	"strconv"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// varSection prints VaR and ES by method, the distribution of daily
// returns with the headline VaR and ES marked, and the backtest.
func (b *builder) varSection() error {
	const sec = SectionVaR
	d := b.doc
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "intro"))
	if len(d.VaR) == 0 {
		b.note(b.text(sec, "no_var"))
	} else {
		var rows []tableRow
		for _, v := range d.VaR {
			rows = append(rows, tableRow{cells: []string{
				humanize(methodLabel(v.Method)), confidence(v.Confidence), strconv.Itoa(v.HorizonDays) + " day" + plural(v.HorizonDays),
				Pct(v.VaR), Money(v.VaRAmount, b.ccy), Pct(v.ES), Money(v.ESAmount, b.ccy),
			}})
		}
		b.table([]column{
			{"Method", 4, false, false}, {"Confidence", 3, true, false}, {"Horizon", 3, true, false},
			{"VaR (% of value)", 3, true, false}, {"VaR (" + b.ccy + ")", 4, true, false},
			{"ES (% of value)", 3, true, false}, {"ES (" + b.ccy + ")", 4, true, false},
		}, rows)
		if len(d.Series.Discrete) > 10 {
			png, err := b.histogram(b.width, chartFullH)
			if err != nil {
				return err
			}
			b.chartRow(chartFullH, png)
		}
	}

	b.subheading(b.text(sec, "backtest"), 20)
	bt := d.Backtest
	if bt == nil {
		b.note(b.text(sec, "no_backtest"))
		return b.err
	}
	b.paragraphs(b.text(sec, "backtest_intro"))
	zone := bt.Zone
	b.pairs([]pair{
		{"Days tested", strconv.Itoa(bt.Days)},
		{"VaR confidence", confidence(bt.Confidence)},
		{"Exceptions", strconv.Itoa(bt.Exceptions)},
		{"Expected exceptions", Num(bt.Expected, 1)},
		{"Kupiec LR statistic", Num(bt.KupiecLR, 2)},
		{"p-value", Num(bt.PValue, 3)},
	}, 3)
	t := toneGood
	switch zone {
	case "yellow":
		t = toneWarn
	case "red":
		t = toneBad
	}
	b.table([]column{{"Zone", 6, false, false}, {"Reading", 18, false, false}}, []tableRow{{
		cells: []string{zoneLabel(zone), zoneReading(zone)},
		tones: []tone{t, toneNone},
	}})
	return b.err
}

func zoneLabel(z string) string {
	switch z {
	case "green":
		return "Green"
	case "yellow":
		return "Yellow"
	case "red":
		return "Red"
	}
	return z
}

func zoneReading(z string) string {
	switch z {
	case "green":
		return "Exceptions consistent with the stated confidence."
	case "yellow":
		return "More exceptions than expected; the VaR may understate risk."
	case "red":
		return "Far more exceptions than expected; the VaR understates risk."
	}
	return ""
}

// histogram shows the distribution of daily returns with the one-day
// VaR and ES of the headline method as vertical lines at the loss side.
func (b *builder) histogram(w, h float64) (*chartJob, error) {
	r := b.doc.Series.Discrete
	vals := make(plotter.Values, 0, len(r))
	for _, x := range r {
		if finite(x) {
			vals = append(vals, x*100)
		}
	}
	title := fmt.Sprintf("Distribution of daily returns, %d days", len(vals))
	v, e := headlineVaR(b.doc), headlineES(b.doc)
	if v != nil && v.HorizonDays == 1 {
		title += fmt.Sprintf(", with the one-day VaR and ES (%s)", methodLabel(v.Method))
	}
	p := newPlot(title, "Daily return (%)", "Number of days")
	p.Y.Tick.Marker = niceTicks{n: 6, integer: true}
	hist, err := plotter.NewHist(vals, 60)
	if err != nil {
		return nil, fmt.Errorf("report: histogram: %w", err)
	}
	hist.FillColor = color.RGBA{R: 160, G: 180, B: 205, A: 255}
	hist.LineStyle.Color = color.RGBA{R: 90, G: 110, B: 140, A: 255}
	hist.LineStyle.Width = vg.Points(0.3)
	p.Add(hist)
	padX(p, 0.02) // the outermost bins clear the frame
	if v != nil && v.HorizonDays == 1 {
		top := 0.0
		for _, bin := range hist.Bins {
			top = max(top, bin.Weight)
		}
		lv, err := vline(-v.VaR*100, 0, top, colorVaR, nil)
		if err != nil {
			return nil, err
		}
		le, err := vline(-e.ES*100, 0, top, colorVaR, []vg.Length{vg.Points(3), vg.Points(2)})
		if err != nil {
			return nil, err
		}
		p.Add(lv, le)
		p.Legend.Add("VaR "+confidence(v.Confidence)+": "+Pct(v.VaR)+" loss", lv)
		p.Legend.Add("ES "+confidence(e.Confidence)+": "+Pct(e.ES)+" loss", le)
		p.Legend.Left = false
		p.Legend.XOffs = -vg.Points(4)
	}
	return b.png(p, w, h)
}
