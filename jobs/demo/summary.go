package demo

import "time"

// Summary describes what Generate wrote.
type Summary struct {
	Dir          string
	Firm         string
	BaseCurrency string
	Seed         int64
	// Start is the first day of the price history, Inception the first
	// snapshot (every portfolio's inception_date), End the last day.
	Start, Inception, End time.Time
	Portfolios            []Portfolio
	// Files are the paths written, relative to Dir, slash-separated, sorted.
	Files    []string
	Counts   Counts
	Findings []Finding
}

// Portfolio names one portfolio of the scenario.
type Portfolio struct {
	ID, Name, Strategy, BenchmarkMethod string
}

// Counts are the numbers of things written.
type Counts struct {
	Portfolios int
	Securities int
	PriceRows  int
	Dividends  int // price rows with a dividend
	Splits     int // price rows with a split ratio
	// SnapshotFiles is the number of holdings files (one per snapshot
	// date); Snapshots the number of (date, portfolio) snapshots.
	SnapshotFiles int
	Snapshots     int
	HoldingRows   int
	Flows         int
	YieldRows     int
	PremiumRows   int
	// AssumptionRows counts every row of assumptions.csv; AssumptionChanges
	// those after each security's first row.
	AssumptionRows    int
	AssumptionChanges int
}

// Finding is a data problem planted in the scenario on purpose.
type Finding struct {
	Kind       string // FindingKLeG or FindingStalePrice
	SecurityID string
	Portfolio  string // the portfolio holding it
	Date       time.Time
	Note       string
}

// Kinds of planted findings.
const (
	FindingKLeG       = "k_le_g"
	FindingStalePrice = "stale_price"
)
