package report

import (
	"bytes"
	"fmt"
	"image/color"
	"image/png"
	"math"
	"runtime"
	"time"

	stdfont "golang.org/x/image/font"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// chartDPI is the resolution of the chart images: enough for print at the
// sizes used (a half-width chart is about 550 pixels wide).
const chartDPI = 150

// Chart type sizes in points, as printed.
const (
	chartTitle = 8.5
	chartLabel = 7.5
	chartTick  = 7
)

// Line colours, told apart in grey print by the dash patterns of lineDash.
var palette = []color.Color{
	color.RGBA{R: 22, G: 52, B: 82, A: 255},
	color.RGBA{R: 214, G: 110, B: 30, A: 255},
	color.RGBA{R: 40, G: 140, B: 130, A: 255},
	color.RGBA{R: 150, G: 40, B: 120, A: 255},
	color.RGBA{R: 110, G: 110, B: 110, A: 255},
}

var lineDash = [][]vg.Length{nil, {vg.Points(4), vg.Points(2)}, {vg.Points(1.5), vg.Points(1.5)}, {vg.Points(6), vg.Points(2), vg.Points(1.5), vg.Points(2)}, nil}

var (
	colorVaR  = color.RGBA{R: 180, G: 20, B: 20, A: 255}
	colorGrid = color.Gray{Y: 225}
)

func sans(size float64, bold bool) font.Font {
	f := font.Font{Typeface: "Liberation", Variant: "Sans", Size: vg.Points(size)}
	if bold {
		f.Weight = stdfont.WeightBold
	}
	return f
}

// newPlot returns a plot with the pack's type sizes, a light grid and the
// legend at the top left.
func newPlot(title, xLabel, yLabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = sans(chartTitle, true)
	p.Title.Padding = vg.Points(3)
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = sans(chartLabel, false)
		a.Tick.Label.Font = sans(chartTick, false)
		a.Tick.Length = vg.Points(3)
		a.Padding = vg.Points(2)
	}
	p.X.Label.Text = xLabel
	p.Y.Label.Text = yLabel
	p.X.Tick.Marker = niceTicks{n: 7}
	p.Y.Tick.Marker = niceTicks{n: 6}
	p.Legend.TextStyle.Font = sans(chartTick, false)
	p.Legend.Top = true
	p.Legend.Left = true
	p.Legend.XOffs = vg.Points(4)
	p.Legend.ThumbnailWidth = vg.Points(14)
	p.Legend.Padding = vg.Points(1)
	g := plotter.NewGrid()
	g.Vertical.Color = colorGrid
	g.Horizontal.Color = colorGrid
	g.Vertical.Width = vg.Points(0.4)
	g.Horizontal.Width = vg.Points(0.4)
	p.Add(g)
	return p
}

// chartJob is a chart being drawn in the background while the pages are
// laid out; the PDF writer waits for it when it places the image.
type chartJob struct {
	done chan struct{}
	png  []byte
	err  error
}

// wait returns the chart's PNG once drawn.
func (j *chartJob) wait() ([]byte, error) {
	<-j.done
	return j.png, j.err
}

// png starts drawing p as a PNG of w x h millimetres. Charts are drawn
// concurrently (each from its own plot, into its own canvas), so the PNG
// bytes do not depend on the order they finish in.
//
// Each chart of one pack gets a distinct pixel width (one pixel more than
// the one before): the PDF writer orders image objects by width, so equal
// widths would leave their order, and the file's bytes, to map iteration.
func (b *builder) png(p *plot.Plot, wMM, hMM float64) (*chartJob, error) {
	b.charts++
	wPx := int(math.Round(wMM/25.4*chartDPI)) + b.charts
	hPx := int(math.Round(hMM / 25.4 * chartDPI))
	job := &chartJob{done: make(chan struct{})}
	b.jobs = append(b.jobs, job)
	if b.sem == nil {
		b.sem = make(chan struct{}, runtime.GOMAXPROCS(0))
	}
	go func() {
		b.sem <- struct{}{}
		defer func() { <-b.sem }()
		job.png, job.err = drawPNG(p, wPx, hPx)
		close(job.done)
	}()
	return job, nil
}

func drawPNG(p *plot.Plot, wPx, hPx int) ([]byte, error) {
	c := vgimg.NewWith(
		vgimg.UseWH(vg.Length(wPx)/chartDPI*vg.Inch, vg.Length(hPx)/chartDPI*vg.Inch),
		vgimg.UseDPI(chartDPI),
		vgimg.UseBackgroundColor(color.White),
	)
	p.Draw(draw.New(c))
	var buf bytes.Buffer
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	if err := enc.Encode(&buf, c.Image()); err != nil {
		return nil, fmt.Errorf("report: chart %q: %w", p.Title.Text, err)
	}
	return buf.Bytes(), nil
}

// styleLine gives the i-th series of a chart its colour and dash.
func styleLine(l *plotter.Line, i int) {
	l.Color = palette[i%len(palette)]
	l.Width = vg.Points(0.9)
	l.Dashes = lineDash[i%len(lineDash)]
}

// parseDates turns "YYYY-MM-DD" strings into Unix seconds for a time axis.
func parseDates(ds []string) ([]float64, error) {
	xs := make([]float64, len(ds))
	for i, d := range ds {
		t, err := time.Parse(time.DateOnly, d)
		if err != nil {
			return nil, fmt.Errorf("report: series date %d %q: %w", i, d, ErrDocument)
		}
		xs[i] = float64(t.Unix())
	}
	return xs, nil
}

// segments splits a series with gaps (nil values) into lines drawn one
// by one, so that a gap is not bridged; scale multiplies every value.
func segments(xs []float64, ys []*float64, scale float64) []plotter.XYs {
	var out []plotter.XYs
	var cur plotter.XYs
	n := min(len(xs), len(ys))
	for i := 0; i < n; i++ {
		if ys[i] == nil || !finite(*ys[i]) {
			if len(cur) > 0 {
				out = append(out, cur)
				cur = nil
			}
			continue
		}
		cur = append(cur, plotter.XY{X: xs[i], Y: *ys[i] * scale})
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	return out
}

func ptrs(v []float64) []*float64 {
	out := make([]*float64, len(v))
	for i := range v {
		out[i] = &v[i]
	}
	return out
}

// addSeries adds one series (possibly in several segments) with legend
// entry name ("" for none) in style i.
func addSeries(p *plot.Plot, segs []plotter.XYs, name string, i int) error {
	return addSeriesW(p, segs, name, i, 0)
}

// addSeriesW is addSeries with a line width in points (0 for the default).
func addSeriesW(p *plot.Plot, segs []plotter.XYs, name string, i int, width float64) error {
	for k, s := range segs {
		l, err := plotter.NewLine(s)
		if err != nil {
			return fmt.Errorf("report: chart %q: %w", p.Title.Text, err)
		}
		styleLine(l, i)
		if width > 0 {
			l.Width = vg.Points(width)
		}
		p.Add(l)
		if k == 0 && name != "" {
			p.Legend.Add(name, l)
		}
	}
	return nil
}

// dateAxis puts calendar dates on the x axis: month starts, spaced so
// that at most maxTicks are labelled, or days for short spans.
func dateAxis(p *plot.Plot, maxTicks int) {
	p.X.Tick.Marker = dateTicker{max: maxTicks}
}

// dateTicker marks calendar boundaries and labels them as ISO dates.
type dateTicker struct{ max int }

func (t dateTicker) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) {
		return []plot.Tick{{Value: lo, Label: time.Unix(int64(lo), 0).UTC().Format(time.DateOnly)}}
	}
	start := time.Unix(int64(lo), 0).UTC()
	end := time.Unix(int64(hi), 0).UTC()
	days := end.Sub(start).Hours() / 24
	maxT := max(t.max, 2)
	if days < 62 {
		step := 7
		for _, s := range []int{1, 2, 7, 14, 28} {
			if days/float64(s) <= float64(maxT) {
				step = s
				break
			}
		}
		format := plot.TimeTicks{Format: time.DateOnly}
		var ticks []plot.Tick
		d := time.Date(start.Year(), start.Month(), start.Day(), 0, 0, 0, 0, time.UTC)
		for ; !d.After(end); d = d.AddDate(0, 0, step) {
			if d.Before(start) {
				continue
			}
			ticks = append(ticks, plot.Tick{Value: float64(d.Unix()), Label: "x"})
		}
		return labelTicks(format, ticks)
	}
	months := days / 30.44
	step := 24
	for _, s := range []int{1, 2, 3, 6, 12, 24} {
		if months/float64(s) <= float64(maxT) {
			step = s
			break
		}
	}
	format := plot.TimeTicks{Format: "2006-01"}
	var ticks []plot.Tick
	d := time.Date(start.Year(), start.Month(), 1, 0, 0, 0, 0, time.UTC)
	for ; !d.After(end); d = d.AddDate(0, 1, 0) {
		if d.Before(start) {
			continue
		}
		label := ""
		if (int(d.Month())-1)%step == 0 {
			label = "x"
		}
		if step > 1 && label == "" {
			// Minor ticks on the months between labels.
			ticks = append(ticks, plot.Tick{Value: float64(d.Unix())})
			continue
		}
		ticks = append(ticks, plot.Tick{Value: float64(d.Unix()), Label: label})
	}
	return labelTicks(format, ticks)
}

// labelTicks writes the date labels through plot.TimeTicks.
func labelTicks(tt plot.TimeTicks, ticks []plot.Tick) []plot.Tick {
	tt.Ticker = fixedTicks(ticks)
	return tt.Ticks(0, 0)
}

type fixedTicks []plot.Tick

func (f fixedTicks) Ticks(float64, float64) []plot.Tick { return f }

// moneyScale picks a unit for currency axes so tick labels stay short.
func moneyScale(maxAbs float64, ccy string) (scale float64, label string) {
	switch {
	case maxAbs >= 1e9:
		return 1e-9, ccy + " bn"
	case maxAbs >= 1e6:
		return 1e-6, ccy + " m"
	case maxAbs >= 1e4:
		return 1e-3, ccy + " thousand"
	}
	return 1, ccy
}

func maxAbs(v []float64) float64 {
	m := 0.0
	for _, x := range v {
		if finite(x) && math.Abs(x) > m {
			m = math.Abs(x)
		}
	}
	return m
}

func maxAbsPtr(v []*float64) float64 {
	m := 0.0
	for _, x := range v {
		if x != nil && finite(*x) && math.Abs(*x) > m {
			m = math.Abs(*x)
		}
	}
	return m
}

// vline is a vertical line at x across [y0, y1].
func vline(x, y0, y1 float64, c color.Color, dashes []vg.Length) (*plotter.Line, error) {
	l, err := plotter.NewLine(plotter.XYs{{X: x, Y: y0}, {X: x, Y: y1}})
	if err != nil {
		return nil, err
	}
	l.Color = c
	l.Width = vg.Points(1.1)
	l.Dashes = dashes
	return l, nil
}

// hline is a horizontal line at y across [x0, x1].
func hline(y, x0, x1 float64) (*plotter.Line, error) {
	l, err := plotter.NewLine(plotter.XYs{{X: x0, Y: y}, {X: x1, Y: y}})
	if err != nil {
		return nil, err
	}
	l.Color = color.Gray{Y: 90}
	l.Width = vg.Points(0.5)
	return l, nil
}

// niceTicks marks about n round values (1, 2 or 5 times a power of ten)
// and labels them with as many decimals as the step needs.
type niceTicks struct {
	n       int
	integer bool // counts: no step below one, no step of 2.5
}

func (t niceTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) || !finite(lo) || !finite(hi) {
		return []plot.Tick{{Value: lo, Label: tickLabel(lo, 2)}}
	}
	n := max(t.n, 2)
	step := niceNum((hi - lo) / float64(n-1))
	if t.integer && step != math.Round(step) {
		step = max(1, math.Ceil(step/5)*5)
	}
	dec := 0
	for dec < 12 && math.Abs(step*math.Pow10(dec)-math.Round(step*math.Pow10(dec))) > 1e-6*step*math.Pow10(dec) {
		dec++
	}
	var ticks []plot.Tick
	for v := math.Ceil(lo/step-1e-9) * step; v <= hi+step*1e-9; v += step {
		if math.Abs(v) < step*1e-9 {
			v = 0
		}
		ticks = append(ticks, plot.Tick{Value: v, Label: tickLabel(v, dec)})
	}
	return ticks
}

// niceNum rounds x to 1, 2, 2.5 or 5 times a power of ten.
func niceNum(x float64) float64 {
	e := math.Floor(math.Log10(x))
	f := x / math.Pow(10, e)
	switch {
	case f < 1.5:
		f = 1
	case f < 2.25:
		f = 2
	case f < 3.5:
		f = 2.5
	case f < 7.5:
		f = 5
	default:
		f = 10
	}
	return f * math.Pow(10, e)
}

func tickLabel(v float64, dec int) string { return group(fixed(v, dec, false)) }

// legendRoom raises the top of the y axis so a legend of n entries at the
// top of the chart sits above the data rather than over it.
func legendRoom(p *plot.Plot, n int) {
	if !(p.Y.Max > p.Y.Min) {
		return
	}
	p.Y.Max += (p.Y.Max - p.Y.Min) * (0.1 + 0.1*float64(n))
}

// padX widens the x axis by frac of its range on both sides.
func padX(p *plot.Plot, frac float64) {
	r := p.X.Max - p.X.Min
	p.X.Min -= r * frac
	p.X.Max += r * frac
}
