package limits

import (
	"fmt"
	"math"
)

// State is the outcome of one limit.
type State string

// States, from best to worst; NoData when the metric has no value.
const (
	StateOK      State = "ok"
	StateWarning State = "warning"
	StateBreach  State = "breach"
	StateNoData  State = "no-data"
)

// Side is the bound a status is measured against.
type Side string

// Sides of a limit.
const (
	SideMax Side = "max"
	SideMin Side = "min"
)

// Values are the measured metrics of one run.
type Values struct {
	// Metrics maps a metric name (see Metrics) to its value.
	Metrics map[string]float64
	// ScenarioLoss maps a scenario name to its full-revaluation loss as a
	// positive fraction of portfolio value (−PnLPct): the value of a
	// scenario_loss limit.
	ScenarioLoss map[string]float64
}

// Status is one limit's outcome.
type Status struct {
	Name     string
	Metric   string
	Scenario string
	// Value is the metric's value; zero when Status is StateNoData.
	Value  float64
	Status State
	// Side and Level are the breach level the headroom is measured to:
	// the only one, or for a range the nearer one (max on a tie).
	Side  Side
	Level float64
	// Headroom is the distance to Level in the metric's unit: Level − Value
	// on the max side, Value − Level on the min side. It is positive while
	// within the limit and zero or negative in breach.
	Headroom float64
	// HeadroomFrac is Headroom/|Level| (0.25 = 25% of the level); it is
	// undefined, and HasFrac false, when Level is zero.
	HeadroomFrac float64
	HasFrac      bool
}

// Evaluate checks each limit against its value, in the order given.
//
// A maximum side is in breach when value >= breach_max and warns when
// value >= warn_max; a minimum side is in breach when value <= breach_min
// and warns when value <= warn_min. A value exactly at a level therefore
// takes that level's state, and breach wins over warning. A limit whose
// value is absent is StateNoData.
//
// Invalid limits and duplicate names (ErrLimit) and non-finite values
// (ErrValue) are errors.
func Evaluate(ls []Limit, v Values) ([]Status, error) {
	seen := make(map[string]bool, len(ls))
	out := make([]Status, 0, len(ls))
	for _, l := range ls {
		if err := l.Validate(); err != nil {
			return nil, err
		}
		if seen[l.Name] {
			return nil, fmt.Errorf("%w: duplicate limit name %q", ErrLimit, l.Name)
		}
		seen[l.Name] = true
		st := Status{Name: l.Name, Metric: l.Metric, Scenario: l.Scenario}
		var x float64
		var ok bool
		if l.Scope() == ScopeScenario {
			x, ok = v.ScenarioLoss[l.Scenario]
		} else {
			x, ok = v.Metrics[l.Metric]
		}
		if ok && (math.IsNaN(x) || math.IsInf(x, 0)) {
			return nil, fmt.Errorf("%w: limit %q: %s is %v", ErrValue, l.Name, l.Metric, x)
		}
		evaluate(&st, l, x, ok)
		out = append(out, st)
	}
	return out, nil
}

func evaluate(st *Status, l Limit, x float64, ok bool) {
	hiRoom, loRoom := math.Inf(1), math.Inf(1)
	if l.BreachMax != nil {
		hiRoom = *l.BreachMax - x
	}
	if l.BreachMin != nil {
		loRoom = x - *l.BreachMin
	}
	if l.BreachMax != nil && (l.BreachMin == nil || !ok || hiRoom <= loRoom) {
		st.Side, st.Level, st.Headroom = SideMax, *l.BreachMax, hiRoom
	} else {
		st.Side, st.Level, st.Headroom = SideMin, *l.BreachMin, loRoom
	}
	if !ok {
		st.Status, st.Headroom = StateNoData, 0
		return
	}
	st.Value = x
	if st.Level != 0 {
		st.HeadroomFrac, st.HasFrac = st.Headroom/math.Abs(st.Level), true
	}
	switch {
	case l.BreachMax != nil && x >= *l.BreachMax, l.BreachMin != nil && x <= *l.BreachMin:
		st.Status = StateBreach
	case l.WarnMax != nil && x >= *l.WarnMax, l.WarnMin != nil && x <= *l.WarnMin:
		st.Status = StateWarning
	default:
		st.Status = StateOK
	}
}
