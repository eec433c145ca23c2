package report

import (
	"fmt"
	"strconv"

	"github.com/johnfercher/maroto/v2/pkg/components/col"
	"github.com/johnfercher/maroto/v2/pkg/components/line"
	"github.com/johnfercher/maroto/v2/pkg/components/row"
	"github.com/johnfercher/maroto/v2/pkg/consts/align"
	"github.com/johnfercher/maroto/v2/pkg/consts/fontstyle"
	"github.com/johnfercher/maroto/v2/pkg/props"
)

// cover prints the title page: who, which portfolio, which date, which run.
func (b *builder) cover() error {
	d, m := b.doc, b.meta
	b.space(28)
	b.add(
		textRow(9, m.Firm, props.Text{Size: 15, Style: fontstyle.Bold, Color: &colHeading}),
		line.NewRow(3, props.Line{Color: &colHeading, Thickness: 0.6}),
		textRow(14, b.text(SectionCover, "title"), props.Text{Size: 26, Style: fontstyle.Bold, Color: &colInk, Top: 3}),
		textRow(8, b.text(SectionCover, "subtitle"), props.Text{Size: 11, Color: &colMuted, Top: 1}),
	)
	b.space(16)
	b.add(
		textRow(11, d.Portfolio.Name, props.Text{Size: 20, Style: fontstyle.Bold, Color: &colHeading}),
		textRow(6, fmt.Sprintf("%s - %s", d.Portfolio.ID, d.Portfolio.Strategy), props.Text{Size: 10, Color: &colMuted}),
		textRow(12, "As of "+d.AsOf, props.Text{Size: 16, Style: fontstyle.Bold, Color: &colInk, Top: 3}),
	)
	b.space(12)

	rev := strconv.Itoa(m.Revision)
	if m.Supersedes != nil {
		rev += fmt.Sprintf(" (replaces run %d)", *m.Supersedes)
	}
	b.pairs([]pair{
		{"Run", strconv.FormatInt(m.RunID, 10)},
		{"Revision", rev},
		{"Computed", m.CreatedAt.UTC().Format("2006-01-02 15:04 UTC")},
		{"Program version", m.ProgramVersion},
		{"Base currency", d.BaseCurrency},
		{"Benchmark method", d.Portfolio.BenchmarkMethod},
		{"Inception", d.Portfolio.Inception},
		{"Securities held", strconv.Itoa(d.Summary.HoldingCount)},
	}, 2)

	b.space(10)
	b.subheading("Contents", 20)
	// Page numbers are filled in when the pages are drawn, once every
	// section has been laid out.
	for i, s := range b.sectionsAfterCover() {
		p := props.Text{Size: sizeBody, Color: &colInk}
		num := p
		num.Align, num.Right = align.Right, 2
		pg := num
		pg.Color = &colMuted
		b.add(row.New(5).Add(
			textCol(1, strconv.Itoa(i+1), num),
			textCol(12, b.text(s, "title"), p),
			col.New(2).Add(&lateText{value: func() string {
				if n := b.pageOf[s]; n > 0 {
					return "page " + strconv.Itoa(n)
				}
				return ""
			}, prop: pg}),
		))
	}
	b.space(14)
	b.note(b.text(SectionCover, "note"))
	return b.err
}

// sectionsAfterCover lists the sections printed, without the cover.
func (b *builder) sectionsAfterCover() []string {
	var out []string
	for _, s := range b.order {
		if s != SectionCover {
			out = append(out, s)
		}
	}
	return out
}
