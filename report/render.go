package report

import (
	"fmt"
	"io"
	"io/fs"
	"regexp"
	"sync"
	"time"

	"github.com/johnfercher/maroto/v2"
	"github.com/johnfercher/maroto/v2/pkg/components/line"
	"github.com/johnfercher/maroto/v2/pkg/config"
	"github.com/johnfercher/maroto/v2/pkg/consts/pagesize"
	"github.com/johnfercher/maroto/v2/pkg/core"
	"github.com/johnfercher/maroto/v2/pkg/props"
	"github.com/phpdave11/gofpdf"

	"plumbline/risk/pack"
)

// Meta identifies the stored run a pack is rendered from. Every field is
// read from the run's record, never from the clock or the current
// configuration, so re-rendering a run gives the same file.
type Meta struct {
	RunID int64
	// Revision counts the computations of the same portfolio and as-of
	// date, from 1; Supersedes is the run a revision replaces.
	Revision   int
	Supersedes *int64
	// CreatedAt is when the run was computed; it is the PDF's creation
	// and modification date.
	CreatedAt      time.Time
	ProgramVersion string
	// ConfigHash and InputHash are the hex SHA-256 of the run's canonical
	// configuration and of its inputs.
	ConfigHash string
	InputHash  string
	// Firm is the name printed on the cover and in the footer.
	Firm string
}

// Options sets the paper, the texts and the sections of a pack.
type Options struct {
	// Paper is "A4" (also when empty) or "Letter".
	Paper string
	// Texts overrides the embedded texts file by file (an os.DirFS of the
	// configured template_dir); nil uses the embedded defaults.
	Texts fs.FS
	// Sections lists the sections in print order; nil takes the list of
	// the texts' sections.txt.
	Sections []string
}

// Paper sizes accepted by Options.Paper and the configuration.
const (
	PaperA4     = "A4"
	PaperLetter = "Letter"
)

// builder holds the state of one rendering.
type builder struct {
	m      core.Maroto
	doc    *pack.Document
	meta   Meta
	tx     *texts
	ccy    string
	width  float64 // content width, mm
	meas   *measurer
	charts int           // charts started so far, see png
	jobs   []*chartJob   // every chart started
	sem    chan struct{} // bounds the charts drawn at once
	err    error         // first text error of the section being built
	order  []string
	pageOf map[string]int // first page of each section, 0 if unknown
}

// fpdfSetup makes the PDF writer list fonts and images in a fixed order
// rather than in map order (a process-wide switch of the writer that only
// this package uses).
var fpdfSetup sync.Once

// Render writes the PDF pack of doc to w. It reads nothing but doc, meta
// and opt, so the same stored run renders to the same bytes.
func Render(w io.Writer, doc *pack.Document, meta Meta, opt Options) error {
	if doc == nil {
		return fmt.Errorf("report: nil document: %w", ErrDocument)
	}
	if doc.Schema != pack.SchemaVersion {
		return fmt.Errorf("report: document schema %q, want %q: %w", doc.Schema, pack.SchemaVersion, ErrDocument)
	}
	size, err := paperSize(opt.Paper)
	if err != nil {
		return err
	}
	fsys := textsFS(opt.Texts)
	sections := opt.Sections
	if sections == nil {
		if sections, err = readSections(fsys); err != nil {
			return err
		}
	} else if err := CheckSections(sections); err != nil {
		return err
	}
	data, err := textData(doc, meta, fsys)
	if err != nil {
		return err
	}
	fpdfSetup.Do(func() { gofpdf.SetDefaultCatalogSort(true) })

	b := &builder{doc: doc, meta: meta, ccy: doc.BaseCurrency, meas: newMeasurer(), order: sections}
	b.tx = newTexts(fsys, data)
	pw, _ := pagesize.GetDimensions(size)
	b.width = pw - 2*marginSide

	title := fmt.Sprintf("Risk pack - %s - %s", doc.Portfolio.Name, doc.AsOf)
	pages, err := b.tx.get(fileFooter, "pages")
	if err != nil {
		return err
	}
	created := meta.CreatedAt.UTC()
	cfg := config.NewBuilder().
		WithPageSize(size).
		WithLeftMargin(marginSide).
		WithRightMargin(marginSide).
		WithTopMargin(marginTop).
		WithBottomMargin(marginBottom).
		WithMaxGridSize(gridSize).
		WithSequentialMode().
		WithCompression(true).
		WithDefaultFont(&props.Font{Family: familySans, Size: sizeBody, Color: &colInk}).
		WithPageNumber(props.PageNumber{Pattern: enc(pages), Place: props.RightBottom, Size: sizeSmall, Color: &colMuted}).
		WithCreationDate(created).
		WithTitle(title, true).
		WithAuthor(meta.Firm, true).
		WithSubject(fmt.Sprintf("Run %d, revision %d", meta.RunID, meta.Revision), true).
		WithCreator("Plumbline "+meta.ProgramVersion, true).
		Build()
	b.m = maroto.New(cfg)

	left, err := b.tx.get(fileFooter, "left")
	if err != nil {
		return err
	}
	if err := b.m.RegisterFooter(
		line.NewRow(1, props.Line{Color: &colRule, Thickness: 0.2, SizePercent: 100}),
		textRow(3, left, props.Text{Size: sizeSmall, Color: &colMuted, Top: 3}),
	); err != nil {
		return fmt.Errorf("report: footer: %w", err)
	}

	b.pageOf = map[string]int{}
	for i, s := range sections {
		b.pageOf[s] = 1
		if i > 0 {
			b.pageOf[s] = b.sectionPage()
		}
		if err := b.section(s); err != nil {
			return fmt.Errorf("report: section %s: %w", s, err)
		}
	}
	out, err := b.m.Generate()
	if err != nil {
		return fmt.Errorf("report: generate: %w", err)
	}
	for _, j := range b.jobs {
		if _, err := j.wait(); err != nil {
			return err
		}
	}
	pdf := pinModDate(out.GetBytes(), created)
	_, err = w.Write(pdf)
	return err
}

func paperSize(p string) (pagesize.Type, error) {
	switch p {
	case "", PaperA4:
		return pagesize.A4, nil
	case PaperLetter:
		return pagesize.Letter, nil
	}
	return "", fmt.Errorf("report: paper %q (want %q or %q): %w", p, PaperA4, PaperLetter, ErrPaper)
}

func (b *builder) section(name string) error {
	switch name {
	case SectionCover:
		return b.cover()
	case SectionSummary:
		return b.summary()
	case SectionHoldings:
		return b.holdings()
	case SectionSensitivity:
		return b.sensitivity()
	case SectionReturns:
		return b.returns()
	case SectionVaR:
		return b.varSection()
	case SectionStress:
		return b.stress()
	case SectionHistory:
		return b.history()
	case SectionMethodology:
		return b.methodology()
	case SectionCautions:
		return b.cautions()
	case SectionAppendix:
		return b.appendix()
	}
	return fmt.Errorf("report: unknown section %q: %w", name, ErrSection)
}

// text returns a define of the section's template; errors are kept and
// returned by the section at its end, so a section reads like its page.
func (b *builder) text(sec, name string) string {
	s, err := b.tx.section(sec, name)
	if err != nil && b.err == nil {
		b.err = err
	}
	return s
}

// modDate matches the writer's modification date, which it takes from the
// clock: the file's only time-dependent bytes once the creation date is set.
var modDate = regexp.MustCompile(`/ModDate \(D:\d{14}\)`)

// pinModDate sets the modification date to t. The replacement has the
// same length, so the cross-reference offsets stay valid.
func pinModDate(pdf []byte, t time.Time) []byte {
	repl := []byte("/ModDate (D:" + t.UTC().Format("20060102150405") + ")")
	return modDate.ReplaceAllLiteral(pdf, repl)
}

// PageCount returns the number of pages of a PDF.
func PageCount(pdf []byte) (int, error) {
	r, err := newPDFReader(pdf)
	if err != nil {
		return 0, err
	}
	return r.NumPage(), nil
}
