package store

import (
	"context"
	"database/sql"
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"sort"
	"strconv"
	"strings"
)

//go:embed migrations/*.sql
var migrationFS embed.FS

// migration is one schema step, migrations/NNNN_name.sql.
type migration struct {
	version int
	name    string
	sql     string
}

// ErrSchemaTooNew means the database was written by a newer Plumbline;
// the error in the chain is a *SchemaVersionError naming both versions.
var ErrSchemaTooNew = errors.New("database schema is newer than this program")

// ErrSchemaOutdated means a read-only open found a database that has not
// been migrated to this program's schema yet.
var ErrSchemaOutdated = errors.New("database schema is older than this program")

// SchemaVersionError reports a schema version this binary cannot use.
type SchemaVersionError struct {
	Database int // version recorded in the database
	Program  int // latest version this binary knows
}

func (e *SchemaVersionError) Error() string {
	if e.Database > e.Program {
		return fmt.Sprintf("the database has schema version %d but this plumbline knows versions up to %d; upgrade plumbline to use it",
			e.Database, e.Program)
	}
	return fmt.Sprintf("the database has schema version %d but this plumbline needs %d; open it once read-write (for example with plumbline ingest) to migrate it",
		e.Database, e.Program)
}

// Is makes errors.Is(err, ErrSchemaTooNew) and ErrSchemaOutdated work.
func (e *SchemaVersionError) Is(target error) bool {
	return (target == ErrSchemaTooNew && e.Database > e.Program) ||
		(target == ErrSchemaOutdated && e.Database < e.Program)
}

// migrations returns the embedded migrations sorted by version. A gap or
// a repeated version is an error (a build defect that tests catch).
func migrations() ([]migration, error) {
	return loadMigrations(migrationFS, "migrations")
}

func loadMigrations(fsys fs.FS, dir string) ([]migration, error) {
	entries, err := fs.ReadDir(fsys, dir)
	if err != nil {
		return nil, err
	}
	var ms []migration
	for _, e := range entries {
		name := e.Name()
		if e.IsDir() || !strings.HasSuffix(name, ".sql") {
			continue
		}
		num, rest, ok := strings.Cut(strings.TrimSuffix(name, ".sql"), "_")
		v, err := strconv.Atoi(num)
		if !ok || err != nil || len(num) != 4 || v < 1 || rest == "" {
			return nil, fmt.Errorf("migration %s: want NNNN_name.sql", name)
		}
		b, err := fs.ReadFile(fsys, path.Join(dir, name))
		if err != nil {
			return nil, err
		}
		ms = append(ms, migration{version: v, name: name, sql: string(b)})
	}
	sort.Slice(ms, func(i, j int) bool { return ms[i].version < ms[j].version })
	for i, m := range ms {
		if m.version != i+1 {
			return nil, fmt.Errorf("migration %s: version %d, want %d (no gaps or repeats)", m.name, m.version, i+1)
		}
	}
	return ms, nil
}

// LatestSchemaVersion is the schema version this binary migrates to.
func LatestSchemaVersion() int {
	ms, err := migrations()
	if err != nil {
		return 0
	}
	return len(ms)
}

const createSchemaVersion = `CREATE TABLE IF NOT EXISTS schema_version (
	version    INTEGER PRIMARY KEY CHECK (version >= 1),
	name       TEXT    NOT NULL,
	applied_at TEXT    NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now'))
) STRICT`

// SchemaVersion returns the highest migration recorded in the database
// (0 for an empty one).
func (db *DB) SchemaVersion(ctx context.Context) (int, error) {
	return schemaVersion(ctx, db.sql)
}

type queryer interface {
	QueryRowContext(ctx context.Context, query string, args ...any) *sql.Row
}

func schemaVersion(ctx context.Context, q queryer) (int, error) {
	var n int
	err := q.QueryRowContext(ctx, `SELECT count(*) FROM sqlite_schema WHERE type = 'table' AND name = 'schema_version'`).Scan(&n)
	if err != nil || n == 0 {
		return 0, err
	}
	var v int
	err = q.QueryRowContext(ctx, `SELECT ifnull(max(version), 0) FROM schema_version`).Scan(&v)
	return v, err
}

// migrate applies every pending migration, each in its own transaction
// together with its schema_version row. The version is read again inside
// the transaction, so two processes opening a new database at once apply
// each migration once.
func (db *DB) migrate(ctx context.Context) error {
	ms, err := migrations()
	if err != nil {
		return err
	}
	if _, err := db.sql.ExecContext(ctx, createSchemaVersion); err != nil {
		return fmt.Errorf("create schema_version: %w", err)
	}
	for _, m := range ms {
		if err := db.apply(ctx, m, len(ms)); err != nil {
			return err
		}
	}
	return nil
}

func (db *DB) apply(ctx context.Context, m migration, latest int) error {
	tx, err := db.sql.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	defer tx.Rollback()
	cur, err := schemaVersion(ctx, tx)
	if err != nil {
		return err
	}
	if cur > latest {
		return &SchemaVersionError{Database: cur, Program: latest}
	}
	if cur >= m.version {
		return nil
	}
	if _, err := tx.ExecContext(ctx, m.sql); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO schema_version (version, name) VALUES (?, ?)`, m.version, m.name); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	return tx.Commit()
}

// checkVersion refuses a database whose schema is not exactly this
// binary's (read-only opens cannot migrate).
func (db *DB) checkVersion(ctx context.Context) error {
	cur, err := schemaVersion(ctx, db.sql)
	if err != nil {
		return err
	}
	if latest := LatestSchemaVersion(); cur != latest {
		return &SchemaVersionError{Database: cur, Program: latest}
	}
	return nil
}
