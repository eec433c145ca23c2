package report

import (
	"reflect"
	"strings"

	"github.com/johnfercher/go-tree/node"
	"sync"

	"github.com/johnfercher/maroto/v2/pkg/components/col"
	"github.com/johnfercher/maroto/v2/pkg/components/line"
	"github.com/johnfercher/maroto/v2/pkg/components/page"
	"github.com/johnfercher/maroto/v2/pkg/components/row"
	"github.com/johnfercher/maroto/v2/pkg/components/text"
	"github.com/johnfercher/maroto/v2/pkg/consts/align"
	"github.com/johnfercher/maroto/v2/pkg/consts/extension"
	"github.com/johnfercher/maroto/v2/pkg/consts/fontstyle"
	"github.com/johnfercher/maroto/v2/pkg/core"
	"github.com/johnfercher/maroto/v2/pkg/core/entity"
	"github.com/johnfercher/maroto/v2/pkg/props"
	"github.com/phpdave11/gofpdf"
)

// Page grid and type sizes, in columns of gridSize, millimetres and points.
const (
	gridSize     = 24
	marginSide   = 13.0
	marginTop    = 12.0
	marginBottom = 14.0

	sizeBody      = 8.5
	sizeTable     = 7.5
	sizeSmall     = 7.0
	sizeMinFigure = 5.5 // a figure too wide for its cell shrinks down to this
	sizeHeading   = 14.0
	sizeSubhead   = 9.5
	rowTable      = 4.6 // mm, a table line
	rowHeaderTbl  = 5.2 // mm, a table's header line
	cellPad       = 1.0 // mm, text inset in a table cell
)

var (
	colInk     = props.Color{Red: 30, Green: 30, Blue: 30}
	colMuted   = props.Color{Red: 95, Green: 100, Blue: 108}
	colHeading = props.Color{Red: 22, Green: 52, Blue: 82}
	colRule    = props.Color{Red: 150, Green: 160, Blue: 172}
	colHeadBG  = props.Color{Red: 221, Green: 229, Blue: 237}
	colZebra   = props.Color{Red: 245, Green: 247, Blue: 249}
	colBadBG   = props.Color{Red: 246, Green: 210, Blue: 210}
	colBadInk  = props.Color{Red: 140, Green: 16, Blue: 16}
	colWarnBG  = props.Color{Red: 252, Green: 234, Blue: 190}
	colGoodBG  = props.Color{Red: 219, Green: 239, Blue: 221}
	colWhite   = props.WhiteColor
)

// tone colours one table cell.
type tone int

const (
	toneNone tone = iota
	toneGood
	toneWarn
	toneBad
	toneMuted
)

// column is one table column: its title, its width in grid columns and
// whether figures are right-aligned.
type column struct {
	title string
	span  int
	right bool
	wrap  bool // long text runs onto more lines instead of being cut
}

// tableRow is one line of a table; tones may be nil or shorter than cells.
type tableRow struct {
	cells []string
	tones []tone
	bold  bool
}

// measurer sizes strings in the core Helvetica metrics maroto uses, so
// table cells can be shortened to fit rather than wrap into the next line.
type measurer struct{ pdf *gofpdf.Fpdf }

func newMeasurer() *measurer {
	pdf := gofpdf.New("P", "mm", "A4", "")
	return &measurer{pdf: pdf}
}

func (m *measurer) width(s string, size float64, bold bool) float64 {
	style := ""
	if bold {
		style = "B"
	}
	m.pdf.SetFont("Helvetica", style, size)
	return m.pdf.GetStringWidth(enc(s))
}

// fit shortens s with "..." until it is at most w millimetres wide.
func (m *measurer) fit(s string, w, size float64, bold bool) string {
	if m.width(s, size, bold) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 0 {
		r = r[:len(r)-1]
		t := strings.TrimRight(string(r), " ") + "..."
		if m.width(t, size, bold) <= w {
			return t
		}
	}
	return ""
}

// fitLines shortens s at a word break, ending it with "...", until it
// wraps onto at most n lines of width w.
func (m *measurer) fitLines(s string, w, size float64, n int) string {
	if m.lines(s, w, size, false) <= n {
		return s
	}
	words := strings.Fields(s)
	for k := len(words) - 1; k > 0; k-- {
		t := strings.TrimRight(strings.Join(words[:k], " "), ",;:") + "..."
		if m.lines(t, w, size, false) <= n {
			return t
		}
	}
	return m.fit(s, w, size, false)
}

// lines counts the lines s wraps onto at word breaks in width w, as
// maroto wraps it.
func (m *measurer) lines(s string, w, size float64, bold bool) int {
	n, cur := 1, 0.0
	for i, word := range strings.Fields(s) {
		piece := word
		if i > 0 && cur > 0 {
			piece = " " + word
		}
		pw := m.width(piece, size, bold)
		if cur+pw <= w || cur == 0 {
			cur += pw
			continue
		}
		n++
		cur = m.width(word, size, bold)
	}
	return n
}

func (b *builder) add(rows ...core.Row) { b.m.AddRows(rows...) }

// newPage starts a new page unless the current one is still empty.
func (b *builder) newPage() { b.m.AddPages(page.New()) }

// sectionPage starts a new page for a section and returns its number, or
// 0 when it cannot tell.
func (b *builder) sectionPage() int {
	b.newPage()
	n, ok := pagesClosed(b.m)
	if !ok {
		return 0
	}
	return n + 1
}

// pagesClosed returns the number of pages maroto has closed. maroto v2
// has no public page count: GetStructure gives one but rebuilds the tree
// of every page and closes the current one, which doubled the time of a
// render. So the length of its page list is read by reflection (reading
// an unexported field's length is allowed; nothing is written). Should an
// upgrade of maroto rename the list, ok is false, the contents print
// without page numbers and TestRenderContentsPages fails.
func pagesClosed(m core.Maroto) (n int, ok bool) {
	v := reflect.ValueOf(m)
	if v.Kind() == reflect.Pointer {
		v = v.Elem()
	}
	if v.Kind() != reflect.Struct {
		return 0, false
	}
	f := v.FieldByName("pages")
	if !f.IsValid() || f.Kind() != reflect.Slice {
		return 0, false
	}
	return f.Len(), true
}

// ensure starts a new page when h millimetres do not fit on this one.
func (b *builder) ensure(h float64) {
	if !b.m.FitlnCurrentPage(h) {
		b.newPage()
	}
}

func (b *builder) space(h float64) { b.add(row.New(h)) }

// heading is a section title with a rule under it.
func (b *builder) heading(title string) {
	b.add(
		textRow(8, title, props.Text{Size: sizeHeading, Style: fontstyle.Bold, Color: &colHeading}),
		line.NewRow(2, props.Line{Color: &colHeading, Thickness: 0.4, SizePercent: 100}),
	)
}

// subheading titles a block; it asks for room for the first lines of the
// block so that it is not left alone at the foot of a page.
func (b *builder) subheading(title string, keep float64) {
	b.ensure(9 + keep)
	b.add(
		row.New(2),
		textRow(6, title, props.Text{Size: sizeSubhead, Style: fontstyle.Bold, Color: &colHeading, Top: 1}),
	)
}

// paragraphs prints text: paragraphs separated by blank lines; lines that
// start with "- " are list items.
func (b *builder) paragraphs(s string) {
	for _, para := range splitParagraphs(s) {
		lines := strings.Split(para, "\n")
		if strings.HasPrefix(strings.TrimSpace(lines[0]), "- ") {
			for _, l := range lines {
				l = strings.TrimSpace(l)
				l = strings.TrimPrefix(l, "- ")
				b.add(row.New().Add(
					textCol(1, "-", props.Text{Size: sizeBody, Color: &colInk, Align: align.Right, Right: 1.5}),
					textCol(gridSize-1, l, props.Text{Size: sizeBody, Color: &colInk, Bottom: 0.8}),
				))
			}
			b.space(1.2)
			continue
		}
		b.add(textAuto(strings.Join(strings.Fields(para), " "),
			props.Text{Size: sizeBody, Color: &colInk, Bottom: 2, VerticalPadding: 0.6}))
	}
}

func splitParagraphs(s string) []string {
	var out []string
	for _, p := range strings.Split(strings.ReplaceAll(s, "\r\n", "\n"), "\n\n") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}

// note prints a short remark in place of a missing block.
func (b *builder) note(s string) {
	if s == "" {
		return
	}
	b.add(textAuto(s, props.Text{Size: sizeBody, Style: fontstyle.Italic, Color: &colMuted, Top: 0.5, Bottom: 2}))
}

// table prints a table whose header repeats at the top of every page it
// runs onto.
func (b *builder) table(cols []column, rows []tableRow) { b.tableOpt(cols, rows, false) }

// groupedTable prints a table whose rows come in groups named by the
// first cell of a group's first row: shading alternates by group, and a
// group cut by a page break is named again, "(cont.)", on the new page.
func (b *builder) groupedTable(cols []column, rows []tableRow) { b.tableOpt(cols, rows, true) }

func (b *builder) tableOpt(cols []column, rows []tableRow, grouped bool) {
	if len(rows) == 0 {
		b.note("None.")
		return
	}
	header := b.tableHeader(cols)
	b.ensure(b.headerHeight(cols) + rowTable*float64(min(len(rows), keepRows)) + 1)
	b.add(header)
	zebra, group, onPage := true, "", 0
	for i, r := range rows {
		if grouped {
			if len(r.cells) > 0 && r.cells[0] != "" {
				zebra = !zebra
				group = r.cells[0]
			}
		} else {
			zebra = i%2 == 1
		}
		brk := !b.m.FitlnCurrentPage(b.lineHeight(cols, r))
		if !brk && len(rows)-i == keepRows && onPage >= keepRows {
			// The last lines go over together rather than one alone.
			tail := 0.0
			for _, t := range rows[i:] {
				tail += b.lineHeight(cols, t)
			}
			brk = !b.m.FitlnCurrentPage(tail)
		}
		if brk {
			b.newPage()
			b.add(b.tableHeader(cols))
			onPage = 0
			if grouped && len(r.cells) > 0 && r.cells[0] == "" && group != "" {
				r.cells = append([]string{group + " (cont.)"}, r.cells[1:]...)
			}
		}
		b.add(b.tableLine(cols, r, zebra))
		onPage++
	}
	b.space(2)
}

// keepRows is the fewest table lines printed on a page under the header:
// a table starts on a new page unless its first keepRows lines fit, and
// its last keepRows lines are not split from one another.
const keepRows = 3

// tableHeader prints the column titles, wrapped onto as many lines as the
// longest needs.
func (b *builder) tableHeader(cols []column) core.Row {
	r := row.New(b.headerHeight(cols))
	for _, c := range cols {
		r.Add(textCol(c.span, c.title, b.cellText(c, true, toneNone)).
			WithStyle(&props.Cell{BackgroundColor: &colHeadBG}))
	}
	return r
}

// lineHeight is the height of a table line: one line of text, or more
// when a wrapping column needs them.
func (b *builder) lineHeight(cols []column, tr tableRow) float64 {
	lines := 1
	for j, c := range cols {
		if c.wrap && j < len(tr.cells) {
			lines = max(lines, b.meas.lines(tr.cells[j], b.colWidth(c.span)-2*cellPad, sizeTable, tr.bold))
		}
	}
	return rowTable + float64(lines-1)*sizeTable*25.4/72
}

func (b *builder) headerHeight(cols []column) float64 {
	lines := 1
	for _, c := range cols {
		lines = max(lines, b.meas.lines(c.title, b.colWidth(c.span)-2*cellPad, sizeTable, true))
	}
	return rowHeaderTbl + float64(lines-1)*sizeTable*25.4/72
}

func (b *builder) tableLine(cols []column, tr tableRow, zebra bool) core.Row {
	r := row.New(b.lineHeight(cols, tr))
	for j, c := range cols {
		s := ""
		if j < len(tr.cells) {
			s = tr.cells[j]
		}
		tn := toneNone
		if j < len(tr.tones) {
			tn = tr.tones[j]
		}
		w := b.colWidth(c.span) - 2*cellPad
		bold := tr.bold || tn == toneBad
		// A figure is set smaller rather than cut; words are cut.
		size := sizeTable
		for c.right && size > sizeMinFigure && b.meas.width(s, size, bold) > w {
			size -= 0.5
		}
		if !c.wrap {
			s = b.meas.fit(s, w, size, bold)
		}
		bg := &colWhite
		if zebra {
			bg = &colZebra
		}
		switch tn {
		case toneGood:
			bg = &colGoodBG
		case toneWarn:
			bg = &colWarnBG
		case toneBad:
			bg = &colBadBG
		}
		p := b.cellText(c, tr.bold, tn)
		p.Size = size
		r.Add(textCol(c.span, s, p).WithStyle(&props.Cell{BackgroundColor: bg}))
	}
	return r
}

func (b *builder) cellText(c column, bold bool, tn tone) props.Text {
	p := props.Text{Size: sizeTable, Left: cellPad, Right: cellPad, Top: 0.9, Color: &colInk}
	if c.right {
		p.Align = align.Right
	}
	if bold {
		p.Style = fontstyle.Bold
	}
	switch tn {
	case toneBad:
		p.Color = &colBadInk
		p.Style = fontstyle.Bold
	case toneMuted:
		p.Color = &colMuted
	}
	return p
}

// colWidth is the width in millimetres of span grid columns.
func (b *builder) colWidth(span int) float64 {
	return b.width * float64(span) / gridSize
}

// pair is a label and its figure.
type pair struct{ label, value string }

// pairs prints label-figure pairs, perRow to a line.
func (b *builder) pairs(ps []pair, perRow int) {
	span := gridSize / perRow
	ls := span * 5 / 8
	for i := 0; i < len(ps); i += perRow {
		r := row.New(rowTable + 0.4)
		for j := i; j < i+perRow; j++ {
			if j >= len(ps) {
				r.Add(col.New(span))
				continue
			}
			lw := b.colWidth(ls) - 2*cellPad
			vw := b.colWidth(span-ls) - 2*cellPad
			r.Add(
				textCol(ls, b.meas.fit(ps[j].label, lw, sizeTable, false),
					props.Text{Size: sizeTable, Color: &colMuted, Left: cellPad, Top: 1}),
				textCol(span-ls, b.meas.fit(ps[j].value, vw, sizeTable, true),
					props.Text{Size: sizeTable, Style: fontstyle.Bold, Color: &colInk, Right: cellPad + 2, Top: 1, Align: align.Right}),
			)
		}
		b.add(r)
	}
	b.space(1.5)
}

// chartRow places charts side by side, each of the same width, h
// millimetres high; a nil chart leaves its place empty.
func (b *builder) chartRow(h float64, charts ...*chartJob) {
	b.ensure(h)
	span := gridSize / len(charts)
	r := row.New(h)
	for _, c := range charts {
		if c == nil {
			r.Add(col.New(span))
			continue
		}
		r.Add(col.New(span).Add(&chartImage{job: c, prop: props.Rect{Percent: 100, Center: true}}))
	}
	b.add(r)
	b.space(2)
}

// lateText is a text whose value is known only once every page is laid
// out, such as a page number in the contents. It prints in a row of fixed
// height.
type lateText struct {
	value func() string
	prop  props.Text
	cfg   *entity.Config
}

func (t *lateText) SetConfig(c *entity.Config) { t.cfg = c }

func (t *lateText) GetStructure() *node.Node[core.Structure] {
	return node.New(core.Structure{Type: "late_text"})
}

func (t *lateText) GetHeight(_ core.Provider, cell *entity.Cell) float64 { return cell.Height }

func (t *lateText) Render(provider core.Provider, cell *entity.Cell) {
	c := text.New(enc(t.value()), t.prop)
	c.SetConfig(t.cfg)
	c.Render(provider, cell)
}

// chartImage is the maroto component of a chart drawn in the background.
type chartImage struct {
	job  *chartJob
	prop props.Rect
}

func (c *chartImage) SetConfig(*entity.Config) {}

func (c *chartImage) GetStructure() *node.Node[core.Structure] {
	return node.New(core.Structure{Type: "chart"})
}

// GetHeight is the cell's: chart rows have a fixed height.
func (c *chartImage) GetHeight(_ core.Provider, cell *entity.Cell) float64 { return cell.Height }

func (c *chartImage) Render(provider core.Provider, cell *entity.Cell) {
	png, err := c.job.wait()
	if err != nil {
		return // Render returns the error once the document is generated.
	}
	provider.AddImageFromBytes(png, cell, &c.prop, extension.Png)
}

// Text constructors. maroto converts the text of its core font families
// to the PDF's single-byte encoding on every call, at a cost that
// dominated rendering; the pack's families are spelled so that maroto
// skips that step (the PDF writer matches font names case-insensitively)
// and the conversion is done here, once per string and only when needed.
const (
	familySans = "Helvetica"
	familyMono = "Courier"
)

var (
	cp1252     func(string) string
	cp1252Once sync.Once
)

// enc converts s from UTF-8 to the core fonts' encoding (code page 1252);
// characters outside it become "?". ASCII passes through unchanged.
func enc(s string) string {
	ascii := true
	for i := 0; i < len(s); i++ {
		if s[i] >= 0x80 {
			ascii = false
			break
		}
	}
	if ascii {
		return s
	}
	cp1252Once.Do(func() {
		cp1252 = gofpdf.New("P", "mm", "A4", "").UnicodeTranslatorFromDescriptor("")
	})
	return cp1252(s)
}

func textRow(h float64, s string, p props.Text) core.Row { return text.NewRow(h, enc(s), p) }
func textCol(span int, s string, p props.Text) core.Col  { return text.NewCol(span, enc(s), p) }
func textAuto(s string, p props.Text) core.Row           { return text.NewAutoRow(enc(s), p) }
