package storetest

import (
	"database/sql"
	"testing"

	"plumbline/store"
)

// TamperPrice changes a stored close behind the program's back, as an
// attacker or a broken tool with write access to the file would: it drops
// the append-only trigger of the prices table and rewrites the row.
func TamperPrice(t testing.TB, db *store.DB, securityID, date string, close float64) {
	t.Helper()
	conn, err := sql.Open("sqlite3", "file:"+db.Path()+"?_busy_timeout=10000")
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	rows, err := conn.Query(`SELECT name FROM sqlite_master WHERE type = 'trigger' AND tbl_name = 'prices'`)
	if err != nil {
		t.Fatal(err)
	}
	var triggers []string
	for rows.Next() {
		var n string
		if err := rows.Scan(&n); err != nil {
			t.Fatal(err)
		}
		triggers = append(triggers, n)
	}
	rows.Close()
	for _, n := range triggers {
		if _, err := conn.Exec(`DROP TRIGGER "` + n + `"`); err != nil {
			t.Fatal(err)
		}
	}
	res, err := conn.Exec(`UPDATE prices SET close = ? WHERE security_id = ? AND date = ?`, close, securityID, date)
	if err != nil {
		t.Fatal(err)
	}
	if n, _ := res.RowsAffected(); n != 1 {
		t.Fatalf("storetest: tamper: %d rows for %s %s", n, securityID, date)
	}
}
