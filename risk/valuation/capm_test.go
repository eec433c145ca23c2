package valuation

import (
	"errors"
	"math"
	"testing"
)

func TestCAPMRate(t *testing.T) {
	// CAPM (Sharpe 1964; common practice): k = rf + β·ERP. By hand:
	// 0.03 + 1.2·0.05 = 0.09.
	k, err := CAPMRate(0.03, 1.2, 0.05)
	if err != nil || math.Abs(k-0.09) > 1e-15 {
		t.Errorf("CAPMRate = %v, %v; want 0.09", k, err)
	}
	for _, c := range []struct {
		rf, beta, erp float64
		want          error
	}{
		{math.NaN(), 1, 0.05, ErrNotFinite},
		{0.03, math.Inf(1), 0.05, ErrNotFinite},
		{0.01, -1, 0.05, ErrRateOutOfRange},
	} {
		if _, err := CAPMRate(c.rf, c.beta, c.erp); !errors.Is(err, c.want) {
			t.Errorf("CAPMRate(%g, %g, %g): %v, want %v", c.rf, c.beta, c.erp, err, c.want)
		}
	}
}

func TestCAPMSensitivitiesConstantGrowth(t *testing.T) {
	// Chain rule on V = D1/(rf + β·ERP − g) (common practice):
	// −(1/V)dV/drf = 1/(k−g), −(1/V)dV/dβ = ERP/(k−g), −(1/V)dV/dERP = β/(k−g).
	// Closed forms: 1e-12 relative.
	beta := 1.25
	mkt := Market{RiskFree: 0.025, ERP: 0.055}
	s, err := Analyze(Assumptions{D0: 1, Growth: 0.035, Beta: &beta}, mkt, Options{})
	if err != nil {
		t.Fatal(err)
	}
	gap := 0.025 + 1.25*0.055 - 0.035
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"rf", s.RiskFreeDuration, 1 / gap},
		{"beta", s.BetaDuration, 0.055 / gap},
		{"ERP", s.ERPDuration, 1.25 / gap},
	} {
		if !relClose(c.got, c.want, 1e-12) {
			t.Errorf("%s: %.15g, want %.15g", c.name, c.got, c.want)
		}
	}
	if !s.CAPMLinked || !s.HasBeta {
		t.Errorf("flags: linked %v hasBeta %v", s.CAPMLinked, s.HasBeta)
	}
	// An explicit discount rate does not move with rf, β or ERP.
	k := 0.09
	s, err = Analyze(Assumptions{D0: 1, Growth: 0.035, Beta: &beta, DiscountRate: &k}, mkt, Options{})
	if err != nil || s.CAPMLinked || s.RiskFreeDuration != 0 || s.BetaDuration != 0 || s.ERPDuration != 0 || s.K != 0.09 {
		t.Errorf("explicit k: %+v, %v", s, err)
	}
}
