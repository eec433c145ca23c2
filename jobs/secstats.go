package jobs

import (
	"context"
	"errors"
	"fmt"
	"time"

	"plumbline/jobs/config"
	"plumbline/risk/returns"
	"plumbline/risk/stats"
	"plumbline/store"
)

// ErrUnknownSecurity is returned for a security id that is not loaded.
var ErrUnknownSecurity = errors.New("security is not loaded")

// SecurityStats are the total-return statistics of one security over its
// price history up to a date. Returns are daily total returns with
// dividends reinvested at the ex-date close (the contract's convention);
// figures that need more history than there is are absent (nil).
type SecurityStats struct {
	SecurityID string `json:"security_id"`
	Name       string `json:"name"`
	Sector     string `json:"sector"`
	From       string `json:"from"` // first price used
	To         string `json:"to"`   // last price used
	Prices     int    `json:"prices"`
	Returns    int    `json:"returns"` // daily returns: Prices - 1

	// Over the whole period: the linked discrete return Π(1+r)−1 and the
	// log return Σ ln(1+r); the latest day's of each.
	TotalReturn    float64 `json:"total_return"`
	TotalLogReturn float64 `json:"total_log_return"`
	LastReturn     float64 `json:"last_return"`
	LastLogReturn  float64 `json:"last_log_return"`

	// Mean daily return, arithmetic (1/n)Σr and geometric (Π(1+r))^(1/n)−1,
	// and each annualised over 252 days: 252·m and (1+g)^252−1.
	MeanDaily               float64 `json:"mean_daily"`
	MeanDailyGeometric      float64 `json:"mean_daily_geometric"`
	MeanAnnualised          float64 `json:"mean_annualised"`
	MeanAnnualisedGeometric float64 `json:"mean_annualised_geometric"`

	// Volatility is the annualised sample standard deviation (×√252) of
	// the latest WindowDays returns of each configured window, then of the
	// whole period (WindowDays = Returns).
	Volatility []SecurityVol `json:"volatility"`
	// EWMAVolatility is the annualised EWMA volatility after the last day.
	EWMAVolatility *float64 `json:"ewma_volatility,omitempty"`

	// Drawdowns of the total-return index: the largest fall from a running
	// peak (a non-positive decimal), its peak and trough dates, the date
	// the peak was regained ("" if not yet), and the fall at the end.
	MaxDrawdown     float64 `json:"max_drawdown"`
	DrawdownPeak    string  `json:"drawdown_peak,omitempty"`
	DrawdownTrough  string  `json:"drawdown_trough,omitempty"`
	DrawdownRecover string  `json:"drawdown_recovered,omitempty"`
	CurrentDrawdown float64 `json:"current_drawdown"`
}

// SecurityVol is the volatility of one window, of discrete and of log
// returns; nil when the history is shorter than the window.
type SecurityVol struct {
	WindowDays int      `json:"window_days"`
	Discrete   *float64 `json:"discrete,omitempty"`
	Log        *float64 `json:"log,omitempty"`
}

// SecurityStatsOf reads the prices of security id dated on or before
// asOf (all of them when asOf is zero) and computes its statistics with
// the configuration's windows and EWMA decay.
func SecurityStatsOf(ctx context.Context, db *store.DB, cfg *config.Config, id string, asOf time.Time) (*SecurityStats, error) {
	// Both reads at one ledger mark, so an ingestion in between cannot
	// split them.
	mark, err := db.LedgerMark(ctx)
	if err != nil {
		return nil, err
	}
	db = db.At(mark)
	secs, err := db.Securities(ctx)
	if err != nil {
		return nil, err
	}
	var sec *store.Security
	for i := range secs {
		if secs[i].ID == id {
			sec = &secs[i]
		}
	}
	if sec == nil {
		return nil, fmt.Errorf("security %q: %w", id, ErrUnknownSecurity)
	}
	all, err := db.Prices(ctx, time.Time{}, asOf)
	if err != nil {
		return nil, err
	}
	var pts []returns.PricePoint
	for _, p := range all {
		if p.SecurityID == id {
			pts = append(pts, returns.PricePoint{Date: p.Date, Close: p.Close, Dividend: p.Dividend, SplitRatio: p.SplitRatio})
		}
	}
	st, err := ComputeSecurityStats(pts, cfg.Risk.RollingWindows, cfg.Risk.EWMALambda)
	if err != nil {
		return nil, fmt.Errorf("security %s: %w", id, err)
	}
	st.SecurityID, st.Name, st.Sector = sec.ID, sec.Name, sec.Sector
	return st, nil
}

// ComputeSecurityStats computes the statistics of a price history (at
// least two prices, dates increasing) with rolling windows in trading days
// and EWMA decay lambda. Identity fields are left empty.
func ComputeSecurityStats(pts []returns.PricePoint, windows []int, lambda float64) (*SecurityStats, error) {
	sr, err := returns.SecurityReturnSeries(pts)
	if err != nil {
		return nil, err
	}
	n := len(sr.Discrete)
	st := &SecurityStats{
		From:          pts[0].Date.Format(time.DateOnly),
		To:            pts[len(pts)-1].Date.Format(time.DateOnly),
		Prices:        len(pts),
		Returns:       n,
		LastReturn:    sr.Discrete[n-1],
		LastLogReturn: sr.Log[n-1],
	}
	if st.TotalReturn, err = returns.Link(sr.Discrete); err != nil {
		return nil, err
	}
	for _, x := range sr.Log {
		st.TotalLogReturn += x
	}
	if st.MeanDaily, err = returns.ArithmeticMean(sr.Discrete); err != nil {
		return nil, err
	}
	if st.MeanDailyGeometric, err = returns.GeometricMeanReturn(sr.Discrete); err != nil {
		return nil, err
	}
	if st.MeanAnnualised, err = returns.AnnualizeMean(st.MeanDaily, stats.TradingDaysPerYear, false); err != nil {
		return nil, err
	}
	if st.MeanAnnualisedGeometric, err = returns.AnnualizeMean(st.MeanDailyGeometric, stats.TradingDaysPerYear, true); err != nil {
		return nil, err
	}
	for _, w := range append(append([]int(nil), windows...), n) {
		v := SecurityVol{WindowDays: w}
		if w >= 2 && w <= n {
			if v.Discrete, err = annualVol(sr.Discrete[n-w:]); err != nil {
				return nil, err
			}
			if v.Log, err = annualVol(sr.Log[n-w:]); err != nil {
				return nil, err
			}
		}
		st.Volatility = append(st.Volatility, v)
	}
	ew, err := stats.EWMAVolatility(sr.Discrete, lambda)
	if err != nil {
		return nil, err
	}
	a, err := stats.AnnualizeVolatility(ew[len(ew)-1], stats.TradingDaysPerYear)
	if err != nil {
		return nil, err
	}
	st.EWMAVolatility = &a
	idx, err := returns.TotalReturnIndex(pts, 1)
	if err != nil {
		return nil, err
	}
	dd, err := stats.Drawdowns(idx)
	if err != nil {
		return nil, err
	}
	st.MaxDrawdown, st.CurrentDrawdown = dd.Max, dd.Current
	if dd.Max < 0 {
		st.DrawdownPeak = pts[dd.Peak].Date.Format(time.DateOnly)
		st.DrawdownTrough = pts[dd.Trough].Date.Format(time.DateOnly)
		if dd.Recovery >= 0 {
			st.DrawdownRecover = pts[dd.Recovery].Date.Format(time.DateOnly)
		}
	}
	return st, nil
}

// annualVol is the sample standard deviation of daily returns ×√252.
func annualVol(r []float64) (*float64, error) {
	s, err := stats.StdDev(r)
	if err != nil {
		return nil, err
	}
	a, err := stats.AnnualizeVolatility(s, stats.TradingDaysPerYear)
	if err != nil {
		return nil, err
	}
	return &a, nil
}
