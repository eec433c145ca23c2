package stress

import "fmt"

// Position is one holding as the stress engine sees it.
//
// Cash (or any line the model does not value) has a nil Revalue: it never
// gains or loses in a scenario, market move included.
type Position struct {
	ID     string
	Name   string
	Sector string
	// Value is the current market value, base currency. Only a position
	// with a nil Revalue (cash, possibly an overdraft) may be negative.
	Value float64
	// Beta is the current beta: it sets k = rf + β·ERP and passes the
	// market move to the price.
	Beta float64
	// K and G are the current discount rate and long-run growth,
	// decimals, carried for reporting only.
	K, G float64
	// Sens are the model sensitivities behind the Taylor estimate.
	Sens Sensitivities
	// Revalue returns V_shocked/V_now of the model for the model part of a
	// shock (Shock.Model: MarketMove is always zero). An error (k <= g
	// after the shock, say) makes the holding a Failure of the scenario.
	Revalue func(s Shock) (ratio float64, err error)
}

// Sensitivities are derivatives of the model value V, scaled by 1/V.
// Rates and growth are decimals, so a duration is in years.
//
//	DurK         = −(1/V)·∂V/∂k        (Gordon: 1/(k−g))
//	ConvK        =  (1/V)·∂²V/∂k²
//	DurG         =  (1/V)·∂V/∂g
//	ConvG        =  (1/V)·∂²V/∂g²
//	CrossKG      =  (1/V)·∂²V/∂k∂g
//	DurLevel     = −(1/V)·∂V/∂L        Nelson-Siegel level, slope and
//	DurSlope     = −(1/V)·∂V/∂S        curvature factors (see Shock),
//	DurCurvature = −(1/V)·∂V/∂C        total effect through the curve
type Sensitivities struct {
	DurK, ConvK        float64
	DurG, ConvG        float64
	CrossKG            float64
	DurLevel, DurSlope float64
	DurCurvature       float64
}

func (p Position) validate(i int) error {
	if p.ID == "" {
		return fmt.Errorf("%w: position %d has no ID", ErrPosition, i)
	}
	nums := []struct {
		name string
		v    float64
	}{
		{"Value", p.Value}, {"Beta", p.Beta}, {"K", p.K}, {"G", p.G},
		{"DurK", p.Sens.DurK}, {"ConvK", p.Sens.ConvK}, {"DurG", p.Sens.DurG},
		{"ConvG", p.Sens.ConvG}, {"CrossKG", p.Sens.CrossKG},
		{"DurLevel", p.Sens.DurLevel}, {"DurSlope", p.Sens.DurSlope},
		{"DurCurvature", p.Sens.DurCurvature},
	}
	for _, n := range nums {
		if !finite(n.v) {
			return fmt.Errorf("%w: position %s: %s is %v", ErrPosition, p.ID, n.name, n.v)
		}
	}
	if p.Value < 0 && p.Revalue != nil {
		return fmt.Errorf("%w: position %s: value %v is negative", ErrPosition, p.ID, p.Value)
	}
	return nil
}

// checkPositions validates every position, refuses duplicate IDs and
// returns the total value, which must be positive.
func checkPositions(ps []Position) (total float64, err error) {
	seen := make(map[string]bool, len(ps))
	for i, p := range ps {
		if err := p.validate(i); err != nil {
			return 0, err
		}
		if seen[p.ID] {
			return 0, fmt.Errorf("%w: duplicate ID %s", ErrPosition, p.ID)
		}
		seen[p.ID] = true
		total += p.Value
	}
	if !(total > 0) {
		return 0, fmt.Errorf("%w: total %v", ErrPortfolio, total)
	}
	return total, nil
}
