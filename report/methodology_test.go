package report

import (
	"slices"
	"testing"
)

// Files that differ only by their date fold into one line when there are
// more than three; other names are listed as they are.
func TestSourceLines(t *testing.T) {
	var src []string
	for _, d := range []string{"2026-11-13", "2026-11-06", "2026-11-20", "2026-11-27"} {
		src = append(src, "holdings-"+d+".csv")
	}
	src = append(src, "prices.csv", "yields-2026-11-27.csv", "yields-2026-11-20.csv")
	want := []string{
		"holdings-YYYY-MM-DD.csv: 4 files dated 2026-11-06 to 2026-11-27",
		"prices.csv", "yields-2026-11-27.csv", "yields-2026-11-20.csv",
	}
	if got := sourceLines(src); !slices.Equal(got, want) {
		t.Errorf("sourceLines = %q, want %q", got, want)
	}
}
