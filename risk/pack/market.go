package pack

import (
	"fmt"

	"plumbline/risk/curve"
	"plumbline/risk/valuation"
)

// marketInfo tells where a day's market inputs came from.
type marketInfo struct {
	curve          *YieldCurve
	fit            *curve.FitResult // nil when the fit failed
	fitErr         error
	rfExtrapolated bool
	premDay        int64
}

// marketAt builds the valuation market of a day from the latest data on
// or before it: rf is the zero yield at RiskFreeTenorMonths of the latest
// curve (linear in tenor between observed tenors, the end yield beyond
// them), ERP the latest premium, and Curve the Nelson-Siegel fit
// (curve.Fit) of the same curve, nil when the fit fails.
func (r *run) marketAt(day int64) (valuation.Market, marketInfo, error) {
	d := r.d
	ci := d.curveAt(day)
	if ci < 0 {
		return valuation.Market{}, marketInfo{}, fmt.Errorf("%w: no yield curve on or before %s", ErrNoMarketData, dayString(day))
	}
	prem, ok := d.premiumAt(day)
	if !ok {
		return valuation.Market{}, marketInfo{}, fmt.Errorf("%w: no equity risk premium on or before %s", ErrNoMarketData, dayString(day))
	}
	c := &d.curves[ci]
	info := marketInfo{curve: c, premDay: dayOf(prem.Date)}
	var m valuation.Market
	m.RiskFree, info.rfExtrapolated = yieldAt(c, r.p.RiskFreeTenorMonths)
	m.ERP = prem.Value
	info.fit, info.fitErr = fitCurve(c)
	if info.fit != nil {
		ns := info.fit.Curve
		m.Curve = &ns
	}
	return m, info, nil
}

func fitCurve(c *YieldCurve) (*curve.FitResult, error) {
	t := make([]float64, len(c.Tenors))
	for i, x := range c.Tenors {
		t[i] = float64(x)
	}
	f, err := curve.Fit(t, c.Yields, curve.FitOptions{})
	if err != nil {
		return nil, err
	}
	return &f, nil
}

// market sets the as-of market, the Curve section and the valuation
// options. Without a curve or a premium on or before the as-of date no
// holding can be valued: ErrNoMarketData.
func (r *run) market() error {
	m, info, err := r.marketAt(r.d.asOf)
	if err != nil {
		return err
	}
	r.mkt = m
	r.opt = valuation.Options{UseCurve: r.p.UseCurve}
	if r.p.GrowthConvention == "d1" {
		r.opt.GrowthConvention = valuation.D1Fixed
	}
	asOf := r.d.asOf
	if age := asOf - dayOf(info.curve.Date); age > int64(r.p.StalePriceDays) {
		r.finding("stale_market_data", "", 0, "latest yield curve dated %s, %d days before %s", info.curve.Date.Format("2006-01-02"), age, dayString(asOf))
	}
	if age := asOf - info.premDay; age > int64(r.p.StalePriceDays) {
		r.finding("stale_market_data", "", 0, "latest equity risk premium dated %s, %d days before %s", dayString(info.premDay), age, dayString(asOf))
	}
	if info.rfExtrapolated {
		r.finding("missing_yield_tenor", "", 0, "the %d-month yield is outside the tenors of the %s curve; the nearest end yield is used as the risk-free rate", r.p.RiskFreeTenorMonths, info.curve.Date.Format("2006-01-02"))
	}
	if info.fit == nil {
		r.finding("curve_fit_failed", "", 0, "Nelson-Siegel fit of the %s curve failed (%v): no curve section, factor durations or curve shocks; term-structure valuations fail", info.curve.Date.Format("2006-01-02"), info.fitErr)
		return nil
	}
	f := info.fit
	r.rfL1, r.rfL2 = nsLoadings(&f.Curve, r.p.RiskFreeTenorMonths)
	cv := &Curve{
		Date:      info.curve.Date.Format("2006-01-02"),
		Level:     f.Curve.Level,
		Slope:     f.Curve.Slope,
		Curvature: f.Curve.Curvature,
		Lambda:    f.Curve.Lambda * 12, // per month to per year: λ_m·τ_m = λ_y·τ_y
		RMSE:      f.RMSE,
		Points:    make([]CurvePoint, len(info.curve.Tenors)),
	}
	for i, t := range info.curve.Tenors {
		cv.Points[i] = CurvePoint{TenorMonths: t, Yield: info.curve.Yields[i], Fitted: f.Curve.Yield(float64(t))}
	}
	r.doc.Curve = cv
	return nil
}

// nsLoadings are the Nelson-Siegel slope and curvature loadings at a tenor.
func nsLoadings(c *curve.NelsonSiegel, tenorMonths int) (float64, float64) {
	return curve.Loadings(c.Lambda, float64(tenorMonths))
}
