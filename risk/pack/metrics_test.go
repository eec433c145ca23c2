package pack

import (
	"cmp"
	"slices"
	"testing"
)

// Metrics once added every Headline figure first and then each again
// explicitly, leaving the sort and compaction to drop the copies. Every
// headline figure is added explicitly, so merging Headline back in that
// way must change nothing: the same entries with the same values in the
// same order. The reference is that former construction, rebuilt here;
// the comparison is exact (the same float64 read from the same field).
func TestMetricsNeedNoHeadlineCopies(t *testing.T) {
	all := fxParams()
	all.RollingWindows = []int{21, 63, 252}
	for name, doc := range map[string]*Document{
		"fixture":        mustCompute(t, fxInputs(), fxParams()),
		"three windows":  mustCompute(t, fxInputs(), all),
		"single holding": mustCompute(t, fxSingle(), fxParams()),
	} {
		got := Metrics(doc)
		var former []Metric
		for n, v := range Headline(doc) {
			former = append(former, Metric{Scope: ScopePortfolio, Name: n, Value: v})
		}
		former = append(former, got...)
		slices.SortStableFunc(former, func(a, b Metric) int {
			return cmp.Or(cmp.Compare(a.Scope, b.Scope), cmp.Compare(a.Key, b.Key), cmp.Compare(a.Name, b.Name))
		})
		former = slices.CompactFunc(former, func(a, b Metric) bool {
			return a.Scope == b.Scope && a.Key == b.Key && a.Name == b.Name
		})
		if !slices.Equal(got, former) {
			t.Errorf("%s: %d metrics, %d with the headline merged in the former way", name, len(got), len(former))
			for i := range min(len(got), len(former)) {
				if got[i] != former[i] {
					t.Errorf("%s: first difference at %d: %+v, former %+v", name, i, got[i], former[i])
					break
				}
			}
		}
	}
}
