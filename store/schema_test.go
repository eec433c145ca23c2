package store

import (
	"strings"
	"testing"

	sqlite3 "github.com/mattn/go-sqlite3"
)

// The schema refuses nonsense by itself, whatever writes to it: each
// statement below, run as raw SQL, must fail with a constraint error. The
// valid statements first prove that the refusals are due to the one
// nonsensical value in each.
func TestSchemaRefusesNonsense(t *testing.T) {
	db := baseDB(t) // ledger rows 1 and 2; portfolios PF-GROWTH, PF-INCOME; securities QLMB, VNTR.A, OSPX
	sha := strings.Repeat("ab", 32)
	valid := []string{
		`INSERT INTO ingest_files (id, name, path, sha256, kind, outcome) VALUES (10, 'f.csv', '/f.csv', '` + sha + `', 'prices', 'accepted')`,
		`INSERT INTO prices VALUES ('2026-03-02', 'QLMB', 41.2, 0, 1, 10, 2)`,
		`INSERT INTO yields VALUES ('2026-03-06', 12, 0.04, 10, 2)`,
		`INSERT INTO premiums VALUES ('2026-03-06', 0.05, 10, 2)`,
		`INSERT INTO flows VALUES ('2026-03-06', 'PF-GROWTH', -100, 10, 2)`,
		`INSERT INTO assumptions (id, security_id, effective_date, annual_dividend, frequency, growth, beta, discount_rate, source_file_id, source_line)
		 VALUES (1, 'QLMB', '2026-01-01', 1.6, 4, 0.03, NULL, NULL, 10, 2)`,
		`INSERT INTO assumption_stages VALUES (1, 1, 3, 0.09, NULL)`,
		`INSERT INTO holding_snapshots (id, portfolio_id, as_of, revision, source_file_id) VALUES (1, 'PF-GROWTH', '2026-03-06', 1, 10)`,
		`INSERT INTO holding_lines VALUES (1, 'QLMB', 10, 41.9, 2)`,
		`INSERT INTO holding_lines VALUES (1, NULL, -500, 1, 3)`,
	}
	for _, q := range valid {
		if _, err := db.sql.Exec(q); err != nil {
			t.Fatalf("valid statement refused: %v\n%s", err, q)
		}
	}
	nonsense := []struct{ name, sql string }{
		{"negative close", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', -1, 0, 1, 10, 2)`},
		{"zero close", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', 0, 0, 1, 10, 2)`},
		{"zero split ratio", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', 41, 0, 0, 10, 2)`},
		{"negative split ratio", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', 41, 0, -2, 10, 2)`},
		{"negative dividend", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', 41, -0.1, 1, 10, 2)`},
		{"duplicate price key", `INSERT INTO prices VALUES ('2026-03-02', 'QLMB', 41.3, 0, 1, 10, 3)`},
		{"price of unknown security", `INSERT INTO prices VALUES ('2026-03-03', 'NOPE', 41, 0, 1, 10, 2)`},
		{"price from unknown file", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', 41, 0, 1, 99, 2)`},
		{"price on 30 February", `INSERT INTO prices VALUES ('2026-02-30', 'QLMB', 41, 0, 1, 10, 2)`},
		{"price on a Sunday", `INSERT INTO prices VALUES ('2026-03-08', 'QLMB', 41, 0, 1, 10, 2)`},
		{"price date not ISO", `INSERT INTO prices VALUES ('03/03/2026', 'QLMB', 41, 0, 1, 10, 2)`},
		{"price as text", `INSERT INTO prices VALUES ('2026-03-03', 'QLMB', 'forty', 0, 1, 10, 2)`},
		{"price without close", `INSERT INTO prices (date, security_id, source_file_id, source_line) VALUES ('2026-03-03', 'QLMB', 10, 2)`},
		{"update a price", `UPDATE prices SET close = 1 WHERE security_id = 'QLMB'`},
		{"delete a price", `DELETE FROM prices`},
		{"tenor 0", `INSERT INTO yields VALUES ('2026-03-09', 0, 0.04, 10, 2)`},
		{"tenor 601", `INSERT INTO yields VALUES ('2026-03-09', 601, 0.04, 10, 2)`},
		{"yield in percent", `INSERT INTO yields VALUES ('2026-03-09', 12, 4.0, 10, 2)`},
		{"duplicate yield", `INSERT INTO yields VALUES ('2026-03-06', 12, 0.05, 10, 3)`},
		{"premium 0.5", `INSERT INTO premiums VALUES ('2026-03-09', 0.5, 10, 2)`},
		{"zero flow", `INSERT INTO flows VALUES ('2026-03-09', 'PF-GROWTH', 0, 10, 2)`},
		{"flow of unknown portfolio", `INSERT INTO flows VALUES ('2026-03-09', 'PF-NONE', 10, 10, 2)`},
		{"bad portfolio id", `INSERT INTO portfolios VALUES ('pf-x', 'A', 'B', '2020-01-02', 'value', 10, 2)`},
		{"bad benchmark method", `INSERT INTO portfolios VALUES ('PF-X', 'A', 'B', '2020-01-02', 'cap', 10, 2)`},
		{"empty portfolio name", `INSERT INTO portfolios VALUES ('PF-X', '', 'B', '2020-01-02', 'value', 10, 2)`},
		{"security called CASH", `INSERT INTO securities VALUES ('CASH', 'A', 'B', 'USD', 10, 10, 2)`},
		{"security id lower case", `INSERT INTO securities VALUES ('abc', 'A', 'B', 'USD', 10, 10, 2)`},
		{"zero shares outstanding", `INSERT INTO securities VALUES ('NEWCO', 'A', 'B', 'USD', 0, 10, 2)`},
		{"bad currency", `INSERT INTO securities VALUES ('NEWCO', 'A', 'B', 'usd', 10, 10, 2)`},
		{"duplicate security", `INSERT INTO securities VALUES ('QLMB', 'A', 'B', 'USD', 10, 10, 2)`},
		{"rename a security", `UPDATE securities SET name = 'x' WHERE security_id = 'QLMB'`},
		{"frequency 3", `INSERT INTO assumptions (security_id, effective_date, annual_dividend, frequency, growth, source_file_id, source_line) VALUES ('QLMB', '2026-02-01', 1, 3, 0.03, 10, 2)`},
		{"growth 1", `INSERT INTO assumptions (security_id, effective_date, annual_dividend, frequency, growth, source_file_id, source_line) VALUES ('QLMB', '2026-02-01', 1, 4, 1, 10, 2)`},
		{"discount rate 0", `INSERT INTO assumptions (security_id, effective_date, annual_dividend, frequency, growth, discount_rate, source_file_id, source_line) VALUES ('QLMB', '2026-02-01', 1, 4, 0.03, 0, 10, 2)`},
		{"duplicate assumption", `INSERT INTO assumptions (security_id, effective_date, annual_dividend, frequency, growth, source_file_id, source_line) VALUES ('QLMB', '2026-01-01', 1, 4, 0.03, 10, 2)`},
		{"stage of zero years", `INSERT INTO assumption_stages VALUES (1, 2, 0, 0.05, NULL)`},
		{"stage of missing assumption", `INSERT INTO assumption_stages VALUES (7, 1, 2, 0.05, NULL)`},
		{"second current snapshot", `INSERT INTO holding_snapshots (portfolio_id, as_of, revision, source_file_id) VALUES ('PF-GROWTH', '2026-03-06', 2, 10)`},
		{"snapshot revision 0", `INSERT INTO holding_snapshots (portfolio_id, as_of, revision, source_file_id) VALUES ('PF-INCOME', '2026-03-06', 0, 10)`},
		{"change a snapshot's date", `UPDATE holding_snapshots SET as_of = '2026-03-05' WHERE id = 1`},
		{"supersede by a missing snapshot", `UPDATE holding_snapshots SET superseded_by = 42 WHERE id = 1`},
		{"delete a snapshot", `DELETE FROM holding_snapshots`},
		{"negative shares held", `INSERT INTO holding_lines VALUES (1, 'VNTR.A', -10, 9.25, 4)`},
		{"cash priced at 2", `INSERT INTO holding_lines VALUES (1, NULL, 10, 2, 4)`},
		{"second cash line", `INSERT INTO holding_lines VALUES (1, NULL, 10, 1, 4)`},
		{"held security unknown", `INSERT INTO holding_lines VALUES (1, 'NOPE', 10, 9.25, 4)`},
		{"ledger bad outcome", `INSERT INTO ingest_files (name, path, sha256, kind, outcome) VALUES ('g.csv', '/g.csv', '` + sha + `', 'prices', 'maybe')`},
		{"ledger same content accepted twice", `INSERT INTO ingest_files (name, path, sha256, kind, outcome) VALUES ('g.csv', '/g.csv', '` + sha + `', 'prices', 'accepted')`},
		{"ledger rejected without error", `INSERT INTO ingest_files (name, path, sha256, outcome) VALUES ('g.csv', '/g.csv', '` + sha + `', 'rejected')`},
		{"ledger bad sha256", `INSERT INTO ingest_files (name, path, sha256, kind, outcome) VALUES ('g.csv', '/g.csv', 'xyz', 'prices', 'duplicate')`},
		{"delete from the ledger", `DELETE FROM ingest_files WHERE id = 10`},
		{"rewrite the ledger", `UPDATE ingest_files SET outcome = 'rejected', error = 'x' WHERE id = 10`},
	}
	for _, tc := range nonsense {
		// A deferred foreign key fails at COMMIT, so run each in its own
		// transaction and look at both errors.
		tx, err := db.sql.Begin()
		if err != nil {
			t.Fatal(err)
		}
		_, err = tx.Exec(tc.sql)
		if err == nil {
			err = tx.Commit()
		} else {
			tx.Rollback()
		}
		var se sqlite3.Error
		if err == nil {
			t.Errorf("%s: accepted", tc.name)
		} else if !asSQLite(err, &se) || se.Code != sqlite3.ErrConstraint {
			t.Errorf("%s: %v, want a constraint error", tc.name, err)
		}
	}
}

func asSQLite(err error, se *sqlite3.Error) bool {
	e, ok := err.(sqlite3.Error)
	if ok {
		*se = e
	}
	return ok
}
