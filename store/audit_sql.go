package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"net/url"
	"strings"
	"sync"

	sqlite3 "github.com/mattn/go-sqlite3"
)

// ErrWriteRefused is returned when an audit query tries to change anything.
var ErrWriteRefused = errors.New("refused: audit queries are read-only")

// readPragmas are the pragmas an audit query may run, and only without an
// argument (reading, never setting); tablePragmas take a table or index
// name as their argument and only read.
var tablePragmas = map[string]bool{
	"table_info": true, "table_xinfo": true, "index_list": true, "index_info": true,
	"index_xinfo": true, "foreign_key_list": true,
}

var readPragmas = map[string]bool{
	"table_list": true, "user_version": true,
	"schema_version": true, "page_count": true, "page_size": true, "compile_options": true,
	"database_list": true, "collation_list": true, "function_list": true,
	"pragma_list": true, "journal_mode": true, "foreign_keys": true, "encoding": true,
}

var registerAudit sync.Once

const auditDriver = "sqlite3_plumbline_audit"

// auditAuthorizer lets statements read and nothing else: no write of any
// kind, no ATTACH or DETACH, no transaction control, and pragmas only from
// readPragmas and only without an argument.
func auditAuthorizer(op int, arg1, arg2, _ string) int {
	switch op {
	case sqlite3.SQLITE_SELECT, sqlite3.SQLITE_READ, sqlite3.SQLITE_FUNCTION:
		return sqlite3.SQLITE_OK
	case sqlite3.SQLITE_PRAGMA:
		// arg1 is the pragma name, arg2 its argument (empty when reading).
		name := strings.ToLower(arg1)
		if (arg2 == "" && readPragmas[name]) || tablePragmas[name] {
			return sqlite3.SQLITE_OK
		}
		return sqlite3.SQLITE_DENY
	}
	// 33 is SQLITE_RECURSIVE (WITH RECURSIVE), which only reads.
	if op == 33 {
		return sqlite3.SQLITE_OK
	}
	return sqlite3.SQLITE_DENY
}

// QueryResult is the outcome of an audit query.
type QueryResult struct {
	Columns []string `json:"columns"`
	Rows    [][]any  `json:"rows"`
}

// AuditQuery runs one SQL statement against the database at path, opened
// read-only (mode=ro), query-only, and with an authorizer that refuses
// every write, ATTACH, DETACH and pragma assignment. maxRows caps the rows
// returned (0 means no cap).
func AuditQuery(ctx context.Context, path, query string, maxRows int) (*QueryResult, error) {
	registerAudit.Do(func() {
		sql.Register(auditDriver, &sqlite3.SQLiteDriver{
			ConnectHook: func(c *sqlite3.SQLiteConn) error {
				c.RegisterAuthorizer(auditAuthorizer)
				return nil
			},
		})
	})
	u := url.URL{Scheme: "file", Opaque: path}
	q := url.Values{}
	q.Set("mode", "ro")
	q.Set("_query_only", "1")
	q.Set("_busy_timeout", "10000")
	u.RawQuery = q.Encode()
	db, err := sql.Open(auditDriver, u.String())
	if err != nil {
		return nil, err
	}
	defer db.Close()
	db.SetMaxOpenConns(1)
	if err := db.PingContext(ctx); err != nil {
		return nil, fmt.Errorf("open %s read-only: %w", path, err)
	}
	rows, err := db.QueryContext(ctx, query)
	if err != nil {
		if isAuthError(err) {
			return nil, fmt.Errorf("%w: %v", ErrWriteRefused, err)
		}
		return nil, err
	}
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		return nil, err
	}
	res := &QueryResult{Columns: cols}
	for rows.Next() {
		vals := make([]any, len(cols))
		ptrs := make([]any, len(cols))
		for i := range vals {
			ptrs[i] = &vals[i]
		}
		if err := rows.Scan(ptrs...); err != nil {
			return nil, err
		}
		for i, v := range vals {
			if b, ok := v.([]byte); ok {
				vals[i] = string(b)
			}
		}
		res.Rows = append(res.Rows, vals)
		if maxRows > 0 && len(res.Rows) >= maxRows {
			break
		}
	}
	if err := rows.Err(); err != nil {
		if isAuthError(err) {
			return nil, fmt.Errorf("%w: %v", ErrWriteRefused, err)
		}
		return nil, err
	}
	return res, nil
}

func isAuthError(err error) bool {
	var se sqlite3.Error
	if errors.As(err, &se) {
		return se.Code == sqlite3.ErrAuth || se.Code == sqlite3.ErrReadonly
	}
	return strings.Contains(err.Error(), "not authorized")
}
