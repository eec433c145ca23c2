package limits

import (
	"errors"
	"math"
	"testing"
)

// TestLimitProblems: each malformed limit is refused naming the field as
// written in the configuration file (the documented contract with config).
func TestLimitProblems(t *testing.T) {
	cases := []struct {
		name  string
		l     Limit
		field string // "-" for no problem
	}{
		{"good max", Limit{Name: "a", Metric: "beta", WarnMax: f(1.2), BreachMax: f(1.4)}, "-"},
		{"good range", Limit{Name: "a", Metric: "duration_modified", BreachMin: f(10), WarnMin: f(12), WarnMax: f(28), BreachMax: f(30)}, "-"},
		{"warn equal breach", Limit{Name: "a", Metric: "beta", WarnMax: f(1.4), BreachMax: f(1.4)}, "-"},
		{"no name", Limit{Metric: "beta", BreachMax: f(1)}, "name"},
		{"unknown metric", Limit{Name: "a", Metric: "duration", BreachMax: f(1)}, "metric"},
		{"scenario missing", Limit{Name: "a", Metric: "scenario_loss", BreachMax: f(0.1)}, "scenario"},
		{"scenario on a portfolio metric", Limit{Name: "a", Metric: "beta", Scenario: "x", BreachMax: f(1)}, "scenario"},
		{"no breach", Limit{Name: "a", Metric: "beta"}, ""},
		{"warn_max without breach_max", Limit{Name: "a", Metric: "beta", WarnMax: f(1), BreachMin: f(0)}, "warn_max"},
		{"warn_max beyond breach_max", Limit{Name: "a", Metric: "beta", WarnMax: f(1.5), BreachMax: f(1.4)}, "warn_max"},
		{"warn_min without breach_min", Limit{Name: "a", Metric: "beta", WarnMin: f(1), BreachMax: f(2)}, "warn_min"},
		{"warn_min beyond breach_min", Limit{Name: "a", Metric: "cash_weight", WarnMin: f(-0.01), BreachMin: f(0)}, "warn_min"},
		{"empty ok zone", Limit{Name: "a", Metric: "duration_modified", BreachMin: f(10), WarnMin: f(20), WarnMax: f(20), BreachMax: f(30)}, ""},
		{"crossed breaches", Limit{Name: "a", Metric: "duration_modified", BreachMin: f(30), BreachMax: f(10)}, ""},
		{"NaN level", Limit{Name: "a", Metric: "beta", BreachMax: f(math.NaN())}, "breach_max"},
	}
	for _, c := range cases {
		ps := c.l.Problems()
		if c.field == "-" {
			if len(ps) != 0 || c.l.Validate() != nil {
				t.Errorf("%s: problems %v, want none", c.name, ps)
			}
			continue
		}
		if len(ps) != 1 || ps[0].Field != c.field {
			t.Errorf("%s: problems %v, want one on field %q", c.name, ps, c.field)
			continue
		}
		if err := c.l.Validate(); !errors.Is(err, ErrLimit) {
			t.Errorf("%s: Validate = %v, want ErrLimit", c.name, err)
		}
	}
}

// TestMetricsList: names unique, units from the documented set, every
// entry described, Lookup agrees, Metrics returns a copy.
func TestMetricsList(t *testing.T) {
	units := map[string]bool{"years": true, "years²": true, "ratio": true, "decimal": true}
	seen := map[string]bool{}
	ms := Metrics()
	for _, m := range ms {
		if seen[m.Name] || !units[m.Unit] || m.Meaning == "" || m.Scope == "" {
			t.Errorf("bad entry %+v", m)
		}
		seen[m.Name] = true
		if got, ok := Lookup(m.Name); !ok || got != m {
			t.Errorf("Lookup(%q) = %+v, %v", m.Name, got, ok)
		}
	}
	for _, name := range []string{"duration_modified", "volatility_ann_63d", "var_99_1d", "max_single_name_weight", "max_sector_weight", "scenario_loss"} {
		if !seen[name] {
			t.Errorf("metric %s missing", name)
		}
	}
	if _, ok := Lookup("nonsense"); ok {
		t.Error("Lookup(nonsense) found something")
	}
	ms[0].Name = "changed"
	if Metrics()[0].Name == "changed" {
		t.Error("Metrics shares its slice")
	}
}
