package valuation

// CAPMRate returns the CAPM discount rate
//
//	k = rf + β·ERP
//
// with decimal annual rf and ERP. It refuses non-finite inputs and k ≤ 0.
func CAPMRate(rf, beta, erp float64) (float64, error) {
	for _, p := range [...]struct {
		name string
		v    float64
	}{{"risk-free rate", rf}, {"beta", beta}, {"equity risk premium", erp}} {
		if !finite(p.v) {
			return 0, inputErr(p.name, p.v, ErrNotFinite)
		}
	}
	k := capmRate(rf, beta, erp)
	if k <= 0 {
		return 0, inputErr("CAPM discount rate", k, ErrRateOutOfRange)
	}
	return k, nil
}

func capmRate(rf, beta, erp float64) float64 { return rf + beta*erp }

// CAPMDurations converts the duration to the CAPM-linked discount rate,
// D = −(1/V) ∂V/∂k, into durations to the CAPM inputs by the chain rule
// (∂k/∂rf = 1, ∂k/∂β = ERP, ∂k/∂ERP = β):
//
//	rf:  −(1/V) ∂V/∂rf  = D
//	β:   −(1/V) ∂V/∂β   = D·ERP
//	ERP: −(1/V) ∂V/∂ERP = D·β
//
// For the constant-growth model D = 1/(k−g).
func CAPMDurations(d, beta, erp float64) (rf, b, e float64) {
	return d, d * erp, d * beta
}
