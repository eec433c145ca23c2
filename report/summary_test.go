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
	// Value, five returns, the 21-, 63- and 252-day and EWMA volatilities,
	// VaR, ES, four durations and convexity, beta, tracking error and
	// drawdown.
	if followed != 19 {
		t.Errorf("%d summary rows follow a pack metric, want 19", followed)
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

// The breach-level column prints the side the document records
// (pack.LimitStatus.Side, from risk/limits.Evaluate) before the level:
// "max" for a ceiling, "min" for a floor. A document stored before the
// side was recorded shows the level alone; nothing is inferred from the
// headroom, so a side that the headroom's sign would contradict is still
// printed as recorded.
func TestLimitRowsSide(t *testing.T) {
	b := &builder{ccy: "USD"}
	pct := func(x float64) string { return metricOf(pack.MetricMaxSingleName).format(x, "USD") }
	for _, tt := range []struct {
		name                   string
		side                   string
		value, level, headroom *float64
		want                   string
	}{
		{"cap met", "max", f64(0.2), f64(0.3), f64(0.1), "max " + pct(0.3)},
		{"floor breached", "min", f64(0.08), f64(0.1), f64(-0.02), "min " + pct(0.1)},
		{"recorded, not inferred", "max", f64(0.4), f64(0.3), f64(0.1), "max " + pct(0.3)},
		{"no data", "max", nil, f64(0.3), nil, "max " + pct(0.3)},
		{"stored without a side", "", f64(0.2), f64(0.3), f64(0.1), pct(0.3)},
		{"no level", "", nil, nil, nil, NA},
	} {
		l := pack.LimitStatus{Name: tt.name, Metric: pack.MetricMaxSingleName, Side: tt.side, Value: tt.value, Level: tt.level, Headroom: tt.headroom}
		rows := b.limitRows([]pack.LimitStatus{l})
		if got := rows[0].cells[3]; got != tt.want {
			t.Errorf("%s: breach level %q, want %q", tt.name, got, tt.want)
		}
	}
}
