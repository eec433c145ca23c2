package store

// Market series keyed by date: yields, equity risk premiums, and external
// flows (keyed by date and portfolio).

// Yields: date,tenor_months,yield (annually compounded zero-coupon, decimal).

const insertYield = `INSERT INTO yields (date, tenor_months, yield, source_file_id, source_line) VALUES (?, ?, ?, ?, ?)`

var yieldTable = keyedTable{
	lookup: `SELECT y.yield, y.source_file_id, y.source_line, f.name
FROM yields y JOIN ingest_files f ON f.id = y.source_file_id
WHERE y.date = ? AND y.tenor_months = ?`,
	key:  []int{0, 1},
	cols: []int{2},
}

type yieldLoader struct{}

func newYieldLoader() loader { return yieldLoader{} }

func (yieldLoader) row(lc *loadCtx, r *row) error {
	r.date(0)
	tenor, ok := r.count(1)
	if ok && (tenor < 1 || tenor > 600) {
		r.fail(1, "must be between 1 and 600 months")
	}
	y, ok := r.num(2)
	if ok && !(y > -0.05 && y < 0.5) {
		r.fail(2, "must be a decimal between -0.05 and 0.5 (exclusive); 0.05 means 5%")
	}
	if !r.ok {
		return nil
	}
	s, err := lc.c.prepare(insertYield)
	if err != nil {
		return err
	}
	s.set(lc.intern(r.f[0]), tenor, y, lc.fileID, r.line)
	return lc.put(s, &yieldTable, r)
}

func (yieldLoader) finish(*loadCtx) error { return nil }

// Premiums: date,equity_risk_premium (decimal).

const insertPremium = `INSERT INTO premiums (date, equity_risk_premium, source_file_id, source_line) VALUES (?, ?, ?, ?)`

var premiumTable = keyedTable{
	lookup: `SELECT p.equity_risk_premium, p.source_file_id, p.source_line, f.name
FROM premiums p JOIN ingest_files f ON f.id = p.source_file_id
WHERE p.date = ?`,
	key:  []int{0},
	cols: []int{1},
}

type premiumLoader struct{}

func newPremiumLoader() loader { return premiumLoader{} }

func (premiumLoader) row(lc *loadCtx, r *row) error {
	r.date(0)
	erp, ok := r.num(1)
	if ok && !(erp >= 0 && erp < 0.5) {
		r.fail(1, "must be a decimal >= 0 and < 0.5; 0.05 means 5%")
	}
	if !r.ok {
		return nil
	}
	s, err := lc.c.prepare(insertPremium)
	if err != nil {
		return err
	}
	s.set(lc.intern(r.f[0]), erp, lc.fileID, r.line)
	return lc.put(s, &premiumTable, r)
}

func (premiumLoader) finish(*loadCtx) error { return nil }

// Flows: date,portfolio_id,amount (base currency, + in, - out). One net
// flow per portfolio and day.

const insertFlow = `INSERT INTO flows (date, portfolio_id, amount, source_file_id, source_line) VALUES (?, ?, ?, ?, ?)`

var flowTable = keyedTable{
	lookup: `SELECT x.amount, x.source_file_id, x.source_line, f.name
FROM flows x JOIN ingest_files f ON f.id = x.source_file_id
WHERE x.date = ? AND x.portfolio_id = ?`,
	key:  []int{0, 1},
	cols: []int{2},
}

type flowLoader struct{}

func newFlowLoader() loader { return flowLoader{} }

func (flowLoader) row(lc *loadCtx, r *row) error {
	r.date(0)
	pf, err := knownPortfolio(lc, r, 1)
	if err != nil {
		return err
	}
	amount, ok := r.num(2)
	if ok && amount == 0 {
		r.fail(2, "must not be 0 (+ in, - out)")
	}
	if !r.ok {
		return nil
	}
	s, err := lc.c.prepare(insertFlow)
	if err != nil {
		return err
	}
	s.set(lc.intern(r.f[0]), pf, amount, lc.fileID, r.line)
	return lc.put(s, &flowTable, r)
}

func (flowLoader) finish(*loadCtx) error { return nil }
