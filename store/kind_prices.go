package store

import (
	"strings"
	"time"
)

// Prices: date,security_id,close,dividend,split_ratio. One row per
// trading day (Monday to Friday) and security.
//
// This is the bulk input, so the loader avoids allocation (dates and ids
// are interned, argument lists reused) and inserts priceBatch rows per
// statement: one driver call and one cgo crossing per batch instead of
// per row. A batch refused by a constraint is replayed row by row to find
// and report the offending rows.

const (
	priceInsert = `INSERT INTO prices (date, security_id, close, dividend, split_ratio, source_file_id, source_line) VALUES `
	priceParams = `(?, ?, ?, ?, ?, ?, ?)`
	priceArgs   = 7
	priceBatch  = 64
)

var (
	insertPrice      = priceInsert + priceParams
	insertPriceBatch = priceInsert + strings.TrimSuffix(strings.Repeat(priceParams+", ", priceBatch), ", ")
)

var priceTable = keyedTable{
	lookup: `SELECT p.close, p.dividend, p.split_ratio, p.source_file_id, p.source_line, f.name
FROM prices p JOIN ingest_files f ON f.id = p.source_file_id
WHERE p.date = ? AND p.security_id = ?`,
	key:  []int{0, 1},
	cols: []int{2, 3, 4},
}

var boxedOne any = 1.0

type priceLoader struct {
	one, batch *stmt
	fileID     any
	n          int // rows waiting in the batch
	// The field text of the waiting rows, for messages if the batch is
	// refused: row i's fields end at ends[5i..5i+4] in text.
	text  []byte
	ends  []int
	lines []int
}

func newPriceLoader() loader { return &priceLoader{} }

func (l *priceLoader) row(lc *loadCtx, r *row) error {
	if l.one == nil {
		var err error
		if l.one, err = lc.c.prepare(insertPrice); err != nil {
			return err
		}
		if l.batch, err = lc.c.prepare(insertPriceBatch); err != nil {
			return err
		}
		l.fileID = lc.fileID
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
	a := l.batch.args[l.n*priceArgs : (l.n+1)*priceArgs]
	a[0].Value = lc.intern(r.f[0])
	a[1].Value = sec
	a[2].Value = closePx
	a[3].Value = div
	if split == 1 {
		a[4].Value = boxedOne // the usual day: no allocation
	} else {
		a[4].Value = split
	}
	a[5].Value = l.fileID
	a[6].Value = int64(r.line)
	for _, f := range r.f {
		l.text = append(l.text, f...)
		l.ends = append(l.ends, len(l.text))
	}
	l.lines = append(l.lines, r.line)
	l.n++
	if l.n == priceBatch {
		return l.flush(lc)
	}
	return nil
}

// flush inserts the waiting rows: in one statement when the batch is
// full, else (or when the statement is refused) one by one.
func (l *priceLoader) flush(lc *loadCtx) error {
	if l.n == 0 {
		return nil
	}
	defer func() {
		l.n = 0
		l.text, l.ends, l.lines = l.text[:0], l.ends[:0], l.lines[:0]
	}()
	if l.n == priceBatch {
		err := l.batch.run()
		if err == nil {
			return nil
		}
		if !isConstraint(err, 0) {
			return err
		}
	}
	r := row{cols: kinds[kindOrder(KindPrices)].cols, errs: lc.errs, f: make([][]byte, 5)}
	for i := 0; i < l.n; i++ {
		from := 0
		if i > 0 {
			from = l.ends[5*i-1]
		}
		for j := range r.f {
			r.f[j] = l.text[from:l.ends[5*i+j]]
			from = l.ends[5*i+j]
		}
		r.line, r.ok = l.lines[i], true
		for j := range l.one.args {
			l.one.args[j].Value = l.batch.args[i*priceArgs+j].Value
		}
		if err := lc.put(l.one, &priceTable, &r); err != nil {
			return err
		}
	}
	return nil
}

func (l *priceLoader) finish(lc *loadCtx) error { return l.flush(lc) }

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
