package store

import (
	"context"
	"database/sql"
	"errors"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"
)

// An empty database gets every migration, each recorded once; opening
// it again applies nothing.
func TestMigrateEmptyAndReopen(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "m.db")
	db, err := Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	latest := LatestSchemaVersion()
	if latest < 1 {
		t.Fatalf("LatestSchemaVersion = %d", latest)
	}
	v, err := db.SchemaVersion(ctx)
	if err != nil || v != latest {
		t.Fatalf("SchemaVersion = %d, %v; want %d", v, err, latest)
	}
	var rows int
	var appliedAt string
	db.sql.QueryRow(`SELECT count(*), min(applied_at) FROM schema_version`).Scan(&rows, &appliedAt)
	if rows != latest || !strings.HasSuffix(appliedAt, "Z") {
		t.Errorf("schema_version has %d rows (applied_at %q), want %d", rows, appliedAt, latest)
	}
	for _, table := range []string{"ingest_files", "portfolios", "securities", "assumptions", "assumption_stages",
		"holding_snapshots", "holding_lines", "prices", "yields", "premiums", "flows"} {
		count(t, db, table) // fails the test if the table is missing
	}
	// Something stored survives a reopen, which applies nothing.
	ingest(t, db, IngestOptions{}, writeFiles(t, "portfolios.csv", portfoliosCSV)...)
	db.Close()
	db, err = Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	db.sql.QueryRow(`SELECT count(*) FROM schema_version`).Scan(&rows)
	if rows != latest || count(t, db, "portfolios") != 2 {
		t.Errorf("after reopen: %d schema_version rows, %d portfolios", rows, count(t, db, "portfolios"))
	}
}

// The connection settings asked for in the DSN are in force.
func TestOpenPragmas(t *testing.T) {
	db := openTestDB(t)
	var mode string
	var fk, busy int
	db.sql.QueryRow(`PRAGMA journal_mode`).Scan(&mode)
	db.sql.QueryRow(`PRAGMA foreign_keys`).Scan(&fk)
	db.sql.QueryRow(`PRAGMA busy_timeout`).Scan(&busy)
	if mode != "wal" || fk != 1 || busy != 10000 {
		t.Errorf("journal_mode %q foreign_keys %d busy_timeout %d; want wal 1 10000", mode, fk, busy)
	}
}

// A database written by a newer program is refused, naming both
// versions and telling the user to upgrade.
func TestOpenRefusesNewerSchema(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "new.db")
	db, err := Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	latest := LatestSchemaVersion()
	if _, err := db.sql.Exec(`INSERT INTO schema_version (version, name) VALUES (?, 'from the future')`, latest+1); err != nil {
		t.Fatal(err)
	}
	db.Close()
	for name, open := range map[string]func(context.Context, string) (*DB, error){"Open": Open, "OpenReadOnly": OpenReadOnly} {
		_, err = open(ctx, path)
		if !errors.Is(err, ErrSchemaTooNew) {
			t.Fatalf("%s: %v, want ErrSchemaTooNew", name, err)
		}
		var sv *SchemaVersionError
		if !errors.As(err, &sv) || sv.Database != latest+1 || sv.Program != latest {
			t.Errorf("%s: %#v", name, sv)
		}
		for _, want := range []string{"version " + strconv.Itoa(latest+1), "up to " + strconv.Itoa(latest), "upgrade plumbline"} {
			if !strings.Contains(err.Error(), want) {
				t.Errorf("%s: message %q lacks %q", name, err, want)
			}
		}
	}
}

// A read-only open of a database that was never migrated is refused
// (it cannot migrate it), and a read-only handle cannot write.
func TestOpenReadOnly(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	empty := filepath.Join(dir, "empty.db")
	raw, err := sql.Open("sqlite3", "file:"+empty)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := raw.Exec(`CREATE TABLE t (x)`); err != nil {
		t.Fatal(err)
	}
	raw.Close()
	if _, err := OpenReadOnly(ctx, empty); !errors.Is(err, ErrSchemaOutdated) {
		t.Errorf("read-only open of an unmigrated database: %v, want ErrSchemaOutdated", err)
	}

	path := filepath.Join(dir, "ro.db")
	rw, err := Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	ingest(t, rw, IngestOptions{}, writeFiles(t, "portfolios.csv", portfoliosCSV)...)
	ro, err := OpenReadOnly(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	defer ro.Close()
	defer rw.Close()
	ps, err := ro.Portfolios(ctx)
	if err != nil || len(ps) != 2 {
		t.Errorf("Portfolios through a read-only handle: %v, %v", ps, err)
	}
	if _, err := ro.sql.Exec(`INSERT INTO ingest_files (name, path, sha256, kind, outcome) VALUES ('x', 'x', ?, 'prices', 'accepted')`,
		strings.Repeat("0", 64)); err == nil {
		t.Error("a read-only handle wrote a row")
	}
	if _, err := OpenReadOnly(ctx, filepath.Join(dir, "missing.db")); err == nil {
		t.Error("read-only open of a missing file succeeded")
	}
}

// The migration runner reads NNNN_name.sql files in version order and
// refuses gaps, repeats and bad names.
func TestLoadMigrations(t *testing.T) {
	good := fstest.MapFS{
		"m/0002_second.sql": {Data: []byte("CREATE TABLE b (x);")},
		"m/0001_first.sql":  {Data: []byte("CREATE TABLE a (x);")},
		"m/README":          {Data: []byte("not a migration")},
	}
	ms, err := loadMigrations(good, "m")
	if err != nil || len(ms) != 2 || ms[0].version != 1 || ms[1].name != "0002_second.sql" {
		t.Fatalf("loadMigrations = %+v, %v", ms, err)
	}
	for name, fsys := range map[string]fstest.MapFS{
		"gap":      {"m/0001_a.sql": {}, "m/0003_c.sql": {}},
		"repeat":   {"m/0001_a.sql": {}, "m/0001_b.sql": {}},
		"bad name": {"m/1_a.sql": {}},
		"no name":  {"m/0001.sql": {}},
	} {
		if _, err := loadMigrations(fsys, "m"); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
	// The embedded migrations themselves are well-formed.
	if _, err := migrations(); err != nil {
		t.Error(err)
	}
}
