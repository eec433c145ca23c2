package valuation

// Anscombe's quartet, data set I (Anscombe 1973, "Graphs in Statistical
// Analysis", The American Statistician 27(1)), an open data set shipped
// with R as `anscombe`. R's lm(y1 ~ x1, data = anscombe) reports (from
// memory; to the 4 decimals R prints): intercept 3.0001, slope 0.5001,
// slope standard error 0.1179, R² 0.6665.
var (
	anscombeX = []float64{10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5}
	anscombeY = []float64{8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68}
)

// R prints four decimals, so compare to within half a unit of the last one.
const rPrintTol = 0.5e-4
