package report

import (
	"sort"
	"strconv"

	"plumbline/risk/pack"
)

const topHoldings = 10

// holdings prints concentration, sectors, the largest positions and the
// full list of holdings.
func (b *builder) holdings() error {
	const sec = SectionHoldings
	d := b.doc
	c := d.Concentration
	b.heading(b.text(sec, "title"))
	b.paragraphs(b.text(sec, "intro"))

	b.pairs([]pair{
		{"Concentration index (HHI)", Num(c.HHI, 4)},
		{"Effective number of names", Num(c.EffectiveN, 1)},
		{"Top five weight", Pct(c.Top5Weight)},
		{"Largest name", c.MaxSingleID + " " + Pct(c.MaxSingleName)},
		{"Largest sector", Pct(c.MaxSector)},
		{"Cash weight", Pct(c.CashWeight)},
		{"Market value", Money(d.Summary.Value, b.ccy)},
		{"Securities held", strconv.Itoa(d.Summary.HoldingCount)},
		{"Largest sector name", c.MaxSectorName},
	}, 3)

	if len(d.Holdings) == 0 {
		b.note(b.text(sec, "no_holdings"))
		return b.err
	}

	b.subheading(b.text(sec, "sectors"), 15)
	var rows []tableRow
	for _, s := range d.Sectors {
		rows = append(rows, tableRow{cells: []string{
			s.Name, Pct(s.Weight), Num(s.Value, 0),
			Opt(s.ContribDuration, num2), Opt(s.ContribGrowthDuration, num2),
		}})
	}
	b.table([]column{
		{"Sector", 8, false, false}, {"Weight", 3, true, false}, {"Value (" + b.ccy + ")", 5, true, false},
		{"Contrib. to duration (yrs)", 4, true, false}, {"Contrib. to growth dur. (yrs)", 4, true, false},
	}, rows)

	hs := append([]pack.Holding(nil), d.Holdings...)
	sort.SliceStable(hs, func(i, j int) bool { return hs[i].Weight > hs[j].Weight })
	b.subheading(b.text(sec, "top"), 20)
	rows = nil
	for i, h := range hs {
		if i >= topHoldings {
			break
		}
		rows = append(rows, tableRow{cells: []string{
			strconv.Itoa(i + 1), h.ID, h.Name, h.Sector, Num(h.Value, 0), Pct(h.Weight),
		}})
	}
	b.table([]column{
		{"#", 1, true, false}, {"ID", 3, false, false}, {"Name", 8, false, false}, {"Sector", 5, false, false},
		{"Value (" + b.ccy + ")", 4, true, false}, {"Weight", 3, true, false},
	}, rows)

	sort.SliceStable(hs, func(i, j int) bool { return hs[i].ID < hs[j].ID })
	b.subheading(b.text(sec, "all"), 20)
	rows = nil
	for _, h := range hs {
		rows = append(rows, tableRow{cells: []string{
			h.ID, h.Name, h.Sector, Num(h.Quantity, 0), Num(h.Price, 2), h.PriceDate,
			Num(h.Value, 0), Pct(h.Weight), modelLabel(h.Model),
		}})
	}
	b.table([]column{
		{"ID", 2, false, false}, {"Name", 5, false, false}, {"Sector", 4, false, false}, {"Quantity", 2, true, false},
		{"Price (" + b.ccy + ")", 2, true, false}, {"Price date", 3, true, false}, {"Value (" + b.ccy + ")", 2, true, false},
		{"Weight", 2, true, false}, {"Model", 2, false, false},
	}, rows)
	return b.err
}

func num2(x float64) string { return Num(x, 2) }
func num1(x float64) string { return Num(x, 1) }

// modelLabel shortens a valuation model name for a table cell.
func modelLabel(m string) string {
	switch m {
	case "constant_growth":
		return "Const. gr."
	case "multi_stage":
		return "Multi-stage"
	case "term_structure":
		return "Term str."
	case "":
		return "excluded"
	}
	return m
}
