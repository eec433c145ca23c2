package config

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"plumbline/risk/limits"
	"plumbline/risk/stress"
)

// TestStressDefaults: with no [stress], [[scenario]] or [[limit]] the run
// uses the built-in set, a 10-day worst window and no limits (the defaults
// in Default).
func TestStressDefaults(t *testing.T) {
	c, err := Parse("test.toml", nil)
	if err != nil {
		t.Fatal(err)
	}
	if c.Stress.WorstWindowDays != 10 || !c.Stress.UseStandardSet || len(c.Stress.Replays) != 0 {
		t.Errorf("Stress = %+v, want 10 days, standard set, no replays", c.Stress)
	}
	got, want := c.StressScenarios(), stress.Standard()
	if len(got) != len(want) {
		t.Fatalf("%d scenarios, want the %d built-in ones", len(got), len(want))
	}
	for i := range got {
		if got[i].Name != want[i].Name {
			t.Errorf("scenario %d = %q, want %q", i, got[i].Name, want[i].Name)
		}
	}
	if len(c.RiskLimits()) != 0 {
		t.Errorf("limits %v, want none", c.RiskLimits())
	}
}

// TestScenarioUnits: the file's units become the package's decimals
// (1bp = 0.0001, 1% = 0.01: common practice); growth stays in pp, as
// stress.Shock takes it. Tolerance 1e-15: one division of a short decimal.
func TestScenarioUnits(t *testing.T) {
	doc := `
[stress]
use_standard_set = false

[[scenario]]
name = "stagflation"
description = "rates up, premium up, growth down"
rates_bp = 150
erp_bp = 50
growth_pp = -1.5
growth_by_sector = { "Utilities" = -0.5, "Energy" = 0.25 }
beta_shift = 0.1
beta_scale = 1.2
market_move_pct = -15
ns_level_bp = 25
ns_slope_bp = -40
ns_curvature_bp = 10
`
	c, err := Parse("test.toml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	scs := c.StressScenarios()
	if len(scs) != 1 || scs[0].Name != "stagflation" || scs[0].Description == "" {
		t.Fatalf("scenarios = %+v, want only stagflation", scs)
	}
	s := scs[0].Shock
	checks := []struct {
		name      string
		got, want float64
	}{
		{"RatesBP", s.RatesBP, 150}, {"ERP", s.ERP, 0.005}, {"GrowthPP", s.GrowthPP, -1.5},
		{"Utilities", s.GrowthBySector["Utilities"], -0.5}, {"Energy", s.GrowthBySector["Energy"], 0.25},
		{"BetaShift", s.BetaShift, 0.1}, {"BetaScale", s.BetaScale, 1.2}, {"MarketMove", s.MarketMove, -0.15},
		{"NSLevelBP", s.NSLevelBP, 25}, {"NSSlopeBP", s.NSSlopeBP, -40}, {"NSCurvatureBP", s.NSCurvatureBP, 10},
	}
	for _, ch := range checks {
		if math.Abs(ch.got-ch.want) > 1e-15 {
			t.Errorf("%s = %v, want %v", ch.name, ch.got, ch.want)
		}
	}
}

// TestLimitConversion: [[limit]] tables become limits.Limit with absent
// levels nil, and evaluate as written.
func TestLimitConversion(t *testing.T) {
	doc := `
[[limit]]
name = "duration range"
metric = "duration_modified"
breach_min = 10
warn_min = 12
warn_max = 28
breach_max = 30

[[limit]]
name = "rates +200bp loss"
metric = "scenario_loss"
scenario = "rates +200bp"
warn_max = 0.20
breach_max = 0.25
`
	c, err := Parse("test.toml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	ls := c.RiskLimits()
	if len(ls) != 2 || ls[0].WarnMin == nil || *ls[0].BreachMax != 30 || ls[1].WarnMin != nil || ls[1].Scenario != "rates +200bp" {
		t.Fatalf("limits = %+v", ls)
	}
	st, err := limits.Evaluate(ls, limits.Values{
		Metrics:      map[string]float64{"duration_modified": 28},
		ScenarioLoss: map[string]float64{"rates +200bp": 0.1},
	})
	if err != nil {
		t.Fatal(err)
	}
	if st[0].Status != limits.StateWarning || st[1].Status != limits.StateOK {
		t.Errorf("statuses %s, %s; want warning (at warn_max), ok", st[0].Status, st[1].Status)
	}
}

// TestStressConfigErrors: each mistake is refused at load with the file,
// the line of the offending key (or of its table when the key is not
// written) and the problem.
func TestStressConfigErrors(t *testing.T) {
	cases := []struct {
		name string
		doc  string
		want []string // substrings of the error text
	}{
		{"typo in scenario key", `
[[scenario]]
name = "x"
rate_bp = 100
`, []string{"test.toml:4:", "rate_bp", "unknown key"}},
		{"typo in limit key", `
[[limit]]
name = "beta"
metric = "beta"
breach_maximum = 1.5
`, []string{"test.toml:5:", "breach_maximum", "unknown key"}},
		{"unknown metric", `
[[limit]]
name = "vol"
metric = "volatility_63d"
breach_max = 0.2
`, []string{"test.toml:4:", "limit.0.metric", `unknown metric "volatility_63d"`, `did you mean "volatility_ann_63d"?`}},
		{"warning beyond breach", `
[[limit]]
name = "single name"
metric = "max_single_name_weight"
warn_max = 0.12
breach_max = 0.10
`, []string{"test.toml:5:", "limit.0.warn_max", "beyond the breach level"}},
		{"warning below breach minimum", `
[[limit]]
name = "cash"
metric = "cash_weight"
warn_min = -0.01
breach_min = 0
`, []string{"test.toml:5:", "limit.0.warn_min", "beyond the breach level"}},
		{"no breach level", `
[[limit]]
name = "beta"
metric = "beta"
`, []string{"test.toml:2:", "needs breach_max"}},
		{"duplicate limit", `
[[limit]]
name = "beta"
metric = "beta"
breach_max = 1.5

[[limit]]
name = "beta"
metric = "beta"
breach_max = 1.4
`, []string{"test.toml:8:", "limit.1.name", "already used at line 2"}},
		{"scenario loss without scenario", `
[[limit]]
name = "loss"
metric = "scenario_loss"
breach_max = 0.2
`, []string{"test.toml:2:", "limit.0.scenario", "needs the name of a scenario"}},
		{"limit names unknown scenario", `
[[limit]]
name = "loss"
metric = "scenario_loss"
scenario = "rates +200 bp"
breach_max = 0.2
`, []string{"test.toml:5:", "limit.0.scenario", `unknown scenario "rates +200 bp"`, `did you mean "rates +200bp"?`}},
		{"limit names a built-in scenario that is switched off", `
[stress]
use_standard_set = false

[[limit]]
name = "loss"
metric = "scenario_loss"
scenario = "market -20%"
breach_max = 0.2
`, []string{"test.toml:8:", `unknown scenario "market -20%" (it is built in, but stress.use_standard_set is false)`}},
		{"scenario with no shock", `
[[scenario]]
name = "ok"
rates_bp = 50

[[scenario]]
name = "empty"
description = "forgot the numbers"
growth_by_sector = { "Energy" = 0 }
`, []string{"test.toml:6:", "scenario.1:", `"empty" shocks nothing`}},
		{"duplicate scenario", `
[[scenario]]
name = "twist"
ns_slope_bp = 50

[[scenario]]
name = "twist"
ns_slope_bp = -50
`, []string{"test.toml:7:", "scenario.1.name", "already used at line 2"}},
		{"built-in name", `
[[scenario]]
name = "market -20%"
market_move_pct = -25
`, []string{"test.toml:3:", "built-in scenario"}},
		{"scenario without name", `
[[scenario]]
rates_bp = 50
`, []string{"test.toml:2:", "scenario.0.name", "needs a name"}},
		{"beta scale zero", `
[[scenario]]
name = "flat betas"
beta_scale = 0
`, []string{"test.toml:4:", "scenario.0.beta_scale", "leave it out"}},
		{"market down 100%", `
[[scenario]]
name = "wipe-out"
market_move_pct = -100
`, []string{"test.toml:4:", "market_move_pct", "outside (-100, 500]"}},
		{"rates in percent by mistake", `
[[scenario]]
name = "big"
rates_bp = 30000
`, []string{"test.toml:4:", "rates_bp", "outside ±2000bp"}},
		{"sector shift too large", `
[[scenario]]
name = "sector"
growth_by_sector = { "Energy" = -50 }
`, []string{"test.toml:4:", "growth_by_sector", `sector "Energy"`}},
		{"infinite growth", `
[[scenario]]
name = "inf"
growth_pp = -inf
`, []string{"test.toml:4:", "growth_pp"}},
		{"window days", `
[stress]
worst_window_days = 0
`, []string{"test.toml:3:", "stress.worst_window_days", "outside 1..2520"}},
		{"replay reversed", `
[[stress.replay]]
name = "sell-off"
from = 2022-10-15
to = 2022-09-01
`, []string{"test.toml:5:", "stress.replay.0.to", "before it starts 2022-10-15"}},
		{"replay bad string date", `
[[stress.replay]]
name = "sell-off"
from = "2022-13-01"
to = "2022-12-01"
`, []string{"test.toml:4:", "stress.replay.0.from", "not a date"}},
		{"replay date with time", `
[[stress.replay]]
name = "sell-off"
from = 2022-09-01T10:00:00Z
to = 2022-12-01
`, []string{"test.toml:4:", "without a time"}},
		{"replay missing date", `
[[stress.replay]]
name = "sell-off"
from = 2022-09-01
`, []string{"test.toml:2:", "stress.replay.0.to", "required"}},
		{"duplicate replay", `
[[stress.replay]]
name = "a"
from = 2022-09-01
to = 2022-09-30

[[stress.replay]]
name = "a"
from = "2023-09-01"
to = "2023-09-30"
`, []string{"test.toml:8:", "already used at line 2"}},
		// Scenarios, replays and the worst-window replay share the
		// scenario scope of the stored metrics, keyed by name.
		{"replay named as a built-in scenario", `
[[stress.replay]]
name = "market -20%"
from = 2022-09-01
to = 2022-09-30
`, []string{"test.toml:3:", "stress.replay.0.name", `"market -20%" is already a scenario's name (built in)`}},
		{"replay named as a scenario table", `
[[scenario]]
name = "twist"
ns_slope_bp = 50

[[stress.replay]]
name = "twist"
from = 2022-09-01
to = 2022-09-30
`, []string{"test.toml:7:", "stress.replay.0.name", `"twist" is already a scenario's name (line 2)`}},
		{"replay named as the worst window", `
[[stress.replay]]
name = "worst 10-day window"
from = 2022-09-01
to = 2022-09-30
`, []string{"test.toml:3:", "stress.replay.0.name", "worst-window replay (stress.worst_window_days = 10)"}},
		{"replay named as a configured worst window", `
[stress]
worst_window_days = 20

[[stress.replay]]
name = "worst 20-day window"
from = 2022-09-01
to = 2022-09-30
`, []string{"test.toml:6:", "stress.replay.0.name", "worst-window replay (stress.worst_window_days = 20)"}},
		{"scenario named as the worst window", `
[[scenario]]
name = "worst 10-day window"
rates_bp = 50
`, []string{"test.toml:3:", "scenario.0.name", "worst-window replay"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("test.toml", []byte(c.doc))
			if err == nil {
				t.Fatal("accepted")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			var es Errors
			var e *Error
			if !errors.As(err, &es) && !errors.As(err, &e) {
				t.Errorf("error %T is neither Errors nor *Error", err)
			}
		})
	}
}

// TestReplayNamesAccepted: a name is refused only where it clashes: a
// built-in scenario's name is free when the standard set is off, and a
// worst-window name of another length is an ordinary name.
func TestReplayNamesAccepted(t *testing.T) {
	for name, doc := range map[string]string{
		"standard set off": `
[stress]
use_standard_set = false

[[stress.replay]]
name = "market -20%"
from = 2022-09-01
to = 2022-09-30
`,
		"another window length": `
[[stress.replay]]
name = "worst 20-day window"
from = 2022-09-01
to = 2022-09-30
`,
	} {
		if _, err := Parse("test.toml", []byte(doc)); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
}

// TestCheckSectors: sectors unknown to the store are refused with the
// line of the entry (a dotted key) or of growth_by_sector (an inline
// table), and a case slip gets the intended name.
func TestCheckSectors(t *testing.T) {
	doc := `
[[scenario]]
name = "inline"
growth_by_sector = { "Utilities" = -0.5, "utilities " = -0.1 }

[[scenario]]
name = "dotted"
growth_by_sector.Energy = -1
growth_by_sector.Mining = -1
`
	c, err := Parse("test.toml", []byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	err = c.CheckSectors([]string{"Energy", "Utilities", "Health"})
	var es Errors
	if !errors.As(err, &es) || len(es) != 2 {
		t.Fatalf("err = %v, want two errors", err)
	}
	wants := [][]string{
		{"test.toml:4:", `unknown sector "utilities "`, `did you mean "Utilities"?`},
		{"test.toml:9:", `unknown sector "Mining"`, "known: Energy, Health, Utilities"},
	}
	for i, w := range wants {
		for _, s := range w {
			if !strings.Contains(es[i].Error(), s) {
				t.Errorf("error %d %q does not contain %q", i, es[i], s)
			}
		}
	}
	if err := c.CheckSectors([]string{"Energy", "Utilities", "utilities ", "Mining"}); err != nil {
		t.Errorf("all sectors known: %v", err)
	}
}

// TestReplayDates: a TOML date and a string date are the same window at
// UTC midnight, and the canonical form does not depend on the spelling.
func TestReplayDates(t *testing.T) {
	a, err := Parse("a.toml", []byte("[[stress.replay]]\nname = \"w\"\nfrom = 2022-09-01\nto = 2022-10-14\n"))
	if err != nil {
		t.Fatal(err)
	}
	b, err := Parse("b.toml", []byte("[[stress.replay]]\nname = \"w\"\nfrom = \"2022-09-01\"\nto = \"2022-10-14\"\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := ReplayWindow{Name: "w", From: time.Date(2022, 9, 1, 0, 0, 0, 0, time.UTC), To: time.Date(2022, 10, 14, 0, 0, 0, 0, time.UTC)}
	for _, c := range []*Config{a, b} {
		ws, err := c.ReplayWindows()
		if err != nil {
			t.Fatal(err)
		}
		if len(ws) != 1 || ws[0] != want {
			t.Errorf("%s: windows %+v, want %+v", c.Path(), ws, want)
		}
	}
	ca, _ := a.Canonical()
	cb, _ := b.Canonical()
	if !bytes.Equal(ca, cb) {
		t.Errorf("canonical forms differ:\n%s\n%s", ca, cb)
	}
	r, err := FromCanonical(ca)
	if err != nil {
		t.Fatal(err)
	}
	if ws, err := r.ReplayWindows(); err != nil || len(ws) != 1 || ws[0] != want {
		t.Errorf("stored run: windows %+v, %v", ws, err)
	}
}
