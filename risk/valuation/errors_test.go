package valuation

import (
	"errors"
	"math"
	"testing"

	"plumbline/risk/curve"
)

func TestNonsenseInputsReturnTypedErrors(t *testing.T) {
	// Every nonsense input is refused with its sentinel error (errors.Is)
	// and, where an input is to blame, an *InputError naming it (errors.As).
	// "Nonsense never becomes a number" (project rule).
	nan, inf := math.NaN(), math.Inf(1)
	beta := 1.0
	good := func() Assumptions {
		return Assumptions{D0: 1, Growth: 0.03, Beta: &beta, Stages: []Stage{{Years: 2, Growth: 0.1}}}
	}
	mkt := Market{RiskFree: 0.03, ERP: 0.05}
	fitted := curve.NelsonSiegel{Level: 0.04, Slope: -0.01, Lambda: curve.DieboldLiLambda}
	cases := []struct {
		name      string
		edit      func(a *Assumptions, m *Market, o *Options)
		want      error
		wantInput bool
	}{
		{"k equals g", func(a *Assumptions, m *Market, o *Options) { a.Growth = 0.08 }, ErrGrowthNotBelowRate, true},
		{"k below g", func(a *Assumptions, m *Market, o *Options) { a.DiscountRate = ptr(0.05); a.Growth = 0.06 }, ErrGrowthNotBelowRate, true},
		{"negative dividend", func(a *Assumptions, m *Market, o *Options) { a.D0 = -0.5 }, ErrNegativeDividend, true},
		{"zero dividend", func(a *Assumptions, m *Market, o *Options) { a.D0 = 0 }, ErrNoDividend, true},
		{"NaN dividend", func(a *Assumptions, m *Market, o *Options) { a.D0 = nan }, ErrNotFinite, true},
		{"Inf dividend", func(a *Assumptions, m *Market, o *Options) { a.D0 = inf }, ErrNotFinite, true},
		{"stage of zero length", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Years = 0 }, ErrStageLength, true},
		{"negative stage length", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Years = -1 }, ErrStageLength, true},
		{"NaN stage length", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Years = nan }, ErrNotFinite, true},
		{"NaN stage growth", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Growth = nan }, ErrNotFinite, true},
		{"stage growth -100%", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Growth = -1 }, ErrGrowthOutOfRange, true},
		{"stage rate zero", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Rate = ptr(0) }, ErrRateOutOfRange, true},
		{"stage rate Inf", func(a *Assumptions, m *Market, o *Options) { a.Stages[0].Rate = ptr(inf) }, ErrNotFinite, true},
		{"NaN growth", func(a *Assumptions, m *Market, o *Options) { a.Growth = nan }, ErrNotFinite, true},
		{"growth -100%", func(a *Assumptions, m *Market, o *Options) { a.Growth = -1 }, ErrGrowthOutOfRange, true},
		{"NaN beta", func(a *Assumptions, m *Market, o *Options) { a.Beta = ptr(nan) }, ErrNotFinite, true},
		{"NaN discount rate", func(a *Assumptions, m *Market, o *Options) { a.DiscountRate = ptr(nan) }, ErrNotFinite, true},
		{"zero discount rate", func(a *Assumptions, m *Market, o *Options) { a.DiscountRate = ptr(0) }, ErrRateOutOfRange, true},
		{"negative CAPM rate", func(a *Assumptions, m *Market, o *Options) { a.Beta = ptr(-2) }, ErrRateOutOfRange, true},
		{"no beta, no rate", func(a *Assumptions, m *Market, o *Options) { a.Beta = nil }, ErrMissingBeta, false},
		{"NaN risk-free", func(a *Assumptions, m *Market, o *Options) { m.RiskFree = nan }, ErrNotFinite, true},
		{"Inf ERP", func(a *Assumptions, m *Market, o *Options) { m.ERP = -inf }, ErrNotFinite, true},
		{"frequency 3", func(a *Assumptions, m *Market, o *Options) { a.Frequency = 3 }, ErrFrequency, true},
		{"frequency -4", func(a *Assumptions, m *Market, o *Options) { a.Frequency = -4 }, ErrFrequency, true},
		{"stub 1", func(a *Assumptions, m *Market, o *Options) { a.StubFraction = 1 }, ErrStubFraction, true},
		{"stub negative", func(a *Assumptions, m *Market, o *Options) { a.StubFraction = -0.1 }, ErrStubFraction, true},
		{"stub NaN", func(a *Assumptions, m *Market, o *Options) { a.StubFraction = nan }, ErrNotFinite, true},
		{"negative step", func(a *Assumptions, m *Market, o *Options) { o.Step = -1e-4 }, ErrStep, true},
		{"unknown growth convention", func(a *Assumptions, m *Market, o *Options) { o.GrowthConvention = 7 }, ErrConvention, true},
		{"curve requested, none", func(a *Assumptions, m *Market, o *Options) { o.UseCurve = true }, ErrNoCurve, false},
		{"curve NaN level", func(a *Assumptions, m *Market, o *Options) {
			o.UseCurve = true
			c := fitted
			c.Level = nan
			m.Curve = &c
		}, ErrCurve, false}, // wraps a *curve.InputError instead
		{"curve long end below growth", func(a *Assumptions, m *Market, o *Options) {
			o.UseCurve = true
			m.Curve = &fitted
			a.Growth = 0.095
		}, ErrGrowthNotBelowRate, true},
		{"horizon half a year", func(a *Assumptions, m *Market, o *Options) { o.UseCurve = true; m.Curve = &fitted; o.Horizon = 0.5 }, ErrHorizon, true},
		{"horizon NaN", func(a *Assumptions, m *Market, o *Options) { o.UseCurve = true; m.Curve = &fitted; o.Horizon = nan }, ErrNotFinite, true},
		{"growth curve below -100%", func(a *Assumptions, m *Market, o *Options) {
			o.UseCurve = true
			m.Curve = &fitted
			a.GrowthCurve = &curve.NelsonSiegel{Level: 0.02, Slope: -8, Lambda: 0.5}
		}, ErrGrowthOutOfRange, true},
	}
	for _, c := range cases {
		a, m, o := good(), mkt, Options{}
		c.edit(&a, &m, &o)
		s, err := Analyze(a, m, o)
		if !errors.Is(err, c.want) {
			t.Errorf("%s: Analyze error %v, want %v (value %g)", c.name, err, c.want, s.Value)
			continue
		}
		var ie *InputError
		if c.wantInput != errors.As(err, &ie) {
			t.Errorf("%s: errors.As(*InputError) = %v, want %v (%v)", c.name, !c.wantInput, c.wantInput, err)
		}
		// Full revaluation refuses the same inputs.
		if _, err := Revalue(a, m, o, Shock{}); !errors.Is(err, c.want) && c.want != ErrStep && c.want != ErrConvention {
			t.Errorf("%s: Revalue error %v, want %v", c.name, err, c.want)
		}
	}

	// The standalone models and formulas refuse nonsense too.
	standalone := []struct {
		name string
		err  error
		want error
	}{
		{"Gordon k = g", second(GordonValue(1, 0.05, 0.05)), ErrGrowthNotBelowRate},
		{"Gordon negative D1", second(GordonValue(-1, 0.08, 0.05)), ErrNegativeDividend},
		{"Gordon NaN k", second(GordonValue(1, nan, 0.05)), ErrNotFinite},
		{"Gordon D0 Inf", second(GordonValueD0(inf, 0.08, 0.05)), ErrNotFinite},
		{"constant growth k < g", second(ConstantGrowth{D0: 1, K: 0.04, G: 0.05}.Value()), ErrGrowthNotBelowRate},
		{"constant growth frequency 5", second(ConstantGrowth{D0: 1, K: 0.08, G: 0.05, Frequency: 5}.Value()), ErrFrequency},
		{"multi-stage zero-length stage", second(MultiStage{D0: 1, K: 0.08, G: 0.05, Stages: []Stage{{Years: 0, Growth: 0.1}}}.Value()), ErrStageLength},
		{"term structure zero lambda", second(TermStructure{D0: 1, Curve: curve.NelsonSiegel{Level: 0.04}, Spread: 0.05}.Value()), curve.ErrLambda},
	}
	for _, c := range standalone {
		if !errors.Is(c.err, c.want) {
			t.Errorf("%s: %v, want %v", c.name, c.err, c.want)
		}
	}
}

func second(_ float64, err error) error { return err }

func TestInputErrorNamesStage(t *testing.T) {
	// The field names the stage so a report can say which one is wrong.
	_, err := MultiStage{D0: 1, K: 0.08, G: 0.03, Stages: []Stage{{Years: 1, Growth: 0.1}, {Years: 2, Growth: -3}}}.Value()
	var ie *InputError
	if !errors.As(err, &ie) || ie.Field != "stage 2 growth" || ie.Value != -3 || !errors.Is(err, ErrGrowthOutOfRange) {
		t.Errorf("got %#v (%v)", ie, err)
	}
}

// The message shows the refused value to four significant digits (Go's
// fmt verb %.4g: the fmt package documentation) while the typed error
// keeps it in full: 0.048 − 0.05 is −0.0020000000000000018 in float64
// (IEEE 754 double rounding, checked with Python 3's float repr) and
// reads −0.002.
func TestInputErrorMessage(t *testing.T) {
	k, g := 0.048, 0.05 // variables: constant arithmetic in Go is exact
	_, err := GordonValue(1, k, g)
	var ie *InputError
	if !errors.As(err, &ie) || !errors.Is(err, ErrGrowthNotBelowRate) || ie.Value != k-g || ie.Value == -0.002 {
		t.Fatalf("GordonValue(1, 0.048, 0.05): %#v (%v)", ie, err)
	}
	if got, want := err.Error(), ErrGrowthNotBelowRate.Error()+" (k - g = -0.002)"; got != want {
		t.Errorf("message %q, want %q", got, want)
	}
	for _, tc := range []struct {
		v    float64
		want string
	}{
		{0.123456, "0.1235"},
		{12, "12"},
		{-1, "-1"},
		{1e-9, "1e-09"},
		{math.NaN(), "NaN"},
		{math.Inf(-1), "-Inf"},
	} {
		e := &InputError{Field: "x", Value: tc.v, Err: ErrNotFinite}
		if got, want := e.Error(), ErrNotFinite.Error()+" (x = "+tc.want+")"; got != want {
			t.Errorf("%v: %q, want %q", tc.v, got, want)
		}
	}
}
