package report

import (
	"sort"
	"strconv"

	"github.com/johnfercher/maroto/v2/pkg/components/row"
	"github.com/johnfercher/maroto/v2/pkg/props"

	"plumbline/risk/pack"
)

// appendix lists the exclusions, every data-quality finding and the run
// record with its hashes.
func (b *builder) appendix() error {
	const sec = SectionAppendix
	d, m := b.doc, b.meta
	b.heading(b.text(sec, "title"))

	b.subheading(b.text(sec, "excluded"), 10)
	if len(d.Excluded) == 0 {
		b.note(b.text(sec, "no_excluded"))
	} else {
		var rows []tableRow
		for _, e := range d.Excluded {
			rows = append(rows, tableRow{cells: []string{e.ID, tidyText(e.Reason), Pct(e.ValueShare)}})
		}
		b.table([]column{{"Holding", 4, false, false}, {"Reason", 16, false, true}, {"Value share", 4, true, false}}, rows)
	}

	if len(d.Limits) > 0 {
		b.subheading(b.text(sec, "limits"), 10)
		b.table(limitColumns(), b.limitRows(d.Limits))
	}

	b.subheading(b.text(sec, "findings"), 10)
	if len(d.DataQuality) == 0 {
		b.note(b.text(sec, "no_findings"))
	} else {
		fs := append([]pack.Finding(nil), d.DataQuality...)
		sort.SliceStable(fs, func(i, j int) bool { return fs[i].ValueShare > fs[j].ValueShare })
		b.table(findingColumns(true), findingRows(fs, 0))
	}

	b.subheading(b.text(sec, "run"), 40)
	b.paragraphs(b.text(sec, "run_intro"))
	sup := "-"
	if m.Supersedes != nil {
		sup = strconv.FormatInt(*m.Supersedes, 10)
	}
	recs := []pair{
		{"Run", strconv.FormatInt(m.RunID, 10)},
		{"Revision", strconv.Itoa(m.Revision)},
		{"Replaces run", sup},
		{"Computed", m.CreatedAt.UTC().Format("2006-01-02 15:04:05 UTC")},
		{"Program version", m.ProgramVersion},
		{"Results schema", d.Schema},
		{"Portfolio", d.Portfolio.ID},
		{"As of", d.AsOf},
		{"Input hash (SHA-256)", orDash(m.InputHash)},
		{"Configuration hash (SHA-256)", orDash(m.ConfigHash)},
	}
	for _, r := range recs {
		b.add(row.New(rowTable).Add(
			textCol(7, r.label, props.Text{Size: sizeTable, Color: &colMuted, Top: 0.9, Left: cellPad}),
			textCol(17, r.value, props.Text{Size: sizeTable, Family: familyMono, Color: &colInk, Top: 0.9}),
		))
	}
	return b.err
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}
