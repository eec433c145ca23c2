package stress

import (
	"fmt"
	"math"
)

// Shock is a change to the inputs of the dividend-discount model plus a
// market price move. The zero Shock changes nothing.
//
// The discount rate follows CAPM, k = rf + beta*ERP, so a shock moves it by
//
//	Δk = Δrf + β'·(ERP + ΔERP) − β·ERP = Δrf + β'·ΔERP + (β' − β)·ERP
//
// with β' = β·BetaScale + BetaShift (see DeltaK). Growth moves by
//
//	Δg = (GrowthPP + GrowthBySector[sector]) / 100
//
// The Nelson-Siegel shocks move the factors of
//
//	y(τ) = L + S·(1−e^{−τ/λ})/(τ/λ) + C·((1−e^{−τ/λ})/(τ/λ) − e^{−τ/λ})
//
// so L is the long end y(∞), S the short-minus-long spread y(0) − y(∞) and
// C the hump. They reach a holding only through its Revalue closure and
// its factor sensitivities; they are not part of Δk.
//
// MarketMove is a price shock, not a model change: a holding's price
// moves by β'·MarketMove on top of (multiplied with) its model revaluation.
type Shock struct {
	// RatesBP is the parallel shift of the risk-free rate, basis points.
	RatesBP float64
	// ERP is the change in the equity risk premium, decimal (0.01 = +100bp).
	ERP float64
	// GrowthPP is the change in long-run growth for every holding,
	// percentage points (-1 = growth one point lower).
	GrowthPP float64
	// GrowthBySector adds, for holdings of the named sector, this many
	// percentage points on top of GrowthPP (it adds, it does not replace).
	// Sector names match Position.Sector exactly. Read-only.
	GrowthBySector map[string]float64
	// BetaShift is added to every beta after scaling.
	BetaShift float64
	// BetaScale multiplies every beta. Zero means "no scaling" (factor 1)
	// so that the zero Shock changes nothing; a scale of exactly zero cannot
	// be expressed (use BetaShift on a single holding's closure instead).
	// Negative values are refused.
	BetaScale float64
	// MarketMove is the market return applied through beta, decimal
	// (-0.20 = market down 20%). It must be above -1.
	MarketMove float64
	// NSLevelBP, NSSlopeBP and NSCurvatureBP shift the Nelson-Siegel
	// level, slope and curvature factors, basis points.
	NSLevelBP     float64
	NSSlopeBP     float64
	NSCurvatureBP float64
}

// Scenario is a named shock.
type Scenario struct {
	Name        string
	Description string
	Shock       Shock
}

// betaScale is BetaScale with zero read as one.
func (s Shock) betaScale() float64 {
	if s.BetaScale == 0 {
		return 1
	}
	return s.BetaScale
}

// ShockedBeta returns β' = β·BetaScale + BetaShift (BetaScale 0 read as 1).
func (s Shock) ShockedBeta(beta float64) float64 {
	return beta*s.betaScale() + s.BetaShift
}

// DeltaK returns the exact change of the CAPM discount rate
//
//	Δk = RatesBP/10⁴ + β'·(erp + ERP) − β·erp
//
// for a holding of beta β when the market risk premium is erp (decimal).
// Revalue closures should use it so that full revaluation and the Taylor
// estimate see the same Δk.
func (s Shock) DeltaK(beta, erp float64) float64 {
	b := s.ShockedBeta(beta)
	return s.RatesBP/1e4 + b*(erp+s.ERP) - beta*erp
}

// DeltaG returns the change of long-run growth, decimal, for a holding of
// the given sector: (GrowthPP + GrowthBySector[sector]) / 100.
func (s Shock) DeltaG(sector string) float64 {
	return (s.GrowthPP + s.GrowthBySector[sector]) / 100
}

// DeltaNS returns the Nelson-Siegel factor changes as decimals.
func (s Shock) DeltaNS() (level, slope, curvature float64) {
	return s.NSLevelBP / 1e4, s.NSSlopeBP / 1e4, s.NSCurvatureBP / 1e4
}

// Model returns the shock without its market move: the part a Revalue
// closure receives.
func (s Shock) Model() Shock {
	s.MarketMove = 0
	return s
}

// IsZero reports whether the shock changes nothing: every shift zero (a
// sector map of zeros included) and the beta scale one.
func (s Shock) IsZero() bool {
	for _, v := range s.GrowthBySector {
		if v != 0 {
			return false
		}
	}
	return s.RatesBP == 0 && s.ERP == 0 && s.GrowthPP == 0 &&
		s.BetaShift == 0 && s.betaScale() == 1 && s.MarketMove == 0 &&
		s.NSLevelBP == 0 && s.NSSlopeBP == 0 && s.NSCurvatureBP == 0
}

// Validate refuses non-finite fields, a negative BetaScale, a MarketMove
// at or below -1 and an empty sector name. Errors wrap ErrShock.
func (s Shock) Validate() error {
	fields := []struct {
		name string
		v    float64
	}{
		{"RatesBP", s.RatesBP}, {"ERP", s.ERP}, {"GrowthPP", s.GrowthPP},
		{"BetaShift", s.BetaShift}, {"BetaScale", s.BetaScale},
		{"MarketMove", s.MarketMove}, {"NSLevelBP", s.NSLevelBP},
		{"NSSlopeBP", s.NSSlopeBP}, {"NSCurvatureBP", s.NSCurvatureBP},
	}
	for _, f := range fields {
		if !finite(f.v) {
			return fmt.Errorf("%w: %s is %v", ErrShock, f.name, f.v)
		}
	}
	for sec, v := range s.GrowthBySector {
		if sec == "" {
			return fmt.Errorf("%w: GrowthBySector has an empty sector name", ErrShock)
		}
		if !finite(v) {
			return fmt.Errorf("%w: GrowthBySector[%q] is %v", ErrShock, sec, v)
		}
	}
	if s.BetaScale < 0 {
		return fmt.Errorf("%w: BetaScale %v is negative", ErrShock, s.BetaScale)
	}
	if s.MarketMove <= -1 {
		return fmt.Errorf("%w: MarketMove %v is at or below -100%%", ErrShock, s.MarketMove)
	}
	return nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
