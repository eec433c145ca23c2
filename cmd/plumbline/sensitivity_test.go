package main

import (
	"context"
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"plumbline/jobs"
	"plumbline/jobs/demo"
	"plumbline/store"
)

// fixtureAsOf is the last day of the demo scenario (demo.DefaultEnd).
const fixtureAsOf = "2026-11-27"

// demoDB generates the fictional demo scenario with three years of
// history, ingests it into a new database and returns the database path.
func demoDB(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	in := filepath.Join(dir, "inputs")
	if _, err := demo.Generate(in, demo.Options{Years: 3}); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "plumbline.db")
	ctx := context.Background()
	db, err := store.Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	res, err := jobs.Ingest(ctx, db, []string{in, filepath.Join(in, "holdings")}, jobs.IngestOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range res {
		if r.Outcome == store.Rejected {
			t.Fatalf("demo file %s rejected: %v", r.Name, r.Errors)
		}
	}
	return path
}

// TestSensitivity runs the command on one demo database: the golden
// outputs, then the Gordon check.
func TestSensitivity(t *testing.T) {
	db := demoDB(t)
	t.Run("golden", func(t *testing.T) { sensitivityGolden(t, db) })
	t.Run("gordon", func(t *testing.T) { sensitivityGordon(t, db) })
}

// The output of `plumbline sensitivity` on the demo scenario for each
// case under testdata/sensitivity/<case>/want.txt.
func sensitivityGolden(t *testing.T, db string) {
	for _, tc := range []struct {
		name string
		args []string
	}{
		// Multi-stage and constant-growth models, an estimated beta, and
		// holdings left out (no dividend; k <= g).
		{"portfolio", []string{"--portfolio", "GROWTH"}},
		// One security held by two portfolios.
		{"holding", []string{"--holding", "BTAS"}},
		{"json", []string{"--portfolio", "INCOME", "--holding", "CLWW", "--json"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			args := append([]string{"sensitivity", "--db", db, "--as-of", fixtureAsOf}, tc.args...)
			stdout, stderr, code := runCmd(t, args...)
			if code != exitOK {
				t.Fatalf("exit %d, stderr %q", code, stderr)
			}
			checkGolden(t, filepath.Join("testdata", "sensitivity", tc.name, "want.txt"), stdout)
		})
	}
	if _, stderr, code := runCmd(t, "sensitivity", "--db", db, "--as-of", fixtureAsOf, "--holding", "NOPE"); code != exitFailure ||
		!strings.Contains(stderr, "no portfolio holds NOPE") {
		t.Errorf("unknown holding: exit %d, stderr %q", code, stderr)
	}
}

// sensitivityGordon: for a constant-growth holding paying once a year
// and valued just after a payment, the printed modified duration is the
// closed form of Gordon's model. V = D1/(k − g) (Gordon, 1962; Bodie, Kane
// & Marcus, Investments, chapter "Equity Valuation Models", from memory)
// gives −(1/V)·dV/dk = 1/(k − g). RLAG and QSAG pay annually in the demo
// (jobs/demo/universe.go) and the pack values every holding with the
// dividend just paid.
func sensitivityGordon(t *testing.T, db string) {
	for _, id := range []string{"RLAG", "QSAG"} {
		t.Run(id, func(t *testing.T) {
			base := []string{"sensitivity", "--db", db, "--as-of", fixtureAsOf, "--portfolio", "VALUE", "--holding", id}
			stdout, stderr, code := runCmd(t, base...)
			if code != exitOK {
				t.Fatalf("exit %d, stderr %q", code, stderr)
			}
			var f []string
			for _, line := range strings.Split(stdout, "\n") {
				if fs := strings.Fields(line); len(fs) > 5 && fs[0] == id {
					f = fs
				}
			}
			if f == nil || f[1] != "constant_growth" {
				t.Fatalf("no constant-growth line for %s in:\n%s", id, stdout)
			}
			num := func(s, unit string) float64 {
				t.Helper()
				x, err := strconv.ParseFloat(strings.TrimSuffix(s, unit), 64)
				if err != nil {
					t.Fatalf("%q: %v", s, err)
				}
				return x
			}
			k, g := num(f[2], "%")/100, num(f[3], "%")/100
			mod := num(f[4], "")
			want := 1 / (k - g)
			// k and g are printed to 0.001 percentage point, so each is off
			// by at most 5e-6 and k − g by 1e-5; 1/(k − g) moves by at
			// most want²·1e-5 for that, and the duration is printed to
			// 0.01 (0.005 off at most).
			tol := want*want*1e-5 + 0.005 + 1e-9
			if math.Abs(mod-want) > tol {
				t.Errorf("printed modified duration %v, 1/(k-g) from printed k %v and g %v = %v (tolerance %.4f)", mod, k, g, want, tol)
			}

			// The same with every digit: --json prints the float64 values.
			stdout, stderr, code = runCmd(t, append(base, "--json")...)
			if code != exitOK {
				t.Fatalf("--json: exit %d, stderr %q", code, stderr)
			}
			var docs []sensitivityDoc
			if err := json.Unmarshal([]byte(stdout), &docs); err != nil {
				t.Fatal(err)
			}
			if len(docs) != 1 || len(docs[0].Holdings) != 1 {
				t.Fatalf("--json: %d portfolios", len(docs))
			}
			h := docs[0].Holdings[0]
			if h.K == nil || h.G == nil || h.ModDuration == nil {
				t.Fatalf("--json: k %v, g %v, duration %v", h.K, h.G, h.ModDuration)
			}
			exact := 1 / (*h.K - *h.G)
			// The pack evaluates the closed form through logarithms and
			// expm1; a few ulps of each step, so 1e-12 relative.
			if math.Abs(*h.ModDuration-exact) > 1e-12*exact {
				t.Errorf("--json: modified duration %.15g, 1/(k-g) = %.15g", *h.ModDuration, exact)
			}
		})
	}
}
