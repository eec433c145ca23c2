package store

import (
	"context"
	"database/sql"
	"errors"
	"path/filepath"
	"testing"
)

func auditFixture(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "audit.db")
	db, err := sql.Open("sqlite3", "file:"+path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	for _, s := range []string{
		`CREATE TABLE t (id INTEGER PRIMARY KEY, v TEXT)`,
		`CREATE INDEX t_v ON t (v)`,
		`INSERT INTO t (v) VALUES ('a'), ('b')`,
	} {
		if _, err := db.Exec(s); err != nil {
			t.Fatal(err)
		}
	}
	return path
}

func countRows(t *testing.T, path string) int {
	t.Helper()
	res, err := AuditQuery(context.Background(), path, "SELECT count(*) FROM t", 0)
	if err != nil {
		t.Fatal(err)
	}
	return int(res.Rows[0][0].(int64))
}

func TestAuditQueryReads(t *testing.T) {
	path := auditFixture(t)
	res, err := AuditQuery(context.Background(), path, "SELECT id, v FROM t ORDER BY id", 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Rows) != 2 || res.Rows[1][1] != "b" || res.Columns[1] != "v" {
		t.Fatalf("got %+v", res)
	}
	if _, err := AuditQuery(context.Background(), path, "PRAGMA table_info(t)", 0); err != nil {
		t.Fatalf("reading pragma refused: %v", err)
	}
	if _, err := AuditQuery(context.Background(), path,
		"WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i+1 FROM n WHERE i < 3) SELECT count(*) FROM n", 0); err != nil {
		t.Fatalf("recursive read refused: %v", err)
	}
}

// Every statement that could change the file, attach another, or switch
// the query-only guard off must be refused and leave the table unchanged.
func TestAuditQueryRefusesWrites(t *testing.T) {
	path := auditFixture(t)
	other := filepath.Join(t.TempDir(), "other.db")
	cases := []string{
		"INSERT INTO t (v) VALUES ('x')",
		"UPDATE t SET v = 'x'",
		"DELETE FROM t",
		"DROP TABLE t",
		"CREATE TABLE u (x)",
		"CREATE TEMP TABLE u (x)",
		"ATTACH DATABASE '" + other + "' AS o",
		"PRAGMA query_only = 0",
		"PRAGMA query_only = OFF",
		"PRAGMA user_version = 7",
		"PRAGMA journal_mode = DELETE",
		"PRAGMA writable_schema = ON",
		"VACUUM",
		"VACUUM INTO '" + other + "'",
		"REINDEX",
		"ANALYZE",
		"BEGIN IMMEDIATE",
		"SELECT 1; DELETE FROM t",
	}
	for _, q := range cases {
		t.Run(q, func(t *testing.T) {
			_, err := AuditQuery(context.Background(), path, q, 0)
			// A trailing second statement is never run; every other case
			// must come back as an error.
			if q != "SELECT 1; DELETE FROM t" && err == nil {
				t.Fatalf("%q was not refused", q)
			}
			if err != nil && !errors.Is(err, ErrWriteRefused) {
				t.Logf("%q refused by SQLite itself: %v", q, err)
			}
			if n := countRows(t, path); n != 2 {
				t.Fatalf("%q changed the table: %d rows", q, n)
			}
		})
	}
}
