package main

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"plumbline/jobs"
)

// TestStats runs the command on one demo database: the golden outputs,
// the refusals, then a security's returns against its prices file.
func TestStats(t *testing.T) {
	db := demoDB(t)
	t.Run("golden", func(t *testing.T) { statsGolden(t, db) })
	t.Run("prices", func(t *testing.T) { statsSecurityFromPrices(t, db) })
}

// The output of `plumbline stats` on the demo scenario for each case
// under testdata/stats/<case>/want.txt.
func statsGolden(t *testing.T, db string) {
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"portfolio", []string{"--portfolio", "INCOME"}},
		{"security", []string{"--security", "RLAG"}},
		{"security-json", []string{"--security", "OTRM", "--json"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			args := append([]string{"stats", "--db", db, "--as-of", fixtureAsOf}, tc.args...)
			stdout, stderr, code := runCmd(t, args...)
			if code != exitOK {
				t.Fatalf("exit %d, stderr %q", code, stderr)
			}
			checkGolden(t, filepath.Join("testdata", "stats", tc.name, "want.txt"), stdout)
		})
	}
	for _, tc := range []struct {
		args   []string
		code   int
		stderr string
	}{
		{[]string{"--security", "RLAG", "--portfolio", "INCOME"}, exitUsage, "exclude each other"},
		{[]string{"--security", "NOPE"}, exitFailure, "security is not loaded"},
		{[]string{"--as-of", "27/11/2026"}, exitUsage, "not a YYYY-MM-DD date"},
	} {
		_, stderr, code := runCmd(t, append([]string{"stats", "--db", db}, tc.args...)...)
		if code != tc.code || !strings.Contains(stderr, tc.stderr) {
			t.Errorf("stats %v: exit %d, stderr %q; want exit %d and %q", tc.args, code, stderr, tc.code, tc.stderr)
		}
	}
}

// statsSecurityFromPrices: the whole-period total return and the last
// day's return printed for a security equal the contract's rule applied
// directly to the generated prices file, r_t = s_t·(P_t + D_t)/P_{t−1} − 1
// linked over the period. OTRM has a 3-for-2 split and dividends in the
// demo, so the split and dividend terms both count.
func statsSecurityFromPrices(t *testing.T, db string) {
	inputs := filepath.Join(filepath.Dir(db), "inputs", "prices.csv")
	f, err := os.Open(inputs)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	num := func(s string, empty float64) float64 {
		if s == "" {
			return empty
		}
		x, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		return x
	}
	growth, last, prev, splits, divs := 1.0, 0.0, 0.0, 0, 0
	for _, r := range rows[1:] {
		if r[1] != "OTRM" || r[0] > fixtureAsOf {
			continue
		}
		p, d, s := num(r[2], 0), num(r[3], 0), num(r[4], 1)
		if prev > 0 {
			g := s * (p + d) / prev
			growth *= g
			last = g - 1
		}
		if s != 1 {
			splits++
		}
		if d > 0 {
			divs++
		}
		prev = p
	}
	if splits == 0 || divs == 0 {
		t.Fatalf("OTRM has %d splits and %d dividends in the fixture; the test needs both", splits, divs)
	}
	stdout, stderr, code := runCmd(t, "stats", "--db", db, "--as-of", fixtureAsOf, "--security", "OTRM", "--json")
	if code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	var st jobs.SecurityStats
	if err := json.Unmarshal([]byte(stdout), &st); err != nil {
		t.Fatal(err)
	}
	// About 780 products of doubles: a few hundred ulps at most, so 1e-12
	// relative on the growth factor.
	if math.Abs((1+st.TotalReturn)-growth) > 1e-12*growth {
		t.Errorf("total return %.15g, from the prices file %.15g", st.TotalReturn, growth-1)
	}
	if math.Abs(st.LastReturn-last) > 1e-15 {
		t.Errorf("last return %.17g, from the prices file %.17g", st.LastReturn, last)
	}
	// The log return of the period is the log of the growth factor.
	if math.Abs(st.TotalLogReturn-math.Log(growth)) > 1e-12 {
		t.Errorf("total log return %.15g, ln(growth) %.15g", st.TotalLogReturn, math.Log(growth))
	}
}
