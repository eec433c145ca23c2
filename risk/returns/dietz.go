package returns

import (
	"fmt"
	"time"
)

// ModifiedDietz returns the Modified Dietz return of a period from the close
// of start (value v0) to the close of end (value v1, which includes the
// flows), with end-of-day external flows dated in (start, end]:
//
//	R = (V1 - V0 - Σ F_k) / (V0 + Σ w_k F_k),   w_k = (CD - D_k) / CD
//
// where CD is the number of calendar days in the period and D_k the number
// of days from start to the flow's date. A flow at the end of day D_k is
// invested for the CD - D_k days that remain (one on the last day gets weight
// 0, one on the day after start gets (CD-1)/CD). The denominator, the average
// capital invested, must be positive.
func ModifiedDietz(start, end time.Time, v0, v1 float64, flows []Flow) (float64, error) {
	cd := daysBetween(start, end)
	if cd <= 0 {
		return 0, fmt.Errorf("returns: modified dietz: %s to %s: %w", start.Format(time.DateOnly), end.Format(time.DateOnly), ErrDate)
	}
	if !isFinite(v0) || !isFinite(v1) {
		return 0, fmt.Errorf("returns: modified dietz: values %v, %v: %w", v0, v1, ErrNonFinite)
	}
	var net, weighted float64
	for _, f := range flows {
		dk := daysBetween(start, f.Date)
		if dk <= 0 || dk > cd {
			return 0, fmt.Errorf("returns: modified dietz: flow on %s outside (%s, %s]: %w", f.Date.Format(time.DateOnly),
				start.Format(time.DateOnly), end.Format(time.DateOnly), ErrDate)
		}
		if !isFinite(f.Amount) {
			return 0, fmt.Errorf("returns: modified dietz: flow on %s: %v: %w", f.Date.Format(time.DateOnly), f.Amount, ErrNonFinite)
		}
		net += f.Amount
		weighted += float64(cd-dk) / float64(cd) * f.Amount
	}
	den := v0 + weighted
	if den <= 0 {
		return 0, fmt.Errorf("returns: modified dietz: %s to %s: average capital %v: %w", start.Format(time.DateOnly), end.Format(time.DateOnly), den, ErrDietz)
	}
	return (v1 - v0 - net) / den, nil
}
