// Package store keeps Plumbline's inputs in one SQLite database: the
// ledger of ingested files, portfolios, securities, valuation assumptions,
// holdings snapshots, prices, yields, equity risk premiums and external
// flows. It is the only package that speaks SQL.
//
// The schema lives in migrations/NNNN_name.sql, applied in order when a
// database is opened read-write. The database refuses nonsense by itself
// (CHECK, foreign keys, STRICT tables, append-only triggers), and Ingest
// validates every input file before a row reaches it.
package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"

	sqlite3 "github.com/mattn/go-sqlite3"
)

// busyTimeoutMS is how long a connection waits for another writer.
const busyTimeoutMS = 10000

// DB is an open Plumbline database. It is safe for concurrent use.
type DB struct {
	sql      *sql.DB
	path     string
	readOnly bool
	mark     int64 // see At; 0: every input row
}

// Open opens (creating it if needed) the database at path in WAL mode with
// foreign keys on and a busy timeout, and applies pending migrations. A
// database written by a newer Plumbline is refused with ErrSchemaTooNew.
func Open(ctx context.Context, path string) (*DB, error) {
	// _txlock=immediate: a writing transaction takes the write lock at
	// BEGIN, so two writers queue on the busy timeout instead of failing
	// with SQLITE_BUSY when a reader upgrades. _cache_size: a 64 MiB page
	// cache (SQLite's default is 2 MiB) keeps a million-row ingest from
	// spilling pages to the WAL mid-transaction, which measured about
	// half of its time.
	dsn := fmt.Sprintf("file:%s?_journal_mode=WAL&_foreign_keys=on&_busy_timeout=%d&_txlock=immediate&_cache_size=-65536",
		escapePath(path), busyTimeoutMS)
	db, err := open(ctx, path, dsn, false)
	if err != nil {
		return nil, err
	}
	if err := db.migrate(ctx); err != nil {
		db.sql.Close()
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	return db, nil
}

// OpenReadOnly opens an existing database for queries only (SQLite
// mode=ro and PRAGMA query_only). Its schema must be the one this binary
// knows: older is ErrSchemaOutdated (open it read-write once to migrate),
// newer is ErrSchemaTooNew.
func OpenReadOnly(ctx context.Context, path string) (*DB, error) {
	dsn := fmt.Sprintf("file:%s?mode=ro&_query_only=true&_foreign_keys=on&_busy_timeout=%d",
		escapePath(path), busyTimeoutMS)
	db, err := open(ctx, path, dsn, true)
	if err != nil {
		return nil, err
	}
	if err := db.checkVersion(ctx); err != nil {
		db.sql.Close()
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	return db, nil
}

func open(ctx context.Context, path, dsn string, readOnly bool) (*DB, error) {
	if path == "" {
		return nil, errors.New("open: empty database path")
	}
	sdb, err := sql.Open("sqlite3", dsn)
	if err != nil {
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	db := &DB{sql: sdb, path: path, readOnly: readOnly}
	if err := db.verifyPragmas(ctx); err != nil {
		sdb.Close()
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	return db, nil
}

// verifyPragmas checks that the DSN settings took effect; a silently
// ignored parameter would leave foreign keys off.
func (db *DB) verifyPragmas(ctx context.Context) error {
	conn, err := db.sql.Conn(ctx)
	if err != nil {
		return err
	}
	defer conn.Close()
	var fk, busy int
	var mode string
	if err := conn.QueryRowContext(ctx, "PRAGMA foreign_keys").Scan(&fk); err != nil {
		return err
	}
	if err := conn.QueryRowContext(ctx, "PRAGMA busy_timeout").Scan(&busy); err != nil {
		return err
	}
	if err := conn.QueryRowContext(ctx, "PRAGMA journal_mode").Scan(&mode); err != nil {
		return err
	}
	if fk != 1 {
		return errors.New("foreign keys are off")
	}
	if busy != busyTimeoutMS {
		return fmt.Errorf("busy timeout is %d ms, want %d", busy, busyTimeoutMS)
	}
	// A read-only connection cannot switch an existing database to WAL;
	// it reads whatever mode the writer chose.
	if !db.readOnly && !strings.EqualFold(mode, "wal") {
		return fmt.Errorf("journal mode is %q, want wal", mode)
	}
	if db.readOnly {
		var qo int
		if err := conn.QueryRowContext(ctx, "PRAGMA query_only").Scan(&qo); err != nil {
			return err
		}
		if qo != 1 {
			return errors.New("query_only is off on a read-only connection")
		}
	}
	return nil
}

// Close closes the database.
func (db *DB) Close() error { return db.sql.Close() }

// Path is the file the database was opened from.
func (db *DB) Path() string { return db.path }

// escapePath makes a file name safe inside a file: URI.
func escapePath(p string) string {
	return strings.NewReplacer("%", "%25", "?", "%3f", "#", "%23").Replace(p)
}

// isConstraint reports whether err is a SQLite constraint violation of
// the given extended code (0: any constraint).
func isConstraint(err error, ext sqlite3.ErrNoExtended) bool {
	var se sqlite3.Error
	if !errors.As(err, &se) || se.Code != sqlite3.ErrConstraint {
		return false
	}
	return ext == 0 || se.ExtendedCode == ext
}
