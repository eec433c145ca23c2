package stats

import (
	"errors"
	"math"
	"testing"
)

// TestAnnualizeVolatility: σ·sqrt(periods per year) with 252 trading days,
// 52 weeks and 12 months (the project's convention; the square-root rule is
// common practice). A 1% daily volatility is 15.87% a year.
func TestAnnualizeVolatility(t *testing.T) {
	for _, c := range []struct {
		p    int
		want float64
	}{{TradingDaysPerYear, 0.01 * math.Sqrt(252)}, {WeeksPerYear, 0.01 * math.Sqrt(52)}, {MonthsPerYear, 0.01 * math.Sqrt(12)}} {
		got, err := AnnualizeVolatility(0.01, c.p)
		if err != nil || got != c.want {
			t.Errorf("%d: %v %v, want %v", c.p, got, err, c.want)
		}
	}
	if got, _ := AnnualizeVolatility(0.01, 252); math.Abs(got-0.1587) > 5e-5 {
		t.Errorf("1%% daily = %v a year, want 0.1587", got)
	}
	if _, err := AnnualizeVolatility(0.01, 0); !errors.Is(err, ErrNonPositive) {
		t.Errorf("0 periods: %v", err)
	}
	if _, err := AnnualizeVolatility(-0.01, 12); !errors.Is(err, ErrNonPositive) {
		t.Errorf("negative sigma: %v", err)
	}
}
