package store

import (
	"database/sql/driver"
	"strconv"
	"strings"

	sqlite3 "github.com/mattn/go-sqlite3"
)

// loader validates and stores the rows of one input kind. row is called
// for every record with the right number of fields; finish once after the
// last one (also when rows failed: a loader that buffers writes then). Both return an error only for failures
// other than invalid input, which they record in the row or loadCtx.
type loader interface {
	row(lc *loadCtx, r *row) error
	finish(lc *loadCtx) error
}

// loadCtx is the state of one file's transaction.
type loadCtx struct {
	c         *rawConn
	fileID    int64
	file      string
	errs      *errList
	opt       IngestOptions
	unchanged int
	snapshots []SnapshotRevision

	strs       map[string]any // interned field values, boxed once
	securities map[string]any // known security ids, loaded on first use
	portfolios map[string]any
}

// intern returns b as a boxed string shared by equal values, so repeated
// dates cost no allocation.
func (lc *loadCtx) intern(b []byte) any {
	if v, ok := lc.strs[string(b)]; ok {
		return v
	}
	if len(lc.strs) > 1<<16 {
		clear(lc.strs)
	}
	s := string(b)
	var v any = s
	lc.strs[s] = v
	return v
}

// security returns the boxed id if b names a stored security.
func (lc *loadCtx) security(b []byte) (any, bool, error) {
	if lc.securities == nil {
		m, err := lc.ids(`SELECT security_id FROM securities`)
		if err != nil {
			return nil, false, err
		}
		lc.securities = m
	}
	v, ok := lc.securities[string(b)]
	return v, ok, nil
}

// portfolio returns the boxed id if b names a stored portfolio.
func (lc *loadCtx) portfolio(b []byte) (any, bool, error) {
	if lc.portfolios == nil {
		m, err := lc.ids(`SELECT portfolio_id FROM portfolios`)
		if err != nil {
			return nil, false, err
		}
		lc.portfolios = m
	}
	v, ok := lc.portfolios[string(b)]
	return v, ok, nil
}

func (lc *loadCtx) ids(q string) (map[string]any, error) {
	m := map[string]any{}
	err := lc.c.query(q, nil, 1, func(d []driver.Value) error {
		s := asString(d[0])
		m[s] = s
		return nil
	})
	return m, err
}

// keyedTable describes how to compare a row refused for its key with the
// stored one. The insert's arguments are the fields in file order, then
// source_file_id and source_line.
type keyedTable struct {
	// lookup selects the compared columns, then source_file_id,
	// source_line and the source file's name, for the key arguments.
	lookup string
	key    []int // field indexes of the key, in lookup argument order
	cols   []int // field indexes compared, in lookup column order
}

// put runs an insert whose arguments are set. A key conflict is compared
// with the stored row: identical is a no-op, different is an error.
func (lc *loadCtx) put(s *stmt, t *keyedTable, r *row) error {
	err := s.run()
	if err == nil {
		return nil
	}
	if isConstraint(err, sqlite3.ErrConstraintPrimaryKey) || isConstraint(err, sqlite3.ErrConstraintUnique) {
		return lc.conflict(s.args, t, r)
	}
	if isConstraint(err, 0) {
		// Validation should have caught it; the database is the backstop.
		r.ok = false
		r.errs.add(r.line, "", "", "refused by the database: "+err.Error())
		return nil
	}
	return err
}

func (lc *loadCtx) conflict(args []driver.NamedValue, t *keyedTable, r *row) error {
	keyVals := make([]any, len(t.key))
	keyText := make([]string, len(t.key))
	for i, k := range t.key {
		keyVals[i] = args[k].Value
		keyText[i] = string(r.f[k])
	}
	n := len(t.cols)
	dest := make([]driver.Value, n+3)
	found, err := lc.c.queryRow(t.lookup, keyVals, dest)
	if err != nil {
		return err
	}
	last := t.key[len(t.key)-1]
	if !found {
		r.failf(last, "conflicts with a stored row")
		return nil
	}
	srcFile, srcLine, srcName := asInt(dest[n]), asInt(dest[n+1]), asString(dest[n+2])
	if srcFile == lc.fileID {
		r.failf(last, "repeats the key (%s) of line %d", strings.Join(keyText, ", "), srcLine)
		return nil
	}
	same := true
	for i, fi := range t.cols {
		if !sameValue(args[fi].Value, dest[i]) {
			same = false
			r.failf(fi, "differs from the value %s stored from %s line %d", showValue(dest[i]), srcName, srcLine)
		}
	}
	if same {
		lc.unchanged++
	}
	return nil
}

// sameValue compares a value to insert with a stored one.
func sameValue(a, b driver.Value) bool {
	switch x := a.(type) {
	case nil:
		return b == nil
	case float64:
		switch y := b.(type) {
		case float64:
			return x == y
		case int64:
			return x == float64(y)
		}
	case int64:
		switch y := b.(type) {
		case int64:
			return x == y
		case float64:
			return float64(x) == y
		}
	case string:
		y, ok := b.(string)
		return ok && x == y
	}
	return false
}

// showValue formats a stored value for an error message.
func showValue(v driver.Value) string {
	switch x := v.(type) {
	case nil:
		return "(empty)"
	case float64:
		return strconv.FormatFloat(x, 'f', -1, 64)
	case int64:
		return strconv.FormatInt(x, 10)
	case string:
		return strconv.Quote(x)
	}
	return "?"
}
