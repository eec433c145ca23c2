package jobs

import (
	"plumbline/jobs/config"
	"plumbline/risk/pack"
)

// Params turns the configuration into the pure parameters of a pack.
func Params(cfg *config.Config) (pack.Params, error) {
	r := cfg.Risk
	p := pack.Params{
		RiskFreeTenorMonths:  r.RiskFreeTenorMonths,
		GrowthConvention:     r.GrowthConvention,
		RollingWindows:       append([]int(nil), r.RollingWindows...),
		EWMALambda:           r.EWMALambda,
		VaRLookbackDays:      r.VaRLookbackDays,
		BacktestDays:         r.BacktestDays,
		LargeFlowFraction:    r.LargeFlowFraction,
		EmpiricalTenorMonths: r.EmpiricalTenorMonths,
		EmpiricalWindowWeeks: r.EmpiricalWindowWeeks,
		BetaWindowWeeks:      r.BetaWindowWeeks,
		StalePriceDays:       r.StalePriceDays,
		UseCurve:             r.UseCurve,
		Scenarios:            cfg.StressScenarios(),
		WorstWindowDays:      cfg.Stress.WorstWindowDays,
		Limits:               cfg.RiskLimits(),
		Drift:                pack.DriftParams{ZThreshold: cfg.Drift.ZThreshold, MinHistory: cfg.Drift.MinHistory},
		HistoryDays:          r.ChartDays,
	}
	ws, err := cfg.ReplayWindows()
	if err != nil {
		return p, err
	}
	for _, w := range ws {
		p.Replays = append(p.Replays, pack.NamedWindow{Name: w.Name, From: w.From, To: w.To})
	}
	return p, p.Validate()
}
