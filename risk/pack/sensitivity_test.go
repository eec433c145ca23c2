package pack

import (
	"testing"
)

// A sector's duration and growth-duration contributions are the sums of
// its holdings' contributions w_i·D_i (valuation.Aggregate; contributions
// summing to the portfolio figure is the definition of a contribution,
// common practice). Summed from zero in holding order, as Aggregate
// does, they agree exactly; over all sectors they give the portfolio
// figure to 1e-12 relative (the same terms in another order). A sector
// whose only holding is excluded has no contribution, and a sector that
// happens to be called like the cash line's (valuation.CashSector) holds
// only its securities' contributions.
func TestSectorContributions(t *testing.T) {
	cashNamed := fxInputs()
	for i := range cashNamed.Securities {
		if cashNamed.Securities[i].ID == "BRKW" {
			cashNamed.Securities[i].Sector = "Cash"
		}
	}
	for name, in := range map[string]*Inputs{"fixture": fxInputs(), "a sector called Cash": cashNamed} {
		doc := mustCompute(t, in, fxParams())
		var totD, totG float64
		for _, sc := range doc.Sectors {
			var d, g float64
			any := false
			for _, h := range doc.Holdings {
				if h.Sector == sc.Name && h.ContribDuration != nil {
					d += *h.ContribDuration
					g += *h.ContribGrowthDuration
					any = true
				}
			}
			if !any {
				if sc.ContribDuration != nil || sc.ContribGrowthDuration != nil {
					t.Errorf("%s: sector %s has no valued holding but contributions %v, %v", name, sc.Name, sc.ContribDuration, sc.ContribGrowthDuration)
				}
				continue
			}
			if sc.ContribDuration == nil || *sc.ContribDuration != d || sc.ContribGrowthDuration == nil || *sc.ContribGrowthDuration != g {
				t.Errorf("%s: sector %s contributions %v, %v; want %v, %v", name, sc.Name, sc.ContribDuration, sc.ContribGrowthDuration, d, g)
			}
			totD += d
			totG += g
		}
		s := doc.Summary
		if !relClose(totD, *s.ModifiedDuration, 1e-12) || !relClose(totG, *s.GrowthDuration, 1e-12) {
			t.Errorf("%s: sectors sum to %v, %v; portfolio %v, %v", name, totD, totG, *s.ModifiedDuration, *s.GrowthDuration)
		}
		if name == "a sector called Cash" && !hasSector(doc, "Cash") {
			t.Errorf("%s: no sector Cash", name)
		}
	}
}

func hasSector(doc *Document, name string) bool {
	for _, sc := range doc.Sectors {
		if sc.Name == name && sc.ContribDuration != nil {
			return true
		}
	}
	return false
}
