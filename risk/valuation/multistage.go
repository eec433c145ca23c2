package valuation

import (
	"errors"
	"fmt"
	"math"
)

// MultiStage is the multi-stage dividend model: any number of finite stages,
// each with its own length, dividend growth and discount rate, then a
// perpetual constant-growth terminal stage.
//
//	V = (1+k₁)^stub · Σ_{j≥1} (D0/m) · G(j/m) · DF(j/m)
//
// on the payment clock τ (years since the last payment): G(τ) = Π_i (1+g_i)^{τ_i}
// and DF(τ) = Π_i (1+k_i)^{−τ_i}, where τ_i is the time spent in stage i up to τ.
// Growth and discount rates therefore chain stage by stage (stage rates act
// as forward rates). A payment on a stage boundary belongs to the earlier
// stage. The factor (1+k₁)^stub carries the value from the last payment date
// to the valuation date, StubFraction/m years later, at the first stage's
// rate; with a single rate this is exactly discounting payment j over
// t_j = j/m − stub years.
//
// Each stage's payments form a geometric series, summed in closed form, so a
// valuation costs O(number of stages), not O(number of payments).
//
// With every stage at the terminal growth and rate, the value equals the
// constant-growth value (ConstantGrowth) for any frequency and stub.
type MultiStage struct {
	D0           float64 // trailing annual dividend per share
	Frequency    int     // 1, 2, 4 or 12 payments a year; 0 means 1
	StubFraction float64 // fraction of the payment period elapsed, [0, 1)
	Stages       []Stage // finite stages; a nil Rate means K
	K, G         float64 // terminal discount rate and growth, K > G
}

// Value returns the model value per share.
func (ms MultiStage) Value() (float64, error) {
	var md model
	if err := md.buildStages(ms.D0, ms.Frequency, ms.StubFraction, ms.Stages, ms.K, ms.G, false, false); err != nil {
		return 0, err
	}
	sh := shifts{stage: -1}
	return md.value(&sh), nil
}

// buildStages validates and prepares a constant-growth (no stages) or
// multi-stage model.
func (md *model) buildStages(d0 float64, freq int, stubFrac float64, stages []Stage, k, g float64, linked, d1Fixed bool) error {
	if err := md.setCommon(d0, freq, stubFrac, d1Fixed); err != nil {
		return err
	}
	if err := checkRateGrowth("discount rate", k, "growth", g); err != nil {
		return err
	}
	if k <= g {
		return inputErr("terminal k - g", k-g, ErrGrowthNotBelowRate)
	}
	start := 0.0
	for i, st := range stages {
		if !finite(st.Years) {
			return inputErr(fmt.Sprintf("stage %d years", i+1), st.Years, ErrNotFinite)
		}
		if st.Years <= 0 {
			return inputErr(fmt.Sprintf("stage %d years", i+1), st.Years, ErrStageLength)
		}
		sk, sl := k, linked
		if st.Rate != nil {
			sk, sl = *st.Rate, false
			md.explicitRate = true
		}
		if err := checkRateGrowth("rate", sk, "growth", st.Growth); err != nil {
			var ie *InputError
			if errors.As(err, &ie) {
				ie.Field = fmt.Sprintf("stage %d %s", i+1, ie.Field)
			}
			return err
		}
		md.addSegment(start, st.Years, st.Growth, sk, sl)
		start += st.Years
	}
	md.addSegment(start, -1, g, k, linked)
	md.kind = ModelConstantGrowth
	if len(stages) > 0 {
		md.kind = ModelMultiStage
	}
	md.k, md.g, md.linked = k, g, linked
	md.lnG1 = 0
	for i := range md.segs {
		md.lnG1 += md.segs[i].ov1 * md.segs[i].lg
	}
	return nil
}

func checkRateGrowth(kName string, k float64, gName string, g float64) error {
	if !finite(k) {
		return inputErr(kName, k, ErrNotFinite)
	}
	if k <= 0 {
		return inputErr(kName, k, ErrRateOutOfRange)
	}
	if !finite(g) {
		return inputErr(gName, g, ErrNotFinite)
	}
	if g <= -1 {
		return inputErr(gName, g, ErrGrowthOutOfRange)
	}
	return nil
}

// valueStages evaluates the stage model in closed form, stage by stage:
//
//	PV_i = (D0/m) · e^{A_i + a_i·ln r_i} · Σ_{l<n_i} r_i^{l/m},  r_i = (1+g_i)/(1+k_i)
//
// where A_i is the log growth-and-discount factor accumulated before the
// stage and a_i the distance from the stage start to its first payment. The
// terminal sum is 1/(1 − r^{1/m}). Returns NaN if shifts push the terminal
// stage to k ≤ g (callers control steps so that this cannot happen).
func (md *model) valueStages(sh *shifts) float64 {
	var acc, pv, roll, lnG1 float64
	for i := range md.segs {
		s := &md.segs[i]
		lg, lk := s.lg, s.lk
		dg, dk := sh.growth, sh.rate
		if s.linked {
			dk += sh.linked
		}
		if i == sh.stage {
			dg += sh.stageGrowth
			dk += sh.stageRate
		}
		if dg != 0 {
			lg = math.Log1p(s.g + dg)
		}
		if dk != 0 {
			lk = math.Log1p(s.k + dk)
		}
		if i == 0 {
			roll = md.stub * (lk + sh.cts)
		}
		lnG1 += s.ov1 * lg
		lr := lg - lk - sh.cts
		lq := lr / md.m
		switch {
		case s.n < 0:
			if lq >= 0 {
				return math.NaN()
			}
			pv += math.Exp(acc+s.first*lr) / -math.Expm1(lq)
			continue // terminal: nothing accumulates after it
		case s.n > 0:
			pv += math.Exp(acc+s.first*lr) * geometric(s.n, lq)
		}
		acc += (s.end - s.start) * lr
	}
	return md.d0 / md.m * pv * math.Exp(roll) * md.d1Adjust(lnG1)
}
