package pack

import (
	"testing"

	"plumbline/risk/limits"
)

// A limit's status carries the side of its breach level, following the
// headroom convention of risk/limits.Evaluate: on the max side (a
// ceiling) Headroom = Level − Value, on the min side (a floor)
// Headroom = Value − Level; a range is measured to the nearer level, and
// to its maximum when there is no value. Both sides are the same
// subtraction as limits.Evaluate's, so the check is exact.
func TestLimitSide(t *testing.T) {
	p := fxParams()
	p.WorstWindowDays = 5000 // longer than the history: no worst-window loss
	p.Limits = []limits.Limit{
		{Name: "cap", Metric: MetricMaxSingleName, BreachMax: f64(0.4)},
		{Name: "floor", Metric: MetricCashWeight, BreachMin: f64(0.5)},
		{Name: "band near floor", Metric: MetricBeta, BreachMin: f64(0.5), BreachMax: f64(100)},
		{Name: "band near cap", Metric: MetricBeta, BreachMin: f64(-100), BreachMax: f64(1.5)},
		{Name: "band, no data", Metric: MetricWorstWindowLoss, BreachMin: f64(0), BreachMax: f64(0.5)},
		{Name: "floor, no data", Metric: MetricWorstWindowLoss, BreachMin: f64(0)},
	}
	want := map[string]string{
		"cap": "max", "floor": "min", "band near floor": "min", "band near cap": "max",
		"band, no data": "max", "floor, no data": "min",
	}
	doc := mustCompute(t, fxInputs(), p)
	if len(doc.Limits) != len(p.Limits) {
		t.Fatalf("%d limit statuses for %d limits", len(doc.Limits), len(p.Limits))
	}
	for _, l := range doc.Limits {
		if l.Side != want[l.Name] {
			t.Errorf("%s: side %q, want %q", l.Name, l.Side, want[l.Name])
		}
		if l.Status == "no_data" {
			if l.Value != nil || l.Headroom != nil {
				t.Errorf("%s: no data, but value %v headroom %v", l.Name, l.Value, l.Headroom)
			}
			continue
		}
		if l.Value == nil || l.Level == nil || l.Headroom == nil {
			t.Fatalf("%s: status %s without value, level or headroom", l.Name, l.Status)
		}
		room := *l.Level - *l.Value
		if l.Side == "min" {
			room = *l.Value - *l.Level
		}
		if *l.Headroom != room {
			t.Errorf("%s: headroom %v, want %v on the %s side", l.Name, *l.Headroom, room, l.Side)
		}
	}
}
