package report

import (
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
		var rows []tableRow
		for _, k := range keys {
			rows = append(rows, tableRow{cells: []string{k, m.Parameters[k]}})
		}
		b.table([]column{{"Parameter", 9, false, false}, {"Value", 15, false, true}}, rows)
	}

	b.subheading(b.text(sec, "sources"), 10)
	b.list(m.DataSources)
	return b.err
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
