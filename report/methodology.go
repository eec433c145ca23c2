package report

import (
	"fmt"
	"regexp"
	"slices"
	"strings"
)

// methodology prints the recorded models, parameters and data sources of
// the run, after the general conventions of the texts.
func (b *builder) methodology() error {
	const sec = SectionMethodology
	m := b.doc.Methodology
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "body"))

	b.subheading(b.text(sec, "models"), 10)
	b.list(m.Models)

	b.subheading(b.text(sec, "parameters"), 15)
	if len(m.Parameters) == 0 {
		b.note("None recorded.")
	} else {
		keys := make([]string, 0, len(m.Parameters))
		for k := range m.Parameters {
			keys = append(keys, k)
		}
		slices.Sort(keys)
		// Short values two to a line, long lists on lines of their own.
		short := []column{{"Parameter", 6, false, false}, {"Value", 6, false, false}, {"Parameter", 6, false, false}, {"Value", 6, false, false}}
		long := []column{{"Parameter", 6, false, false}, {"Value", 18, false, true}}
		var ks, kl []string
		for _, k := range keys {
			if b.meas.width(paramValue(m.Parameters[k]), sizeTable, false) <= b.colWidth(short[1].span)-2*cellPad {
				ks = append(ks, k)
			} else {
				kl = append(kl, k)
			}
		}
		var rows []tableRow
		half := (len(ks) + 1) / 2
		for i := range half {
			r := tableRow{cells: []string{ks[i], paramValue(m.Parameters[ks[i]])}}
			if j := i + half; j < len(ks) {
				r.cells = append(r.cells, ks[j], paramValue(m.Parameters[ks[j]]))
			}
			rows = append(rows, r)
		}
		if len(rows) > 0 {
			b.table(short, rows)
		}
		rows = nil
		for _, k := range kl {
			rows = append(rows, tableRow{cells: []string{k, paramValue(m.Parameters[k])}})
		}
		if len(rows) > 0 {
			b.table(long, rows)
		}
	}

	b.subheading(b.text(sec, "sources"), 10)
	b.list(sourceLines(m.DataSources))
	return b.err
}

// paramValue prints a parameter's value, "none" for an empty one.
func paramValue(v string) string {
	if strings.TrimSpace(v) == "" {
		return "none"
	}
	return v
}

// isoDate matches a date in a file name.
var isoDate = regexp.MustCompile(`\d{4}-\d{2}-\d{2}`)

// sourceLines lists the data sources. Files whose names differ only by
// one date (a weekly holdings file, say) make one line when there are
// more than three of them, with their number and first and last dates.
func sourceLines(src []string) []string {
	const fold = 3
	var keys []string
	byKey := map[string][]string{}
	dates := map[string][]string{}
	for _, s := range src {
		key := s
		if ds := isoDate.FindAllString(s, -1); len(ds) == 1 {
			key = isoDate.ReplaceAllLiteralString(s, "YYYY-MM-DD")
			dates[key] = append(dates[key], ds[0])
		}
		if _, ok := byKey[key]; !ok {
			keys = append(keys, key)
		}
		byKey[key] = append(byKey[key], s)
	}
	var out []string
	for _, k := range keys {
		ds := dates[k]
		if len(byKey[k]) <= fold || len(ds) != len(byKey[k]) {
			out = append(out, byKey[k]...)
			continue
		}
		out = append(out, fmt.Sprintf("%s: %d files dated %s to %s", k, len(ds), slices.Min(ds), slices.Max(ds)))
	}
	return out
}

// list prints items as a list, or a note when there are none.
func (b *builder) list(items []string) {
	if len(items) == 0 {
		b.note("None recorded.")
		return
	}
	var ls []string
	for _, it := range items {
		ls = append(ls, "- "+strings.ReplaceAll(it, "\n", " "))
	}
	b.paragraphs(strings.Join(ls, "\n"))
}

// cautions prints what the figures are not.
func (b *builder) cautions() error {
	const sec = SectionCautions
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "body"))
	return b.err
}
