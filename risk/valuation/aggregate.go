package valuation

import (
	"fmt"
	"sort"
)

// CashSector labels cash lines in sector contributions.
const CashSector = "Cash"

// BasisPoint is one basis point as a decimal rate.
const BasisPoint = 1e-4

// Position is one line of a portfolio for aggregation.
type Position struct {
	ID     string
	Sector string
	// MarketValue in base currency: quantity × price; for cash the amount
	// (negative for an overdraft).
	MarketValue float64
	Cash        bool
	// Sensitivities of the holding (ignored for cash).
	Sensitivities Sensitivities
	// Err, when not nil, says why the holding has no sensitivities; the
	// holding is then excluded and listed with this reason.
	Err error
}

// Exposure holds value, weight and weighted measures (weight × measure) of a
// holding or a sector. Summed over the included holdings they give the
// portfolio measures.
type Exposure struct {
	MarketValue      float64
	Weight           float64 // MarketValue / included value
	ModifiedDuration float64
	MacaulayDuration float64
	Convexity        float64
	GrowthDuration   float64
	GrowthConvexity  float64
	CrossKG          float64
	Beta             float64 // MarketValue·β / value with a known beta
	DollarDuration   float64 // −D·MarketValue·1bp: currency change for +1 bp in k
}

// HoldingContribution is one included holding's contribution.
type HoldingContribution struct {
	ID, Sector string
	Cash       bool
	HasBeta    bool
	Exposure
}

// SectorContribution sums the contributions of a sector's holdings.
type SectorContribution struct {
	Sector   string
	Holdings int
	Exposure
}

// Exclusion is a holding left out of the measures.
type Exclusion struct {
	ID, Sector  string
	MarketValue float64
	Share       float64 // MarketValue / total value of all positions
	Reason      string
	Err         error
}

// PortfolioSensitivities are market-value-weighted portfolio measures.
type PortfolioSensitivities struct {
	TotalValue    float64 // every position, cash and excluded holdings included
	IncludedValue float64 // holdings with sensitivities plus cash
	CashValue     float64
	Coverage      float64 // IncludedValue / TotalValue

	ModifiedDuration float64
	MacaulayDuration float64
	Convexity        float64
	GrowthDuration   float64
	GrowthConvexity  float64
	CrossKG          float64
	Beta             float64 // over positions with a known beta (cash counts, β = 0)
	BetaCoverage     float64 // value with a known beta / IncludedValue
	DollarDuration   float64 // Σ −D_i·MV_i·1bp, base currency

	Holdings []HoldingContribution // included positions, input order
	Sectors  []SectorContribution  // sorted by sector name
	Excluded []Exclusion           // input order
}

// Aggregate combines holdings into portfolio measures, weighting by market
// value:
//
//	w_i = MV_i / Σ_included MV,   X_p = Σ_i w_i·X_i
//
// for X = modified and Macaulay duration, convexity, growth duration and
// convexity and the cross term. Conventions:
//   - Cash is included in the weights with zero duration, convexity, growth
//     sensitivities and beta: it is worth its face value whatever k and g do.
//   - Holdings with Err set (or non-finite measures, or a negative market
//     value) are excluded and listed with the reason and their share of
//     total value; the measures describe the included part, whose share is
//     Coverage. (Treating excluded holdings as zero-duration would
//     understate risk silently.)
//   - Portfolio convexity and growth measures assume every holding's k (or
//     g) moves by the same amount.
//   - Dollar duration is the first-order currency change of value for a
//     +1 bp parallel rise in every k: Σ −D_i·MV_i·0.0001 (negative when
//     durations are positive).
//   - Beta averages over positions with a known beta (cash included).
//
// It returns ErrPosition for a non-finite market value and ErrNoValue when
// the included value is not positive.
func Aggregate(positions []Position) (PortfolioSensitivities, error) {
	var p PortfolioSensitivities
	var betaValue float64
	included := make([]bool, len(positions))
	for i, pos := range positions {
		if !finite(pos.MarketValue) {
			return PortfolioSensitivities{}, fmt.Errorf("position %q: %w", pos.ID, inputErr("market value", pos.MarketValue, ErrPosition))
		}
		p.TotalValue += pos.MarketValue
		if err := positionProblem(pos); err != nil {
			p.Excluded = append(p.Excluded, Exclusion{ID: pos.ID, Sector: pos.Sector, MarketValue: pos.MarketValue, Reason: err.Error(), Err: err})
			continue
		}
		included[i] = true
		p.IncludedValue += pos.MarketValue
		if pos.Cash {
			p.CashValue += pos.MarketValue
		}
		if pos.Cash || pos.Sensitivities.HasBeta {
			betaValue += pos.MarketValue
		}
	}
	if !(p.IncludedValue > 0) {
		return PortfolioSensitivities{}, inputErr("included market value", p.IncludedValue, ErrNoValue)
	}
	if p.TotalValue != 0 {
		p.Coverage = p.IncludedValue / p.TotalValue
		for i := range p.Excluded {
			p.Excluded[i].Share = p.Excluded[i].MarketValue / p.TotalValue
		}
	}
	p.BetaCoverage = betaValue / p.IncludedValue

	sectors := map[string]*SectorContribution{}
	for i, pos := range positions {
		if !included[i] {
			continue
		}
		sector := pos.Sector
		if pos.Cash {
			sector = CashSector
		}
		c := HoldingContribution{ID: pos.ID, Sector: sector, Cash: pos.Cash, HasBeta: pos.Cash || pos.Sensitivities.HasBeta}
		w := pos.MarketValue / p.IncludedValue
		c.MarketValue, c.Weight = pos.MarketValue, w
		if !pos.Cash {
			s := &pos.Sensitivities
			c.ModifiedDuration = w * s.ModifiedDuration
			c.MacaulayDuration = w * s.MacaulayDuration
			c.Convexity = w * s.Convexity
			c.GrowthDuration = w * s.GrowthDuration
			c.GrowthConvexity = w * s.GrowthConvexity
			c.CrossKG = w * s.CrossKG
			if s.HasBeta && betaValue != 0 {
				c.Beta = pos.MarketValue * s.Beta / betaValue
			}
			c.DollarDuration = -s.ModifiedDuration * pos.MarketValue * BasisPoint
		}
		p.Holdings = append(p.Holdings, c)
		p.ModifiedDuration += c.ModifiedDuration
		p.MacaulayDuration += c.MacaulayDuration
		p.Convexity += c.Convexity
		p.GrowthDuration += c.GrowthDuration
		p.GrowthConvexity += c.GrowthConvexity
		p.CrossKG += c.CrossKG
		p.Beta += c.Beta
		p.DollarDuration += c.DollarDuration

		sc := sectors[sector]
		if sc == nil {
			sc = &SectorContribution{Sector: sector}
			sectors[sector] = sc
		}
		sc.Holdings++
		sc.Exposure.add(c.Exposure)
	}
	for _, sc := range sectors {
		p.Sectors = append(p.Sectors, *sc)
	}
	sort.Slice(p.Sectors, func(i, j int) bool { return p.Sectors[i].Sector < p.Sectors[j].Sector })
	return p, nil
}

func (e *Exposure) add(o Exposure) {
	e.MarketValue += o.MarketValue
	e.Weight += o.Weight
	e.ModifiedDuration += o.ModifiedDuration
	e.MacaulayDuration += o.MacaulayDuration
	e.Convexity += o.Convexity
	e.GrowthDuration += o.GrowthDuration
	e.GrowthConvexity += o.GrowthConvexity
	e.CrossKG += o.CrossKG
	e.Beta += o.Beta
	e.DollarDuration += o.DollarDuration
}

// positionProblem returns why a position cannot be included, or nil.
func positionProblem(pos Position) error {
	if pos.Cash {
		return nil
	}
	if pos.Err != nil {
		return pos.Err
	}
	if pos.MarketValue < 0 {
		return inputErr("market value", pos.MarketValue, ErrPosition)
	}
	s := &pos.Sensitivities
	if s.Model == 0 {
		return ErrNoSensitivities
	}
	for _, x := range [...]struct {
		name string
		v    float64
	}{{"modified duration", s.ModifiedDuration}, {"Macaulay duration", s.MacaulayDuration}, {"convexity", s.Convexity},
		{"growth duration", s.GrowthDuration}, {"growth convexity", s.GrowthConvexity}, {"cross term", s.CrossKG}, {"beta", s.Beta}} {
		if !finite(x.v) {
			return inputErr(x.name, x.v, ErrNotFinite)
		}
	}
	return nil
}
