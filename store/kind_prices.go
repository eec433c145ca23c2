package store

import "time"

// Prices: date,security_id,close,dividend,split_ratio. One row per
// trading day (Monday to Friday) and security.
//
// This is the bulk input, so the loader avoids allocation: dates and ids
// are interned and the insert's argument list is reused. Rows go in one
// statement each: a multi-row INSERT measured slower, as SQLite must then
// keep a statement journal to undo a half-done statement.

const insertPrice = `INSERT INTO prices (date, security_id, close, dividend, split_ratio, source_file_id, source_line)
VALUES (?, ?, ?, ?, ?, ?, ?)`

var priceTable = keyedTable{
	lookup: `SELECT p.close, p.dividend, p.split_ratio, p.source_file_id, p.source_line, f.name
FROM prices p JOIN ingest_files f ON f.id = p.source_file_id
WHERE p.date = ? AND p.security_id = ?`,
	key:  []int{0, 1},
	cols: []int{2, 3, 4},
}

type priceLoader struct {
	s      *stmt
	fileID any
}

func newPriceLoader() loader { return &priceLoader{} }

func (l *priceLoader) row(lc *loadCtx, r *row) error {
	if l.s == nil {
		s, err := lc.c.prepare(insertPrice)
		if err != nil {
			return err
		}
		l.s, l.fileID = s, lc.fileID
	}
	if d, ok := r.date(0); ok {
		if wd := d.Weekday(); wd == time.Saturday || wd == time.Sunday {
			r.failf(0, "is a %s; prices are for trading days, Monday to Friday", wd)
		}
	}
	sec, err := knownSecurity(lc, r, 1)
	if err != nil {
		return err
	}
	closePx, ok := r.num(2)
	if ok && !(closePx > 0) {
		r.fail(2, "must be > 0")
	}
	div, present, ok := r.optNum(3)
	if !present {
		div = 0
	} else if ok && !(div >= 0) {
		r.fail(3, "must be >= 0")
	}
	split, present, ok := r.optNum(4)
	if !present {
		split = 1
	} else if ok && !(split > 0) {
		r.fail(4, "must be > 0 (new shares per old share)")
	}
	if !r.ok {
		return nil
	}
	a := l.s.args
	a[0].Value = lc.intern(r.f[0])
	a[1].Value = sec
	a[2].Value = closePx
	a[3].Value = div
	a[4].Value = split
	a[5].Value = l.fileID
	a[6].Value = int64(r.line)
	return lc.put(l.s, &priceTable, r)
}

func (l *priceLoader) finish(*loadCtx) error { return nil }

// knownSecurity checks that field i names a stored security and returns
// its boxed id (nil when it does not).
func knownSecurity(lc *loadCtx, r *row, i int) (any, error) {
	sec, known, err := lc.security(r.f[i])
	if err != nil || known {
		return sec, err
	}
	if r.match(i, securityIDRe, securityIDRule) {
		r.fail(i, "is not a known security; load it with a securities file first")
	}
	return nil, nil
}

// knownPortfolio is knownSecurity for portfolios.
func knownPortfolio(lc *loadCtx, r *row, i int) (any, error) {
	pf, known, err := lc.portfolio(r.f[i])
	if err != nil || known {
		return pf, err
	}
	if r.match(i, portfolioIDRe, portfolioIDRule) {
		r.fail(i, "is not a known portfolio; load it with a portfolios file first")
	}
	return nil, nil
}
