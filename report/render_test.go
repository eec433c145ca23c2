package report

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
	"sync"
	"testing"
	"testing/fstest"

	"plumbline/risk/pack"
)

// render renders doc with the fixture's run record.
func render(t *testing.T, doc *pack.Document, opt Options) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := Render(&buf, doc, fixtureMeta(), opt); err != nil {
		t.Fatalf("Render: %v", err)
	}
	return buf.Bytes()
}

// pageTokens returns, for every page, the strings drawn on it in drawing
// order, as read back by an independent PDF reader (ledongthuc/pdf),
// which puts each drawn string on its own line.
func pageTokens(t *testing.T, pdf []byte) [][]string {
	t.Helper()
	r, err := newPDFReader(pdf)
	if err != nil {
		t.Fatal(err)
	}
	var pages [][]string
	for i := 1; i <= r.NumPage(); i++ {
		s, err := r.Page(i).GetPlainText(nil)
		if err != nil {
			t.Fatalf("page %d: %v", i, err)
		}
		var toks []string
		for _, l := range strings.Split(s, "\n") {
			if l = strings.TrimSpace(l); l != "" {
				toks = append(toks, l)
			}
		}
		pages = append(pages, toks)
	}
	return pages
}

func index(toks []string, s string) int {
	for i, t := range toks {
		if t == s {
			return i
		}
	}
	return -1
}

// after returns the n strings drawn after the first one equal to label.
func after(toks []string, label string, n int) []string {
	i := index(toks, label)
	if i < 0 || i+n >= len(toks) {
		return nil
	}
	return toks[i+1 : i+1+n]
}

// The summary page prints every headline figure exactly as the exported
// formatting functions print the stored value, in the row of its label.
func TestRenderHeadlineFigures(t *testing.T) {
	doc := fixtureDoc(20)
	pages := pageTokens(t, render(t, doc, Options{}))
	sum := pages[1]
	s := doc.Summary
	r := s.Returns
	v, e := headlineVaR(doc), headlineES(doc)
	var md pack.DriftItem
	for _, it := range doc.Drift {
		if it.Metric == pack.MetricDurModified {
			md = it
		}
	}
	tests := []struct {
		label string
		want  []string
	}{
		{"Market value (incl. cash)", []string{Money(s.Value, "USD")}},
		{"Cash", []string{Money(s.Cash, "USD")}},
		{"Return, week", []string{Pct(*r.Week)}},
		{"Return, month to date", []string{Pct(*r.MonthToDate)}},
		{"Return, quarter to date", []string{Pct(*r.QuarterToDate)}},
		{"Return, year to date", []string{Pct(*r.YearToDate)}},
		{"Return since inception (2022-01-03)", []string{Pct(*r.SinceInception)}},
		{"annualised", []string{Pct(*r.SinceInceptionAnn)}},
		{"Volatility 21-day (ann.)", []string{Pct(*s.Volatility[0].Discrete)}},
		{"Volatility 63-day (ann.)", []string{Pct(*s.Volatility[1].Discrete)}},
		{"Volatility 252-day (ann.)", []string{Pct(*s.Volatility[2].Discrete)}},
		{"EWMA volatility (ann.)", []string{Pct(*s.EWMAVolatility)}},
		{"VaR 99%, 1 day (historical)", []string{Pct(v.VaR) + " (" + Money(v.VaRAmount, "USD") + ")"}},
		{"ES 97.5%, 1 day (historical)", []string{Pct(e.ES) + " (" + Money(e.ESAmount, "USD") + ")"}},
		{"Modified duration (model)", []string{Years(*s.ModifiedDuration), Years(*md.Previous), YearsSigned(*md.Change)}},
		{"Empirical duration (regression)", []string{Years(s.Empirical.Value) + " (s.e. " + Years(s.Empirical.StdErr) + ")"}},
		{"Convexity", []string{Convexity(*s.Convexity)}},
		{"Growth duration", []string{Years(*s.GrowthDuration)}},
		{"Beta (CAPM)", []string{Num(*s.Beta, 2)}},
		{"Tracking error (ann.)", []string{Pct(*s.TrackingError)}},
		{"Maximum drawdown since inception", []string{Pct(*s.MaxDrawdown)}},
	}
	for _, tt := range tests {
		got := after(sum, tt.label, len(tt.want))
		if fmt.Sprint(got) != fmt.Sprint(tt.want) {
			t.Errorf("row %q: got %q, want %q", tt.label, got, tt.want)
		}
	}
	// The breach and the warning of the fixture are on the summary.
	for _, l := range doc.Limits {
		if i := index(sum, l.Name); i < 0 {
			t.Errorf("limit %q missing from the summary", l.Name)
		}
	}
	if index(sum, "BREACH") < 0 || index(sum, "Warning") < 0 {
		t.Errorf("summary lacks the breach or the warning: %q", sum)
	}
}

// The cover names firm, portfolio, date, run and version; the summary is
// one page: the next page starts the holdings section.
func TestRenderCoverAndOnePageSummary(t *testing.T) {
	doc := fixtureDoc(20)
	for _, paper := range []string{PaperA4, PaperLetter} {
		pages := pageTokens(t, render(t, doc, Options{Paper: paper}))
		cover := strings.Join(pages[0], "\n")
		for _, want := range []string{"Quillfeather Asset Partners", "Meridian Income", "As of 2025-06-13", "42", "0.4.0"} {
			if !strings.Contains(cover, want) {
				t.Errorf("%s: cover lacks %q", paper, want)
			}
		}
		if pages[1][0] != "Summary for the committee" {
			t.Errorf("%s: page 2 starts with %q", paper, pages[1][0])
		}
		if index(pages[1], "Model estimates, not investment advice. Assumptions drive the results; see Methodology and Cautions.") < 0 {
			t.Errorf("%s: the summary's last line is not on page 2", paper)
		}
		if pages[2][0] != "Holdings and concentration" {
			t.Errorf("%s: page 3 starts with %q", paper, pages[2][0])
		}
	}
}

// Every page carries the run and "page i of n", n being the number of
// pages the PDF's own page tree counts.
func TestRenderPageNumbers(t *testing.T) {
	pdf := render(t, fixtureDoc(20), Options{})
	n, err := PageCount(pdf)
	if err != nil {
		t.Fatal(err)
	}
	pages := pageTokens(t, pdf)
	if len(pages) != n || n < 12 {
		t.Fatalf("PageCount %d, pages read %d; want the same, at least 12 (one per section plus continuations)", n, len(pages))
	}
	for i, p := range pages {
		want := fmt.Sprintf("Run 42 rev. 2 - page %d of %d", i+1, n)
		if index(p, want) < 0 {
			t.Errorf("page %d lacks %q", i+1, want)
		}
	}
}

// Rendering the same run twice, also concurrently, gives the same bytes,
// and the PDF's dates are the run's, in the PDF date form D:YYYYMMDDHHmmSS
// (ISO 32000-1:2008, 7.9.4 "Dates", from memory).
func TestRenderByteIdentical(t *testing.T) {
	doc, meta := fixtureDoc(20), fixtureMeta()
	const n = 3
	out := make([][]byte, n)
	var wg sync.WaitGroup
	for i := range out {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var buf bytes.Buffer
			if err := Render(&buf, doc, meta, Options{}); err != nil {
				t.Error(err)
			}
			out[i] = buf.Bytes()
		}()
	}
	wg.Wait()
	for i := 1; i < n; i++ {
		if !bytes.Equal(out[0], out[i]) {
			t.Fatalf("render %d differs from render 0 (%d vs %d bytes)", i, len(out[i]), len(out[0]))
		}
	}
	for _, key := range []string{"/CreationDate (D:20250614063012)", "/ModDate (D:20250614063012)"} {
		if !bytes.Contains(out[0], []byte(key)) {
			t.Errorf("PDF lacks %s", key)
		}
	}
	// A later render of the same run, with nothing shared but the data.
	again := render(t, fixtureDoc(20), Options{})
	if !bytes.Equal(out[0], again) {
		t.Error("a fresh render of the same run differs")
	}
}

// Page sizes: A4 is 210 x 297 mm (ISO 216), 595.28 x 841.89 pt at
// 72 pt per inch; US Letter is 8.5 x 11 in (ANSI/ASME Y14.1), 612 x 792 pt.
func TestRenderPaper(t *testing.T) {
	for _, tt := range []struct{ paper, box string }{
		{PaperA4, "/MediaBox [0 0 595.28 841.89]"},
		{"", "/MediaBox [0 0 595.28 841.89]"},
		{PaperLetter, "/MediaBox [0 0 612.00 792.00]"},
	} {
		pdf := render(t, fixtureDoc(20), Options{Paper: tt.paper, Sections: []string{SectionCover}})
		if !bytes.Contains(pdf, []byte(tt.box)) {
			t.Errorf("paper %q: no %s", tt.paper, tt.box)
		}
	}
}

// A 200-holding book: the full holdings list runs over several pages,
// each with the column titles again, and no holding is lost at a break.
func TestRender200Holdings(t *testing.T) {
	doc := fixtureDoc(200)
	pages := pageTokens(t, render(t, doc, Options{Paper: PaperLetter}))
	seen := map[string]bool{}
	listPages := 0
	for _, p := range pages {
		h := index(p, "Price date")
		if h < 0 {
			continue
		}
		listPages++
		for _, title := range []string{"ID", "Name", "Sector", "Quantity", "Weight", "Model"} {
			if index(p, title) < 0 {
				t.Errorf("a page of the holdings list lacks the column %q", title)
			}
		}
		for _, tok := range p[h:] {
			seen[tok] = true
		}
	}
	// About 50 lines fit on a page: 200 holdings need at least 4 pages.
	if listPages < 4 {
		t.Errorf("holdings list on %d pages, want at least 4", listPages)
	}
	for _, h := range doc.Holdings {
		if !seen[h.ID] {
			t.Errorf("holding %s missing from the holdings list", h.ID)
		}
	}
}

// Absent figures print n/a, never zero, and missing blocks print a note.
func TestRenderMissingFigures(t *testing.T) {
	doc := fixtureDoc(20)
	doc.Summary.Returns.QuarterToDate = nil
	doc.Summary.Convexity = nil
	doc.Summary.Empirical = nil
	doc.Curve = nil
	doc.Backtest = nil
	doc.Explain = nil
	doc.History = nil
	doc.Limits = nil
	doc.VaR = nil
	doc.DataQuality = nil
	pages := pageTokens(t, render(t, doc, Options{}))
	sum := pages[1]
	for _, label := range []string{"Return, quarter to date", "Convexity", "Empirical duration (regression)", "VaR 99%, 1 day", "ES 97.5%, 1 day"} {
		if got := after(sum, label, 1); len(got) != 1 || got[0] != NA {
			t.Errorf("row %q: got %q, want %q", label, got, NA)
		}
	}
	all := strings.Join(func() []string {
		var s []string
		for _, p := range pages {
			s = append(s, p...)
		}
		return s
	}(), "\n")
	for _, note := range []string{
		"No limits are configured for this portfolio.",
		"No data-quality findings for this run.",
		"No yield curve was fitted for this run, so level, slope and curvature durations are not available.",
		"No backtest is available for this run (too little history).",
		"No VaR figures were computed for this run.",
		"This is the first stored run of the portfolio, so there is no history to show yet.",
	} {
		if !strings.Contains(all, note) {
			t.Errorf("missing note %q", note)
		}
	}
}

// Options.Sections chooses and orders the sections.
func TestRenderSections(t *testing.T) {
	pdf := render(t, fixtureDoc(20), Options{Sections: []string{SectionCautions, SectionSummary}})
	pages := pageTokens(t, pdf)
	if len(pages) != 2 {
		t.Fatalf("%d pages, want 2", len(pages))
	}
	if pages[0][0] != "Cautions" || pages[1][0] != "Summary for the committee" {
		t.Errorf("pages start with %q and %q", pages[0][0], pages[1][0])
	}
}

// An override folder replaces the files it has; the others fall back to
// the shipped texts.
func TestRenderTextsOverride(t *testing.T) {
	over := fstest.MapFS{
		"sections.txt":  {Data: []byte("# ours\ncautions\nsummary\n")},
		"cautions.tmpl": {Data: []byte(`{{define "title"}}Before you read{{end}}{{define "body"}}Figures for {{.Doc.Portfolio.Name}} are estimates.{{end}}`)},
	}
	pages := pageTokens(t, render(t, fixtureDoc(20), Options{Texts: over}))
	if len(pages) != 2 {
		t.Fatalf("%d pages, want 2 (sections.txt of the override)", len(pages))
	}
	if pages[0][0] != "Before you read" || index(pages[0], "Figures for Meridian Income are estimates.") < 0 {
		t.Errorf("override not used: %q", pages[0])
	}
	if pages[1][0] != "Summary for the committee" {
		t.Errorf("summary.tmpl did not fall back to the shipped one: %q", pages[1][0])
	}
}

func TestRenderErrors(t *testing.T) {
	bad := fixtureDoc(20)
	bad.Schema = "plumbline.pack/99"
	broken := fstest.MapFS{"summary.tmpl": {Data: []byte(`{{define "title"}}{{.Nope}}{{end}}`)}}
	tests := []struct {
		name string
		doc  *pack.Document
		opt  Options
		want error
	}{
		{"nil document", nil, Options{}, ErrDocument},
		{"unknown schema", bad, Options{}, ErrDocument},
		{"paper", fixtureDoc(20), Options{Paper: "A3"}, ErrPaper},
		{"unknown section", fixtureDoc(20), Options{Sections: []string{"charts"}}, ErrSection},
		{"repeated section", fixtureDoc(20), Options{Sections: []string{"summary", "summary"}}, ErrSection},
		{"empty section list", fixtureDoc(20), Options{Sections: []string{}}, ErrSection},
		{"template field", fixtureDoc(20), Options{Texts: broken, Sections: []string{"summary"}}, ErrTemplate},
	}
	for _, tt := range tests {
		var buf bytes.Buffer
		err := Render(&buf, tt.doc, fixtureMeta(), tt.opt)
		if !errors.Is(err, tt.want) {
			t.Errorf("%s: err = %v, want %v", tt.name, err, tt.want)
		}
	}
}

// With more limits than the summary has room for, breaches and warnings
// stay on the summary, the rest is counted, and the appendix lists all.
func TestRenderManyLimits(t *testing.T) {
	doc := fixtureDoc(20)
	for i := 0; i < 10; i++ {
		doc.Limits = append(doc.Limits, pack.LimitStatus{Name: fmt.Sprintf("Extra cap %d", i), Metric: "cash_weight",
			Value: f64(0.02), Level: f64(0.5), Headroom: f64(0.48), Status: "ok"})
	}
	// 16 limits: 1 breach, 1 warning, 1 without data, 13 met; the summary
	// shows 11 and counts the last 5, all met.
	pages := pageTokens(t, render(t, doc, Options{Sections: []string{SectionSummary, SectionAppendix}}))
	sum := pages[0]
	for _, name := range []string{"Daily VaR budget", "Sector cap", "Tracking error ceiling"} {
		if index(sum, name) < 0 {
			t.Errorf("summary lacks %q", name)
		}
	}
	if index(sum, "5 more limits (5 ok) are listed in the appendix.") < 0 {
		t.Errorf("summary lacks the count of the other limits: %q", sum)
	}
	var app []string
	for _, p := range pages[1:] {
		app = append(app, p...)
	}
	for _, l := range doc.Limits {
		if index(app, l.Name) < 0 {
			t.Errorf("appendix lacks limit %q", l.Name)
		}
	}
}

// The contents give each section's first page: the page whose first
// string is the section's title, as the independent PDF reader sees it.
func TestRenderContentsPages(t *testing.T) {
	for _, n := range []int{20, 200} {
		pages := pageTokens(t, render(t, fixtureDoc(n), Options{}))
		cover := pages[0]
		found := 0
		for i, tok := range cover {
			num, ok := strings.CutPrefix(tok, "page ")
			if !ok || i == 0 {
				continue
			}
			var p int
			if _, err := fmt.Sscan(num, &p); err != nil || p < 2 || p > len(pages) {
				t.Errorf("%d holdings: contents entry %q: no such page", n, tok)
				continue
			}
			found++
			if title := cover[i-1]; pages[p-1][0] != title {
				t.Errorf("%d holdings: contents say %q starts on page %d, which starts with %q", n, title, p, pages[p-1][0])
			}
		}
		if want := len(SectionNames()) - 1; found != want {
			t.Errorf("%d holdings: %d contents entries with a page, want %d", n, found, want)
		}
	}
}
