package stress

// Standard returns the built-in scenario set, in report order:
//
//	rates ±100bp, rates ±200bp      parallel risk-free shift
//	growth -1pp                     long-run growth of every holding
//	rates +100bp & growth -1pp      both at once
//	market -20%                     price move through beta
//	curve steepener / flattener     short end ∓50bp, long end ±50bp
//
// The curve twists are Nelson-Siegel shocks: the long end y(∞) moves with
// the level factor and the short end y(0) with level plus slope, so short
// -50bp / long +50bp is level +50bp, slope -100bp.
// Each call returns a fresh slice.
func Standard() []Scenario {
	return []Scenario{
		{Name: "rates +100bp", Description: "risk-free rates up 100bp, parallel", Shock: Shock{RatesBP: 100}},
		{Name: "rates -100bp", Description: "risk-free rates down 100bp, parallel", Shock: Shock{RatesBP: -100}},
		{Name: "rates +200bp", Description: "risk-free rates up 200bp, parallel", Shock: Shock{RatesBP: 200}},
		{Name: "rates -200bp", Description: "risk-free rates down 200bp, parallel", Shock: Shock{RatesBP: -200}},
		{Name: "growth -1pp", Description: "long-run growth of every holding one point lower", Shock: Shock{GrowthPP: -1}},
		{Name: "rates +100bp & growth -1pp", Description: "rates up 100bp and growth one point lower", Shock: Shock{RatesBP: 100, GrowthPP: -1}},
		{Name: "market -20%", Description: "market down 20%, passed to each holding through its beta", Shock: Shock{MarketMove: -0.20}},
		{Name: "curve steepener", Description: "short end -50bp, long end +50bp (Nelson-Siegel level +50bp, slope -100bp)", Shock: Shock{NSLevelBP: 50, NSSlopeBP: -100}},
		{Name: "curve flattener", Description: "short end +50bp, long end -50bp (Nelson-Siegel level -50bp, slope +100bp)", Shock: Shock{NSLevelBP: -50, NSSlopeBP: 100}},
	}
}
