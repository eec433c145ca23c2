package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// Golden output of `plumbline sql` with a SELECT over current_runs and
// run_metrics on the shared fixture. Values are rounded in SQL so the
// golden file holds no digits beyond what the table is for.
func TestSQLGolden(t *testing.T) {
	f := sharedFixture(t)
	const q = `SELECT r.id, r.portfolio_id, r.as_of, r.revision, round(m.value, 6) AS duration_modified
FROM current_runs r JOIN run_metrics m ON m.run_id = r.id
WHERE m.scope = 'portfolio' AND m.metric = 'duration_modified'
ORDER BY r.portfolio_id, r.as_of`
	stdout, stderr, code := runCmd(t, "sql", "--db", f.db, q)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	checkGolden(t, filepath.Join("testdata", "sql", "select", "want.txt"), stdout)
	if strings.Contains(stdout, "\n"+runArg(f.superseded)+" ") {
		t.Errorf("superseded run %d in current_runs:\n%s", f.superseded, stdout)
	}
}

// A statement that would change the database is refused (non-zero exit)
// and changes nothing.
func TestSQLRefusesWrites(t *testing.T) {
	f := sharedFixture(t)
	path := copyFixture(t)
	count := func() string {
		t.Helper()
		out, stderr, code := runCmd(t, "sql", "--db", path, "SELECT count(*) AS n FROM runs")
		if code != exitOK {
			t.Fatalf("count: exit %d: %s", code, stderr)
		}
		return out
	}
	before := count()
	for _, q := range []string{"DELETE FROM runs", "UPDATE runs SET reason = 'x'", "DROP TABLE run_metrics"} {
		stdout, stderr, code := runCmd(t, "sql", "--db", path, q)
		if code == exitOK || stdout != "" || !strings.Contains(stderr, "refused") {
			t.Errorf("%s: exit %d, stdout %q, stderr %q", q, code, stdout, stderr)
		}
	}
	if after := count(); after != before || !strings.Contains(before, "\n"+runArg(int64(3*len(f.portfolios)+1))+"\n") {
		t.Errorf("runs before %q, after %q", before, after)
	}
}
