package report

import (
	"testing"

	"plumbline/risk/pack"
)

// The summary looks figures up in Document.Drift by pack's own metric
// names (pack.Headline), so every headline row pack follows shows the
// previous run's value and the change, as Drift holds them, and rows pack
// does not follow leave both blank rather than print n/a.
func TestHeadlineUsesPackNames(t *testing.T) {
	doc := fixtureDoc(20)
	tracked := pack.Headline(doc)
	drift := map[string]pack.DriftItem{}
	for _, it := range doc.Drift {
		drift[it.Metric] = it
	}
	followed := 0
	for _, f := range headline(doc) {
		if f.Metric == "" {
			if f.Previous != "" || f.Change != "" {
				t.Errorf("%q is not followed across runs but shows %q, %q", f.Label, f.Previous, f.Change)
			}
			continue
		}
		if _, ok := tracked[f.Metric]; !ok {
			t.Errorf("%q looks up %q, which pack.Headline does not have", f.Label, f.Metric)
			continue
		}
		followed++
		it, ok := drift[f.Metric]
		if !ok || it.Previous == nil || it.Change == nil {
			t.Errorf("%q: fixture lacks the drift of %q", f.Label, f.Metric)
			continue
		}
		mi := metricOf(f.Metric)
		if want := mi.format(*it.Previous, "USD"); f.Previous != want {
			t.Errorf("%q: previous %q, want %q", f.Label, f.Previous, want)
		}
		if want := mi.change(*it.Change, "USD"); f.Change != want {
			t.Errorf("%q: change %q, want %q", f.Label, f.Change, want)
		}
	}
	// Value, five returns, the 63-day and EWMA volatilities, VaR, ES, four
	// durations and convexity, beta, tracking error and drawdown.
	if followed != 17 {
		t.Errorf("%d summary rows follow a pack metric, want 17", followed)
	}
	// Every metric pack follows is labelled on purpose, not by the
	// fallback that turns a name into words.
	for name := range tracked {
		_, known := knownMetrics[name]
		_, loss := lossLabel(name)
		vol := name == pack.VolatilityMetric(63) || name == pack.VolatilityMetric(21) || name == pack.VolatilityMetric(252)
		if !known && !loss && !vol {
			t.Errorf("metric %q has no label of its own (%q)", name, metricOf(name).label)
		}
	}
}

// The side of a limit follows from the headroom convention of
// risk/limits.Evaluate: Level - Value on the max side, Value - Level on
// the min side.
func TestLimitSide(t *testing.T) {
	for _, tt := range []struct {
		name                   string
		value, level, headroom *float64
		want                   string
	}{
		{"cap met", f64(0.2), f64(0.3), f64(0.1), "max"},
		{"cap breached", f64(0.3647), f64(0.30), f64(-0.0647), "max"},
		{"floor met", f64(16.97), f64(10), f64(6.97), "min"},
		{"floor breached", f64(8), f64(10), f64(-2), "min"},
		{"no data", nil, f64(10), nil, ""},
	} {
		l := pack.LimitStatus{Value: tt.value, Level: tt.level, Headroom: tt.headroom}
		if got := limitSide(l); got != tt.want {
			t.Errorf("%s: side %q, want %q", tt.name, got, tt.want)
		}
	}
}
