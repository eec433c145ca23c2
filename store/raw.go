package store

import (
	"context"
	"database/sql/driver"
	"errors"
	"fmt"
	"io"

	sqlite3 "github.com/mattn/go-sqlite3"
)

// rawConn drives one SQLite connection below database/sql, for ingestion:
// a million-row file pays database/sql's per-call argument conversion and
// locking a million times. Statements are prepared once per query text.
//
// Calls use context.Background: the driver watches a cancellable context
// with a goroutine per statement, so ingestion checks ctx itself between
// rows instead.
type rawConn struct {
	c     *sqlite3.SQLiteConn
	stmts map[string]*stmt
}

// stmt is a prepared statement with a reusable argument list.
type stmt struct {
	s    driver.Stmt
	args []driver.NamedValue
}

var bg = context.Background()

func newRawConn(dc any) (*rawConn, error) {
	c, ok := dc.(*sqlite3.SQLiteConn)
	if !ok {
		return nil, fmt.Errorf("store: driver connection is %T, want *sqlite3.SQLiteConn", dc)
	}
	return &rawConn{c: c, stmts: map[string]*stmt{}}, nil
}

func (c *rawConn) close() {
	for _, s := range c.stmts {
		s.s.Close()
	}
	c.stmts = nil
}

// prepare returns the cached statement for q.
func (c *rawConn) prepare(q string) (*stmt, error) {
	if s, ok := c.stmts[q]; ok {
		return s, nil
	}
	ds, err := c.c.PrepareContext(bg, q)
	if err != nil {
		return nil, fmt.Errorf("prepare %.60q: %w", q, err)
	}
	n := ds.NumInput()
	s := &stmt{s: ds, args: make([]driver.NamedValue, n)}
	for i := range s.args {
		s.args[i].Ordinal = i + 1
	}
	c.stmts[q] = s
	return s, nil
}

// set stores vals as the statement's arguments; ints become int64.
func (s *stmt) set(vals ...any) {
	for i, v := range vals {
		if n, ok := v.(int); ok {
			v = int64(n)
		}
		s.args[i].Value = v
	}
}

// exec runs the statement with its current arguments.
func (s *stmt) exec() (driver.Result, error) {
	return s.s.(driver.StmtExecContext).ExecContext(bg, s.args)
}

// run runs a statement that returns no rows, like exec, but through the
// driver's query path: go-sqlite3 binds all arguments and steps a query
// in one cgo crossing, where Exec crosses once per argument. Next drains
// the (empty) result, so the statement has run whatever the driver.
func (s *stmt) run() error {
	rows, err := s.s.(driver.StmtQueryContext).QueryContext(bg, s.args)
	if err != nil {
		return err
	}
	err = rows.Next(nil)
	if errors.Is(err, io.EOF) {
		err = nil
	}
	if cerr := rows.Close(); err == nil {
		err = cerr
	}
	return err
}

// exec prepares (once) and runs q with vals.
func (c *rawConn) exec(q string, vals ...any) (driver.Result, error) {
	s, err := c.prepare(q)
	if err != nil {
		return nil, err
	}
	s.set(vals...)
	return s.exec()
}

// execScript runs SQL without arguments (transaction control).
func (c *rawConn) execScript(q string) error {
	_, err := c.c.ExecContext(bg, q, nil)
	return err
}

// query runs q with vals and calls each for every row; dest holds the
// row's values (int64, float64, string or nil) and is reused.
func (c *rawConn) query(q string, vals []any, ncol int, each func(dest []driver.Value) error) error {
	s, err := c.prepare(q)
	if err != nil {
		return err
	}
	s.set(vals...)
	rows, err := s.s.(driver.StmtQueryContext).QueryContext(bg, s.args)
	if err != nil {
		return err
	}
	defer rows.Close()
	dest := make([]driver.Value, ncol)
	for {
		if err := rows.Next(dest); err != nil {
			if errors.Is(err, io.EOF) {
				return nil
			}
			return err
		}
		if err := each(dest); err != nil {
			return err
		}
	}
}

// queryRow runs q and copies the first row into dest; found is false
// when there is none.
func (c *rawConn) queryRow(q string, vals []any, dest []driver.Value) (found bool, err error) {
	err = c.query(q, vals, len(dest), func(d []driver.Value) error {
		if !found {
			copy(dest, d)
			found = true
		}
		return nil
	})
	return found, err
}

// Value conversions for rows read through rawConn.

func asInt(v driver.Value) int64 {
	switch x := v.(type) {
	case int64:
		return x
	case float64:
		return int64(x)
	}
	return 0
}

func asString(v driver.Value) string {
	switch x := v.(type) {
	case string:
		return x
	case []byte:
		return string(x)
	}
	return ""
}
