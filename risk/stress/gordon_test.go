package stress

import (
	"fmt"
	"math"
	"testing"
)

// gordon is a constant-growth holding for the tests, valued with the
// Gordon growth model and CAPM, both written here independently of the
// package:
//
//	V = D0·(1+g)/(k−g),  k = rf + β·ERP
//
// (Gordon growth model: Bodie, Kane & Marcus, Investments, chapter
// "Equity Valuation Models", from memory; CAPM: Sharpe 1964.)
type gordon struct {
	d0, rf, beta, erp, g float64
	sector               string
}

func (h gordon) k() float64 { return h.rf + h.beta*h.erp }

func gordonValue(d0, k, g float64) (float64, error) {
	if k <= g {
		return 0, fmt.Errorf("k %v <= g %v", k, g)
	}
	return d0 * (1 + g) / (k - g), nil
}

// revalue applies s to the raw inputs (not through Shock.DeltaK, so the
// tests check that mapping too) and returns V'/V.
func (h gordon) revalue(s Shock) (float64, error) {
	scale := s.BetaScale
	if scale == 0 {
		scale = 1
	}
	rf := h.rf + s.RatesBP/1e4
	beta := h.beta*scale + s.BetaShift
	erp := h.erp + s.ERP
	g := h.g + (s.GrowthPP+s.GrowthBySector[h.sector])/100
	v1, err := gordonValue(h.d0, rf+beta*erp, g)
	if err != nil {
		return 0, err
	}
	v0, err := gordonValue(h.d0, h.k(), h.g)
	if err != nil {
		return 0, err
	}
	return v1 / v0, nil
}

// sens are the derivatives of V = D0(1+g)/(k−g) divided by V, worked by
// hand; TestGordonSensitivities checks them against central differences.
func (h gordon) sens() Sensitivities {
	m := h.k() - h.g
	return Sensitivities{
		DurK:    1 / m,
		ConvK:   2 / (m * m),
		DurG:    1/(1+h.g) + 1/m,
		ConvG:   2/((1+h.g)*m) + 2/(m*m),
		CrossKG: -(1/((1+h.g)*m) + 2/(m*m)),
	}
}

func (h gordon) position(id string, value float64) Position {
	return Position{ID: id, Name: "Holding " + id, Sector: h.sector, Value: value,
		Beta: h.beta, K: h.k(), G: h.g, Sens: h.sens(), Revalue: h.revalue}
}

// TestGordonSensitivities checks the hand-derived derivatives used by the
// other tests against central differences of gordonValue. With step h the
// truncation error relative to the derivative is about h²/(k−g)² (1e-7 for
// h = 1e-5, k−g ≥ 0.03) and the rounding error about ε·V/h² ≈ 1e-6·V, below
// 1e-7 of a second derivative (≥ 2V/(k−g)² ≈ 100·V here); a relative
// tolerance of 1e-5 covers both with room.
func TestGordonSensitivities(t *testing.T) {
	const step, tol = 1e-5, 1e-5
	for _, h := range []gordon{
		{d0: 2, rf: 0.04, beta: 1, erp: 0.05, g: 0.03, sector: "X"},
		{d0: 1, rf: 0.03, beta: 0.7, erp: 0.06, g: 0.02},
		{d0: 3, rf: 0.05, beta: 1.4, erp: 0.045, g: -0.01},
	} {
		k, g := h.k(), h.g
		v := func(dk, dg float64) float64 { x, _ := gordonValue(h.d0, k+dk, g+dg); return x }
		v0 := v(0, 0)
		s := h.sens()
		checks := []struct {
			name      string
			got, want float64
		}{
			{"DurK", s.DurK, -(v(step, 0) - v(-step, 0)) / (2 * step) / v0},
			{"ConvK", s.ConvK, (v(step, 0) - 2*v0 + v(-step, 0)) / (step * step) / v0},
			{"DurG", s.DurG, (v(0, step) - v(0, -step)) / (2 * step) / v0},
			{"ConvG", s.ConvG, (v(0, step) - 2*v0 + v(0, -step)) / (step * step) / v0},
			{"CrossKG", s.CrossKG, (v(step, step) - v(step, -step) - v(-step, step) + v(-step, -step)) / (4 * step * step) / v0},
		}
		for _, c := range checks {
			if math.Abs(c.got-c.want) > tol*math.Abs(c.want) {
				t.Errorf("k=%v g=%v %s = %v, finite difference %v", k, g, c.name, c.got, c.want)
			}
		}
	}
}
