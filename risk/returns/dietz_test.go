package returns

import (
	"errors"
	"math"
	"testing"
)

// TestModifiedDietzWorkedExample. Source: the Modified Dietz formula as the
// CFA Institute's GIPS materials define it, R = (EMV - BMV - ΣCF) /
// (BMV + Σ W_i CF_i), W_i = (CD - D_i)/CD (from memory); the numbers are
// ours, chosen so the arithmetic can be checked by hand:
//
//	start 31 March, value 100,000; end 30 April, value 112,000; CD = 30
//	+10,000 at the end of 10 April: D = 10, W = 20/30
//	 -5,000 at the end of 20 April: D = 20, W = 10/30
//	gain = 112,000 - 100,000 - 5,000 = 7,000
//	average capital = 100,000 + 6,666.67 - 1,666.67 = 105,000
//	R = 7,000 / 105,000 = 6.6667%
//
// Tolerance 1e-15: a quotient of numbers exact to a few ulps.
func TestModifiedDietzWorkedExample(t *testing.T) {
	r, err := ModifiedDietz(d("2024-03-31"), d("2024-04-30"), 100_000, 112_000,
		[]Flow{{Date: d("2024-04-10"), Amount: 10_000}, {Date: d("2024-04-20"), Amount: -5_000}})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r-1.0/15) > 1e-15 {
		t.Errorf("R = %v, want 0.0666…", r)
	}
	// Without flows it is the simple return; a flow on the last day has
	// weight 0 (end-of-day convention).
	r, _ = ModifiedDietz(d("2024-03-31"), d("2024-04-30"), 200, 210, nil)
	r2, _ := ModifiedDietz(d("2024-03-31"), d("2024-04-30"), 200, 260, []Flow{{Date: d("2024-04-30"), Amount: 50}})
	if r != 0.05 || r2 != 0.05 {
		t.Errorf("no flow %v, last-day flow %v, want 0.05", r, r2)
	}
}

func TestModifiedDietzErrors(t *testing.T) {
	if _, err := ModifiedDietz(d("2024-04-30"), d("2024-04-30"), 1, 1, nil); !errors.Is(err, ErrDate) {
		t.Errorf("empty period: %v", err)
	}
	if _, err := ModifiedDietz(d("2024-03-31"), d("2024-04-30"), 1, 1, []Flow{{Date: d("2024-03-31"), Amount: 1}}); !errors.Is(err, ErrDate) {
		t.Errorf("flow on the start day: %v", err)
	}
	// Withdrawing everything early leaves no average capital.
	if _, err := ModifiedDietz(d("2024-03-31"), d("2024-04-30"), 100, 0, []Flow{{Date: d("2024-04-01"), Amount: -120}}); !errors.Is(err, ErrDietz) {
		t.Errorf("negative capital: %v", err)
	}
}
