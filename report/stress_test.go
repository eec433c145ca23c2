package report

import (
	"slices"
	"testing"

	"plumbline/risk/pack"
)

// A holding that fails in several scenarios for one reason is one note
// naming the scenarios, not one note per scenario.
func TestFailedNotes(t *testing.T) {
	fail := func(id, reason string, share float64) pack.Exclusion {
		return pack.Exclusion{ID: id, Reason: reason, ValueShare: share}
	}
	zero := "valuation: zero dividend"
	ss := []pack.StressResult{
		{Name: "rates +100bp", Failed: []pack.Exclusion{fail("ABSY", zero, 0.0604)}},
		{Name: "rates -100bp", Failed: []pack.Exclusion{fail("ABSY", zero, 0.0604), fail("VRDT", "k - g = -0.0020000000000000018", 0.0551)}},
		{Name: "market -20%"},
		{Name: "growth -1pp", Failed: []pack.Exclusion{fail("ABSY", zero, 0.0604)}},
	}
	want := []string{
		"- ABSY (6.04% of value), in every scenario but market -20%: valuation: zero dividend.",
		"- VRDT (5.51% of value), in rates -100bp: k - g = -0.002.",
	}
	if got := failedNotes(ss); !slices.Equal(got, want) {
		t.Errorf("failedNotes =\n%q\nwant\n%q", got, want)
	}
}
