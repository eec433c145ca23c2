package valuation

import (
	"errors"
	"math"
	"testing"
)

func TestRevalue(t *testing.T) {
	beta := 1.0
	mkt := Market{RiskFree: 0.03, ERP: 0.05} // k = 8%
	a := Assumptions{D0: 2, Growth: 0.03, Beta: &beta}
	// Gordon by hand (common practice): V = D0(1+g)/(k−g).
	cases := []struct {
		name string
		s    Shock
		want float64
	}{
		{"none", Shock{}, 2 * 1.03 / 0.05},
		{"rate +1%", Shock{Rate: 0.01}, 2 * 1.03 / 0.06},
		{"rf −50bp", Shock{RiskFree: -0.005}, 2 * 1.03 / 0.045},
		{"beta +0.2", Shock{Beta: 0.2}, 2 * 1.03 / (0.03 + 1.2*0.05 - 0.03)},
		{"ERP +1%", Shock{ERP: 0.01}, 2 * 1.03 / (0.03 + 0.06 - 0.03)},
		{"growth +1%", Shock{Growth: 0.01}, 2 * 1.04 / 0.04},
		{"NS level only moves curves", Shock{NSLevel: 0.01}, 2 * 1.03 / 0.05},
	}
	for _, c := range cases {
		v, err := Revalue(a, mkt, Options{}, c.s)
		if err != nil || !relClose(v, c.want, 1e-12) {
			t.Errorf("%s: %.12g, %v; want %.12g", c.name, v, err, c.want)
		}
	}
	// An explicit k moves with Rate but not with rf.
	k := 0.09
	ak := Assumptions{D0: 2, Growth: 0.03, DiscountRate: &k}
	if v, _ := Revalue(ak, mkt, Options{}, Shock{Rate: 0.01, RiskFree: 0.02}); !relClose(v, 2*1.03/0.07, 1e-12) {
		t.Errorf("explicit k: %.12g", v)
	}
	// Stage rates and growths move with Rate and Growth; the caller's stages stay untouched.
	stages := []Stage{{Years: 3, Growth: 0.10, Rate: ptr(0.10)}}
	as := Assumptions{D0: 1, Growth: 0.03, Beta: &beta, Stages: stages}
	v, err := Revalue(as, mkt, Options{}, Shock{Rate: 0.01, Growth: 0.005})
	want, _ := MultiStage{D0: 1, K: 0.09, G: 0.035, Stages: []Stage{{Years: 3, Growth: 0.105, Rate: ptr(0.11)}}}.Value()
	if err != nil || !relClose(v, want, 1e-12) || stages[0].Growth != 0.10 || *stages[0].Rate != 0.10 {
		t.Errorf("stages: %.12g, %v; want %.12g; stages now %+v rate %g", v, err, want, stages[0], *stages[0].Rate)
	}
	// Shocks that make nonsense are refused.
	if _, err := Revalue(a, mkt, Options{}, Shock{Growth: 0.05}); !errors.Is(err, ErrGrowthNotBelowRate) {
		t.Errorf("k = g after shock: %v", err)
	}
	if _, err := Revalue(a, mkt, Options{}, Shock{Rate: math.NaN()}); !errors.Is(err, ErrNotFinite) {
		t.Errorf("NaN shock: %v", err)
	}
	if v, err := Value(a, mkt, Options{}); err != nil || !relClose(v, 41.2, 1e-12) {
		t.Errorf("Value = %v, %v; want 41.2", v, err)
	}
}

func TestAnalyzerDoesNotAllocate(t *testing.T) {
	// Inner loops must not allocate (issue requirement): once dst has its
	// stage slices, a three-stage analysis allocates nothing.
	a := benchHoldings(3)[0]
	mkt := Market{RiskFree: 0.035, ERP: 0.05}
	var z Analyzer
	var s Sensitivities
	if err := z.Analyze(&s, a, mkt, Options{}); err != nil {
		t.Fatal(err)
	}
	if n := testing.AllocsPerRun(50, func() { _ = z.Analyze(&s, a, mkt, Options{}) }); n != 0 {
		t.Errorf("%g allocations per analysis", n)
	}
}
