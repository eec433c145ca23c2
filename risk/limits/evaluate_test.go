package limits

import (
	"errors"
	"math"
	"testing"
)

func f(x float64) *float64 { return &x }

// TestEvaluateBoundaries: a value exactly at a level takes that level's
// state, one ulp inside does not (the convention documented on Evaluate;
// common practice in limit monitoring that "at the limit" counts as
// reaching it). Exact comparisons: the inputs are the levels themselves
// and their nearest floating-point neighbours.
func TestEvaluateBoundaries(t *testing.T) {
	below := func(x float64) float64 { return math.Nextafter(x, math.Inf(-1)) }
	above := func(x float64) float64 { return math.Nextafter(x, math.Inf(1)) }
	maxL := Limit{Name: "var", Metric: "var_99_1d", WarnMax: f(0.02), BreachMax: f(0.03)}
	minL := Limit{Name: "cash", Metric: "cash_weight", WarnMin: f(0.01), BreachMin: f(0)}
	rangeL := Limit{Name: "dur", Metric: "duration_modified", BreachMin: f(10), WarnMin: f(12), WarnMax: f(28), BreachMax: f(30)}
	noWarn := Limit{Name: "name", Metric: "max_single_name_weight", BreachMax: f(0.10)}
	cases := []struct {
		l    Limit
		x    float64
		want State
	}{
		{maxL, below(0.02), StateOK},
		{maxL, 0.02, StateWarning},
		{maxL, below(0.03), StateWarning},
		{maxL, 0.03, StateBreach},
		{maxL, above(0.03), StateBreach},
		{minL, above(0.01), StateOK},
		{minL, 0.01, StateWarning},
		{minL, above(0), StateWarning},
		{minL, 0, StateBreach},
		{minL, -0.05, StateBreach},
		{rangeL, 20, StateOK},
		{rangeL, above(12), StateOK},
		{rangeL, 12, StateWarning},
		{rangeL, above(10), StateWarning},
		{rangeL, 10, StateBreach},
		{rangeL, below(28), StateOK},
		{rangeL, 28, StateWarning},
		{rangeL, below(30), StateWarning},
		{rangeL, 30, StateBreach},
		{noWarn, below(0.10), StateOK},
		{noWarn, 0.10, StateBreach},
	}
	for _, c := range cases {
		st, err := Evaluate([]Limit{c.l}, Values{Metrics: map[string]float64{c.l.Metric: c.x}})
		if err != nil {
			t.Fatal(err)
		}
		if st[0].Status != c.want {
			t.Errorf("%s at %.17g: %s, want %s", c.l.Name, c.x, st[0].Status, c.want)
		}
		if (st[0].Status == StateBreach) != (st[0].Headroom <= 0) {
			t.Errorf("%s at %.17g: headroom %v does not agree with %s", c.l.Name, c.x, st[0].Headroom, st[0].Status)
		}
	}
}

// TestEvaluateHeadroom: headroom is the signed distance to the breach
// level (the nearer one for a range) and its fraction of |level|; values
// worked by hand. Tolerance 1e-15: one subtraction of decimals < 1.
func TestEvaluateHeadroom(t *testing.T) {
	cases := []struct {
		name     string
		l        Limit
		x        float64
		side     Side
		level    float64
		headroom float64
		frac     float64
		hasFrac  bool
	}{
		{"max, room", Limit{Name: "a", Metric: "volatility_ann_63d", BreachMax: f(0.20)}, 0.15, SideMax, 0.20, 0.05, 0.25, true},
		{"max, over", Limit{Name: "a", Metric: "volatility_ann_63d", BreachMax: f(0.20)}, 0.25, SideMax, 0.20, -0.05, -0.25, true},
		{"min, room", Limit{Name: "a", Metric: "cash_weight", BreachMin: f(0.02)}, 0.05, SideMin, 0.02, 0.03, 1.5, true},
		{"min at zero level", Limit{Name: "a", Metric: "cash_weight", BreachMin: f(0)}, 0.05, SideMin, 0, 0.05, 0, false},
		{"range, near top", Limit{Name: "a", Metric: "duration_modified", BreachMin: f(10), BreachMax: f(30)}, 26, SideMax, 30, 4, 4.0 / 30, true},
		{"range, near bottom", Limit{Name: "a", Metric: "duration_modified", BreachMin: f(10), BreachMax: f(30)}, 12, SideMin, 10, 2, 0.2, true},
		{"range, middle is max", Limit{Name: "a", Metric: "duration_modified", BreachMin: f(10), BreachMax: f(30)}, 20, SideMax, 30, 10, 1.0 / 3, true},
	}
	for _, c := range cases {
		st, err := Evaluate([]Limit{c.l}, Values{Metrics: map[string]float64{c.l.Metric: c.x}})
		if err != nil {
			t.Fatal(err)
		}
		s := st[0]
		if s.Side != c.side || s.Level != c.level || s.HasFrac != c.hasFrac ||
			math.Abs(s.Headroom-c.headroom) > 1e-15 || math.Abs(s.HeadroomFrac-c.frac) > 1e-15 || s.Value != c.x {
			t.Errorf("%s: got %+v, want side %s level %v headroom %v frac %v (%v)", c.name, s, c.side, c.level, c.headroom, c.frac, c.hasFrac)
		}
	}
}

// TestEvaluateScenarioAndNoData: scenario_loss reads the scenario's loss;
// a missing value is no-data, never a number.
func TestEvaluateScenarioAndNoData(t *testing.T) {
	ls := []Limit{
		{Name: "rates shock", Metric: "scenario_loss", Scenario: "rates +200bp", WarnMax: f(0.10), BreachMax: f(0.15)},
		{Name: "market shock", Metric: "scenario_loss", Scenario: "market -20%", BreachMax: f(0.25)},
		{Name: "te", Metric: "tracking_error_ann", BreachMax: f(0.06)},
	}
	st, err := Evaluate(ls, Values{
		Metrics:      map[string]float64{"scenario_loss": 0.99}, // must not be read
		ScenarioLoss: map[string]float64{"rates +200bp": 0.12},
	})
	if err != nil {
		t.Fatal(err)
	}
	want := []State{StateWarning, StateNoData, StateNoData}
	for i, s := range st {
		if s.Status != want[i] {
			t.Errorf("%s: %s, want %s", s.Name, s.Status, want[i])
		}
		if s.Status == StateNoData && (s.Value != 0 || s.Headroom != 0 || s.HasFrac) {
			t.Errorf("%s: no-data carries numbers %+v", s.Name, s)
		}
	}
}

// TestEvaluateRefuses: invalid limits, duplicate names and non-finite
// values are typed errors.
func TestEvaluateRefuses(t *testing.T) {
	ok := Limit{Name: "a", Metric: "beta", BreachMax: f(1.5)}
	cases := []struct {
		name string
		ls   []Limit
		v    map[string]float64
		want error
	}{
		{"unknown metric", []Limit{{Name: "a", Metric: "betta", BreachMax: f(1)}}, nil, ErrLimit},
		{"duplicate", []Limit{ok, ok}, nil, ErrLimit},
		{"NaN value", []Limit{ok}, map[string]float64{"beta": math.NaN()}, ErrValue},
		{"Inf value", []Limit{ok}, map[string]float64{"beta": math.Inf(-1)}, ErrValue},
	}
	for _, c := range cases {
		if _, err := Evaluate(c.ls, Values{Metrics: c.v}); !errors.Is(err, c.want) {
			t.Errorf("%s: err = %v, want %v", c.name, err, c.want)
		}
	}
}
