package stats

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"
)

// VaRMethod selects how the loss distribution is estimated.
type VaRMethod int

const (
	// Historical uses the empirical distribution of the returns.
	Historical VaRMethod = iota
	// Normal fits a normal distribution with the sample mean and standard
	// deviation.
	Normal
	// CornishFisher adjusts the normal quantile for sample skewness and
	// excess kurtosis.
	CornishFisher
)

func (m VaRMethod) String() string {
	switch m {
	case Historical:
		return "historical"
	case Normal:
		return "normal"
	case CornishFisher:
		return "cornish-fisher"
	}
	return fmt.Sprintf("VaRMethod(%d)", int(m))
}

// HorizonRule says how a multi-day VaR is obtained from daily returns.
type HorizonRule int

const (
	// SqrtTime (the default) computes the 1-day VaR and ES and multiplies
	// both by sqrt(h), the square-root-of-time rule (exact for independent,
	// zero-mean normal returns). It is the default because h-day windows
	// leave only n-h+1 strongly overlapping observations.
	SqrtTime HorizonRule = iota
	// Overlapping compounds the daily returns into overlapping h-day returns
	// (see OverlappingReturns) and applies the method to those.
	Overlapping
)

func (h HorizonRule) String() string {
	switch h {
	case SqrtTime:
		return "sqrt-time"
	case Overlapping:
		return "overlapping"
	}
	return fmt.Sprintf("HorizonRule(%d)", int(h))
}

// VaRSpec describes one VaR figure. The zero value of HorizonDays means one
// day and the zero value of Rule is SqrtTime.
type VaRSpec struct {
	Method      VaRMethod
	Confidence  float64 // e.g. 0.95 or 0.99
	HorizonDays int     // 1 (or 0) for 1-day, 5 for 5-day ...
	Rule        HorizonRule
}

// VaREstimate holds value at risk and expected shortfall as positive decimal
// losses (0.02 is a loss of 2% of the value at the start of the horizon).
type VaREstimate struct {
	VaR, ES      float64
	Observations int // returns used, after any h-day aggregation
}

// EstimateVaR computes VaR and ES of the daily returns r according to spec.
func EstimateVaR(r []float64, spec VaRSpec) (VaREstimate, error) {
	h := spec.HorizonDays
	if h == 0 {
		h = 1
	}
	if h < 0 {
		return VaREstimate{}, fmt.Errorf("stats: var: horizon %d days: %w", spec.HorizonDays, ErrHorizon)
	}
	var f func([]float64, float64) (VaREstimate, error)
	switch spec.Method {
	case Historical:
		f = HistoricalVaR
	case Normal:
		f = NormalVaR
	case CornishFisher:
		f = CornishFisherVaR
	default:
		return VaREstimate{}, fmt.Errorf("stats: var: %v: %w", spec.Method, ErrMethod)
	}
	switch spec.Rule {
	case SqrtTime:
		e, err := f(r, spec.Confidence)
		if err != nil {
			return VaREstimate{}, err
		}
		s := math.Sqrt(float64(h))
		e.VaR *= s
		e.ES *= s
		return e, nil
	case Overlapping:
		rh, err := OverlappingReturns(r, h)
		if err != nil {
			return VaREstimate{}, err
		}
		return f(rh, spec.Confidence)
	}
	return VaREstimate{}, fmt.Errorf("stats: var: %v: %w", spec.Rule, ErrMethod)
}

// OverlappingReturns compounds daily returns into overlapping h-day returns:
//
//	R_t = Π_{k=0}^{h-1} (1 + r_{t-k}) - 1,   t = h-1 .. n-1
//
// giving n-h+1 returns (consecutive ones share h-1 days).
func OverlappingReturns(r []float64, h int) ([]float64, error) {
	if h < 1 {
		return nil, fmt.Errorf("stats: overlapping returns: horizon %d: %w", h, ErrHorizon)
	}
	if len(r) < h {
		return nil, fmt.Errorf("stats: overlapping returns: %d returns for a %d-day horizon: %w", len(r), h, ErrTooShort)
	}
	if err := checkFinite("overlapping returns", r); err != nil {
		return nil, err
	}
	out := make([]float64, len(r)-h+1)
	for t := range out {
		g := 1.0
		for _, v := range r[t : t+h] {
			g *= 1 + v
		}
		out[t] = g - 1
	}
	return out, nil
}

// EmpiricalQuantile returns the p-quantile of x by inverting the empirical
// distribution function (Hyndman and Fan type 1, numpy's
// method="inverted_cdf"): the smallest x_(k) with k/n >= p, i.e.
//
//	Q(p) = x_(⌈n·p⌉)   (ascending order statistics, 1-based)
//
// No interpolation. n·p within 1e-9 of an integer counts as that integer, so
// that binary rounding of p (0.99 is not exact) does not move it one order
// statistic up.
func EmpiricalQuantile(x []float64, p float64) (float64, error) {
	if len(x) == 0 {
		return 0, fmt.Errorf("stats: quantile: %w", ErrEmpty)
	}
	if !(p > 0 && p <= 1) {
		return 0, fmt.Errorf("stats: quantile: p %v outside (0, 1]: %w", p, ErrConfidence)
	}
	if err := checkFinite("quantile", x); err != nil {
		return 0, err
	}
	s := slices.Clone(x)
	slices.Sort(s)
	return s[ceilRank(len(s), p)-1], nil
}

// ceilRank returns ⌈n·p⌉ in 1..n, treating n·p within 1e-9 of an integer as
// that integer.
func ceilRank(n int, p float64) int {
	np := float64(n) * p
	k := int(math.Ceil(np))
	if r := math.Round(np); math.Abs(np-r) < 1e-9 {
		k = int(r)
	}
	return min(max(k, 1), n)
}

// HistoricalVaR returns historical VaR and ES at confidence c (e.g. 0.99)
// from the returns r, with losses L = -r:
//
//	VaR = Q_L(c) = L_(⌈n·c⌉)   (EmpiricalQuantile of the losses: the
//	                            smallest l with F_n(l) >= c)
//	ES  = (1/m) [ Σ_{i=1}^{⌊m⌋} L_[i] + (m - ⌊m⌋) L_[⌊m⌋+1] ],   m = n(1-c)
//
// where L_[1] >= L_[2] >= ... are the losses from the worst. ES is the
// average of the empirical quantile function over (c, 1) (Acerbi and Tasche,
// 2002), so it is coherent and ES >= VaR. For n = 250 at 99% the VaR is the
// third-worst loss and the ES is (L_[1] + L_[2] + 0.5 L_[3]) / 2.5.
// At least one whole observation must lie in the tail: n(1-c) >= 1.
func HistoricalVaR(r []float64, c float64) (VaREstimate, error) {
	if err := checkConfidence("historical var", c); err != nil {
		return VaREstimate{}, err
	}
	n := len(r)
	m := float64(n) * (1 - c)
	if m < 1-1e-9 {
		return VaREstimate{}, fmt.Errorf("stats: historical var: %d returns leave %.3g in the %v tail, need 1: %w", n, m, c, ErrTooShort)
	}
	if err := checkFinite("historical var", r); err != nil {
		return VaREstimate{}, err
	}
	loss := make([]float64, n)
	for i, v := range r {
		loss[i] = -v
	}
	slices.Sort(loss) // ascending: the worst loss is last
	v := loss[ceilRank(n, c)-1]

	k := int(math.Floor(m + 1e-9))
	var sum float64
	for i := 0; i < k; i++ {
		sum += loss[n-1-i]
	}
	if frac := m - float64(k); frac > 1e-9 && k < n {
		sum += frac * loss[n-1-k]
	}
	return VaREstimate{VaR: v, ES: sum / m, Observations: n}, nil
}

// NormalVaR returns parametric VaR and ES at confidence c for returns assumed
// normal with the sample mean μ and sample standard deviation σ (n-1):
//
//	VaR = z_c σ - μ,   ES = σ φ(z_c)/(1-c) - μ,   z_c = Φ⁻¹(c)
//
// (z_0.95 = 1.6449, z_0.99 = 2.3263).
func NormalVaR(r []float64, c float64) (VaREstimate, error) {
	if err := checkConfidence("normal var", c); err != nil {
		return VaREstimate{}, err
	}
	mu, sigma, err := meanStd("normal var", r)
	if err != nil {
		return VaREstimate{}, err
	}
	z := distuv.UnitNormal.Quantile(c)
	return VaREstimate{
		VaR:          z*sigma - mu,
		ES:           sigma*distuv.UnitNormal.Prob(z)/(1-c) - mu,
		Observations: len(r),
	}, nil
}

func meanStd(op string, r []float64) (mu, sigma float64, err error) {
	if len(r) < 2 {
		return 0, 0, fmt.Errorf("stats: %s: %d returns, need 2: %w", op, len(r), ErrTooShort)
	}
	if err := checkFinite(op, r); err != nil {
		return 0, 0, err
	}
	mu = mean(r)
	return mu, math.Sqrt(centralSum(r, mu, 2) / float64(len(r)-1)), nil
}
