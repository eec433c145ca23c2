package stats

import (
	"errors"
	"math"
	"testing"
)

// TestDrawdownAgainstPandas: the price path 100·Π(1+r) of the asset returns
// (with its starting 100); pandas 1.5 v/v.cummax() - 1 for the series, its
// min and argmin for the maximum and the trough, numpy argmax up to the
// trough for the peak, and the first later value at or above the peak for
// the recovery. Tolerance 1e-11 relative to 1 (drawdowns are O(0.1)
// quotients of the same cumulative products; 12-digit JSON).
func TestDrawdownAgainstPandas(t *testing.T) {
	ref := loadReference(t)
	asset, _ := assetReturns(t)
	v := make([]float64, len(asset)+1)
	v[0] = 100
	for i, r := range asset {
		v[i+1] = v[i] * (1 + r)
	}
	d, err := Drawdowns(v)
	if err != nil {
		t.Fatal(err)
	}
	w := ref.Drawdown
	if !closeTo(d.Max, w.Max, 1e-11, 1) || d.Peak != w.Peak || d.Trough != w.Trough || d.Recovery != w.Recovery ||
		!closeTo(d.Current, w.Current, 1e-11, 1) {
		t.Errorf("got max %v peak %d trough %d recovery %d current %v; pandas %v %d %d %d %v",
			d.Max, d.Peak, d.Trough, d.Recovery, d.Current, w.Max, w.Peak, w.Trough, w.Recovery, w.Current)
	}
	for i := range w.Series {
		if !closeTo(d.Series[i], w.Series[i], 1e-11, 1) {
			t.Fatalf("series[%d] = %v, pandas %v", i, d.Series[i], w.Series[i])
		}
	}
	// DrawdownsFromReturns builds the same path from 1 instead of 100.
	d2, err := DrawdownsFromReturns(asset)
	if err != nil {
		t.Fatal(err)
	}
	if !closeTo(d2.Max, d.Max, 1e-13, 1) || d2.Trough != d.Trough {
		t.Errorf("from returns: %v at %d, want %v at %d", d2.Max, d2.Trough, d.Max, d.Trough)
	}
}

// TestDrawdownWorkedExample: 100, 120, 90, 130, 110. Running maxima 100,
// 120, 120, 130, 130; drawdowns 0, 0, -25%, 0, 110/130-1. Maximum -25% from
// the peak at 1 to the trough at 2, recovered at 3 (130 >= 120); currently
// 1 period below the peak at 3; longest spell below a peak 2 periods (1 to 3).
// Hand computation from the definitions.
func TestDrawdownWorkedExample(t *testing.T) {
	d, err := Drawdowns([]float64{100, 120, 90, 130, 110})
	if err != nil {
		t.Fatal(err)
	}
	if d.Max != -0.25 || d.Peak != 1 || d.Trough != 2 || d.Recovery != 3 || d.Length() != 1 || d.RecoveryLength() != 1 ||
		!closeTo(d.Current, 110.0/130-1, 1e-15, 0) || d.CurrentLength != 1 || d.LongestLength != 2 {
		t.Errorf("%+v", d)
	}
	// 100 -> 200 -> 100: returns +100% and -50%, drawdown -50%, not recovered.
	d, err = DrawdownsFromReturns([]float64{1, -0.5})
	if err != nil {
		t.Fatal(err)
	}
	if d.Max != -0.5 || d.Recovery != -1 || d.RecoveryLength() != -1 || d.CurrentLength != 1 {
		t.Errorf("%+v", d)
	}
	// A return to the old peak counts as recovery; a rising series has none.
	if d, _ = Drawdowns([]float64{100, 80, 100}); d.Recovery != 2 || d.Current != 0 {
		t.Errorf("tie: %+v", d)
	}
	if d, _ = Drawdowns([]float64{1, 2, 3}); d.Max != 0 || d.Recovery != -1 || d.LongestLength != 0 {
		t.Errorf("rising: %+v", d)
	}
}

func TestDrawdownErrors(t *testing.T) {
	if _, err := Drawdowns([]float64{100, 0, 90}); !errors.Is(err, ErrNonPositive) {
		t.Errorf("zero value: %v", err)
	}
	if _, err := Drawdowns(nil); !errors.Is(err, ErrEmpty) {
		t.Errorf("empty: %v", err)
	}
	if _, err := DrawdownsFromReturns([]float64{0.1, -1}); !errors.Is(err, ErrNonPositive) {
		t.Errorf("total loss: %v", err)
	}
	if _, err := Drawdowns([]float64{1, math.NaN()}); !errors.Is(err, ErrNonFinite) {
		t.Errorf("NaN: %v", err)
	}
}
