package demo

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"
)

// Generate writes the fictional scenario chosen by opt into dir (created if
// needed) and describes what it wrote. Files:
//
//	portfolios.csv securities.csv assumptions.csv prices.csv yields.csv
//	premiums.csv flows.csv holdings/holdings-YYYY-MM-DD.csv
//
// one holdings file per weekly snapshot date, holding the three portfolios'
// snapshots. Existing files of these names are overwritten, and stray
// holdings-*.csv files in dir/holdings are removed. The same opt always
// gives byte-identical files.
func Generate(dir string, opt Options) (*Summary, error) {
	o, err := opt.resolved()
	if err != nil {
		return nil, err
	}
	if err := os.MkdirAll(filepath.Join(dir, holdingsDir), 0o755); err != nil {
		return nil, fmt.Errorf("demo: %w", err)
	}
	if err := removeOldHoldings(filepath.Join(dir, holdingsDir)); err != nil {
		return nil, err
	}
	sc := build(o)
	sum := sc.summary(dir)
	c := &sum.Counts
	for _, f := range []struct {
		rel    string
		header []string
		fill   func(emit func(...string))
		count  *int
	}{
		{"portfolios.csv", headerPortfolios, sc.fillPortfolios, &c.Portfolios},
		{"securities.csv", headerSecurities, sc.fillSecurities, &c.Securities},
		{"assumptions.csv", headerAssumptions, sc.fillAssumptions, &c.AssumptionRows},
		{"prices.csv", headerPrices, sc.fillPrices, &c.PriceRows},
		{"yields.csv", headerYields, sc.fillYields, &c.YieldRows},
		{"premiums.csv", headerPremiums, sc.fillPremiums, &c.PremiumRows},
		{"flows.csv", headerFlows, sc.fillFlows, &c.Flows},
	} {
		if *f.count, err = writeCSV(dir, f.rel, f.header, f.fill); err != nil {
			return nil, err
		}
		sum.Files = append(sum.Files, f.rel)
	}
	for i := 0; i < len(sc.snapshots); {
		day := sc.snapshots[i].day
		j := i
		for j < len(sc.snapshots) && sc.snapshots[j].day == day {
			j++
		}
		rel := holdingsDir + "/" + holdingsPrefix + fmtDate(sc, day) + ".csv"
		rows, err := writeCSV(dir, rel, headerHoldings, func(emit func(...string)) { sc.fillHoldings(sc.snapshots[i:j], emit) })
		if err != nil {
			return nil, err
		}
		sum.Files = append(sum.Files, rel)
		c.SnapshotFiles++
		c.Snapshots += j - i
		c.HoldingRows += rows
		i = j
	}
	sort.Strings(sum.Files)
	for k := range universe {
		for t := range sc.cal.n() {
			if sc.actions.div[k][t] != 0 {
				c.Dividends++
			}
			if sc.actions.split[k][t] != 1 {
				c.Splits++
			}
		}
	}
	c.AssumptionChanges = c.AssumptionRows - len(universe)
	return sum, nil
}

func (sc *scenario) summary(dir string) *Summary {
	n := sc.cal.n()
	s := &Summary{
		Dir: dir, Firm: Firm, BaseCurrency: sc.opt.BaseCurrency, Seed: sc.opt.Seed,
		Start: sc.cal.days[0], Inception: sc.cal.days[sc.cal.snapshotDays()[0]], End: sc.cal.days[n-1],
	}
	for _, p := range portfolioDefs {
		s.Portfolios = append(s.Portfolios, Portfolio{ID: p.id, Name: p.name, Strategy: p.strategy, BenchmarkMethod: p.method})
	}
	s.Findings = []Finding{
		{
			Kind: FindingKLeG, SecurityID: kLeGSecurity, Portfolio: "GROWTH", Date: sc.cal.days[sc.kLeGDay],
			Note: fmt.Sprintf("assumptions from this date set discount_rate %s below growth %s, so k <= g",
				fmtDec(kLeGDiscount), fmtDec(kLeGGrowth)),
		},
		{
			Kind: FindingStalePrice, SecurityID: staleSecurity, Portfolio: "INCOME", Date: sc.cal.days[n-1],
			Note: "prices.csv has no close on this snapshot date; the holdings file carries the previous close",
		},
	}
	return s
}

func (sc *scenario) fillPortfolios(emit func(...string)) {
	inception := fmtDate(sc, sc.cal.snapshotDays()[0])
	for _, p := range portfolioDefs {
		emit(p.id, p.name, p.strategy, inception, p.method)
	}
}

func (sc *scenario) fillSecurities(emit func(...string)) {
	for _, k := range sc.pr.idOrder {
		s := universe[k]
		emit(s.id, s.name, s.sector, sc.opt.BaseCurrency, strconv.FormatInt(int64(s.sharesM*1e6), 10))
	}
}

func (sc *scenario) fillAssumptions(emit func(...string)) {
	rows := make([]assumption, len(sc.assumptions))
	copy(rows, sc.assumptions)
	sort.SliceStable(rows, func(i, j int) bool {
		a, b := universe[rows[i].sec].id, universe[rows[j].sec].id
		if a != b {
			return a < b
		}
		return rows[i].day < rows[j].day
	})
	for _, a := range rows {
		beta, k := "", ""
		if a.hasBeta {
			beta = fmtFixed(a.beta, 2)
		}
		if a.discount != 0 {
			k = fmtDec(a.discount)
		}
		emit(universe[a.sec].id, fmtDate(sc, a.day), fmtFixed(a.d0, 4), strconv.Itoa(a.freq),
			fmtDec(a.growth), beta, k, a.stages)
	}
}

func (sc *scenario) fillPrices(emit func(...string)) {
	for t := range sc.cal.n() {
		date := fmtDate(sc, t)
		for _, k := range sc.pr.idOrder {
			if !sc.hasClose(k, t) {
				continue // the planted missing price: see Findings
			}
			div, split := "", ""
			if d := sc.actions.div[k][t]; d != 0 {
				div = fmtFixed(d, 4)
			}
			if r := sc.actions.split[k][t]; r != 1 {
				split = fmtDec(r)
			}
			emit(date, universe[k].id, fmtFixed(sc.closes[k][t], 2), div, split)
		}
	}
}

func (sc *scenario) fillYields(emit func(...string)) {
	for t, row := range sc.rates.yields {
		date := fmtDate(sc, t)
		for j, mo := range tenorsMonths {
			emit(date, strconv.Itoa(mo), fmtFixed(row[j], 6))
		}
	}
}

func (sc *scenario) fillPremiums(emit func(...string)) {
	for t, e := range sc.rates.erp {
		emit(fmtDate(sc, t), fmtFixed(e, 5))
	}
}

func (sc *scenario) fillFlows(emit func(...string)) {
	for _, f := range sc.flows {
		emit(fmtDate(sc, f.day), portfolioDefs[f.port].id, fmtCents(f.cents))
	}
}

func (sc *scenario) fillHoldings(snaps []snapshot, emit func(...string)) {
	for _, s := range snaps {
		date, pid := fmtDate(sc, s.day), portfolioDefs[s.port].id
		for _, h := range s.rows {
			if h.sec < 0 {
				emit(date, pid, "CASH", fmtCents(h.qty), "1")
				continue
			}
			emit(date, pid, universe[h.sec].id, strconv.FormatInt(h.qty, 10), fmtCents(h.priceCents))
		}
	}
}
