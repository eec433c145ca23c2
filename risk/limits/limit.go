package limits

import (
	"errors"
	"fmt"
	"math"
)

// Errors returned by this package wrap one of these; test with errors.Is.
var (
	// ErrLimit reports a limit that cannot be evaluated.
	ErrLimit = errors.New("limits: invalid limit")
	// ErrValue reports a metric value that is not a finite number.
	ErrValue = errors.New("limits: invalid metric value")
)

// Limit bounds one metric. A maximum side has a breach level and an
// optional warning level at or below it; a minimum side the mirror image;
// a range (duration, say) has both sides. A nil level is absent.
//
// The levels are in the metric's unit (see Metrics): decimals for weights,
// volatilities and losses (0.10 = 10%), years for durations.
type Limit struct {
	Name   string
	Metric string
	// Scenario names the scenario of a scenario_loss limit; empty otherwise.
	Scenario  string
	WarnMax   *float64
	BreachMax *float64
	WarnMin   *float64
	BreachMin *float64
}

// Scope is the scope of the limit's metric ("" for an unknown metric).
func (l Limit) Scope() Scope {
	m, _ := Lookup(l.Metric)
	return m.Scope
}

// FieldError is one problem with a limit. Field is the field as spelled in
// the configuration file (name, metric, scenario, warn_max, breach_max,
// warn_min, breach_min), or empty for the limit as a whole.
type FieldError struct {
	Field string
	Msg   string
}

func (e *FieldError) Error() string {
	if e.Field == "" {
		return e.Msg
	}
	return e.Field + ": " + e.Msg
}

// Unwrap makes every FieldError an ErrLimit.
func (e *FieldError) Unwrap() error { return ErrLimit }

// Problems lists what is wrong with the limit; none means it is usable:
// a name, a known metric, a scenario exactly when the metric is
// scenario_loss, finite levels, a breach level on every side that has a
// warning level, warnings not beyond their breach levels, and a non-empty
// ok zone (the lower of warn_min/breach_min below the upper of
// warn_max/breach_max).
func (l Limit) Problems() []*FieldError {
	var ps []*FieldError
	add := func(field, format string, a ...any) {
		ps = append(ps, &FieldError{Field: field, Msg: fmt.Sprintf(format, a...)})
	}
	if l.Name == "" {
		add("name", "a limit needs a name")
	}
	m, ok := Lookup(l.Metric)
	switch {
	case !ok:
		add("metric", "unknown metric %q", l.Metric)
	case m.Scope == ScopeScenario && l.Scenario == "":
		add("scenario", "metric %s needs the name of a scenario", l.Metric)
	case m.Scope != ScopeScenario && l.Scenario != "":
		add("scenario", "only scenario_loss takes a scenario, not %s", l.Metric)
	}
	levels := []struct {
		field string
		v     *float64
	}{{"warn_max", l.WarnMax}, {"breach_max", l.BreachMax}, {"warn_min", l.WarnMin}, {"breach_min", l.BreachMin}}
	for _, lv := range levels {
		if lv.v != nil && (math.IsNaN(*lv.v) || math.IsInf(*lv.v, 0)) {
			add(lv.field, "level %v is not a finite number", *lv.v)
			return ps
		}
	}
	if l.BreachMax == nil && l.BreachMin == nil {
		add("", "a limit needs breach_max, breach_min or both")
	}
	if l.WarnMax != nil {
		if l.BreachMax == nil {
			add("warn_max", "warn_max needs a breach_max")
		} else if *l.WarnMax > *l.BreachMax {
			add("warn_max", "warning level %v is beyond the breach level %v", *l.WarnMax, *l.BreachMax)
		}
	}
	if l.WarnMin != nil {
		if l.BreachMin == nil {
			add("warn_min", "warn_min needs a breach_min")
		} else if *l.WarnMin < *l.BreachMin {
			add("warn_min", "warning level %v is beyond the breach level %v", *l.WarnMin, *l.BreachMin)
		}
	}
	lo, hi := first(l.WarnMin, l.BreachMin), first(l.WarnMax, l.BreachMax)
	if lo != nil && hi != nil && *lo >= *hi {
		add("", "no value is ok: the lower level %v is not below the upper level %v", *lo, *hi)
	}
	return ps
}

// Validate returns the limit's problems joined, each wrapping ErrLimit.
func (l Limit) Validate() error {
	ps := l.Problems()
	if len(ps) == 0 {
		return nil
	}
	errs := make([]error, len(ps))
	for i, p := range ps {
		errs[i] = fmt.Errorf("limit %q: %w", l.Name, p)
	}
	return errors.Join(errs...)
}

func first(a, b *float64) *float64 {
	if a != nil {
		return a
	}
	return b
}
