package stress

// Estimate returns the Taylor estimate of V_shocked/V_now − 1:
//
//	−DurK·Δk + ½·ConvK·Δk² + DurG·Δg + ½·ConvG·Δg² + CrossKG·Δk·Δg
//	−DurLevel·ΔL − DurSlope·ΔS − DurCurvature·ΔC
//
// second order in k and g, first order in the Nelson-Siegel factors (their
// second-order and cross terms are left out, so their error is O(h²)).
// All changes are decimals. For k and g alone the remainder is O(h³).
func (s Sensitivities) Estimate(dk, dg, dLevel, dSlope, dCurv float64) float64 {
	return -s.DurK*dk + 0.5*s.ConvK*dk*dk +
		s.DurG*dg + 0.5*s.ConvG*dg*dg + s.CrossKG*dk*dg -
		s.DurLevel*dLevel - s.DurSlope*dSlope - s.DurCurvature*dCurv
}

// taylorModel is the Taylor estimate of the model part of sh for p.
func taylorModel(p *Position, sh Shock, erp float64) float64 {
	l, sl, c := sh.DeltaNS()
	return p.Sens.Estimate(sh.DeltaK(p.Beta, erp), sh.DeltaG(p.Sector), l, sl, c)
}
