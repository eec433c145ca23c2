package stats

import (
	"errors"
	"testing"
)

// TestMomentsAgainstScipy: numpy mean, std(ddof=1), scipy 1.10
// scipy.stats.skew(bias=False) and kurtosis(fisher=True, bias=False) of the
// asset returns. Tolerance 1e-10 relative (12-digit JSON).
func TestMomentsAgainstScipy(t *testing.T) {
	ref := loadReference(t)
	asset, _ := assetReturns(t)
	m, _ := Mean(asset)
	s, _ := StdDev(asset)
	sk, _ := Skewness(asset)
	k, err := ExcessKurtosis(asset)
	if err != nil {
		t.Fatal(err)
	}
	w := ref.Moments
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"mean", m, w.Mean}, {"std", s, w.Std}, {"skew", sk, w.Skew}, {"kurt", k, w.Kurt}} {
		if !closeTo(c.got, c.want, 1e-10, 0) {
			t.Errorf("%s = %v, scipy %v", c.name, c.got, c.want)
		}
	}
}

// TestMomentsSmall: x = 1, 2, 3, 10. Hand computation: mean 4, deviations
// -3, -2, -1, 6; m2 = 50/4, m3 = 180/4, m4 = 1394/4.
// g1 = 45/12.5^1.5, G1 = sqrt(12)/2·g1 = 1.76363…;
// g2 = 348.5/156.25 - 3, G2 = 3/2·(5 g2 + 6) = 3.228.
// scipy 1.10 skew/kurtosis(bias=False) give 1.7636326148038886 and 3.228.
func TestMomentsSmall(t *testing.T) {
	x := []float64{1, 2, 3, 10}
	sk, _ := Skewness(x)
	k, _ := ExcessKurtosis(x)
	g1 := 45 / (12.5 * 3.5355339059327378) // 12.5^1.5 = 12.5·sqrt(12.5)
	wantS := 1.7320508075688772 * g1       // sqrt(12)/2
	g2 := 348.5/156.25 - 3
	wantK := 1.5 * (5*g2 + 6)
	if !closeTo(sk, wantS, 1e-14, 0) || !closeTo(k, wantK, 1e-14, 0) {
		t.Errorf("skew %v kurt %v, want %v %v", sk, k, wantS, wantK)
	}
	if !closeTo(sk, 1.7636326148038886, 1e-14, 0) || !closeTo(k, 3.228, 1e-14, 0) {
		t.Errorf("skew %v kurt %v, scipy 1.7636326148038886 3.228", sk, k)
	}
}

func TestMomentsErrors(t *testing.T) {
	if _, err := Skewness([]float64{1, 2}); !errors.Is(err, ErrTooShort) {
		t.Errorf("skew short: %v", err)
	}
	if _, err := ExcessKurtosis([]float64{2, 2, 2, 2}); !errors.Is(err, ErrZeroVariance) {
		t.Errorf("kurt constant: %v", err)
	}
	if _, err := Mean(nil); !errors.Is(err, ErrEmpty) {
		t.Errorf("mean empty: %v", err)
	}
}
