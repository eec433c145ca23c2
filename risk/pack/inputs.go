package pack

import "time"

// Inputs is everything one portfolio's pack is computed from, gathered
// from the store by the pipeline. The run's input hash covers every row
// in it except Sources (see jobs' inputHash), and an export writes it back
// out as CSV in the ingest formats.
type Inputs struct {
	AsOf         time.Time     `json:"as_of"`
	BaseCurrency string        `json:"base_currency"`
	Portfolio    PortfolioInfo `json:"portfolio"`
	// Securities are every security in the store: the held ones and the
	// benchmark's members.
	Securities []Security `json:"securities"`
	// Snapshots are the portfolio's current holdings snapshots from
	// inception to AsOf, oldest first.
	Snapshots []Snapshot `json:"snapshots"`
	// Prices are daily bars per security up to AsOf, each oldest first.
	Prices []PriceSeries `json:"prices"`
	// Yields are the daily yield curves up to AsOf, oldest first.
	Yields []YieldCurve `json:"yields"`
	// Premiums are the daily equity risk premiums up to AsOf.
	Premiums []DatedValue `json:"premiums"`
	// Flows are the portfolio's external cash flows up to AsOf.
	Flows []DatedValue `json:"flows"`
	// Assumptions are each security's valuation assumptions history up
	// to AsOf, oldest first per security.
	Assumptions []Assumption `json:"assumptions"`
	// History is the headline metrics of the portfolio's earlier current
	// runs, oldest first (drift and history charts).
	History []HistoryPoint `json:"history"`
	// Sources names the ingested files the rows came from.
	Sources []string `json:"sources"`
}

// Security is a security's static data.
type Security struct {
	ID                string  `json:"id"`
	Name              string  `json:"name"`
	Sector            string  `json:"sector"`
	Currency          string  `json:"currency"`
	SharesOutstanding float64 `json:"shares_outstanding"`
}

// Snapshot is the holdings of the portfolio at the close of AsOf.
type Snapshot struct {
	AsOf     time.Time `json:"as_of"`
	Revision int       `json:"revision"`
	Cash     float64   `json:"cash"`
	Lines    []Line    `json:"lines"`
}

// Line is one security held in a snapshot.
type Line struct {
	SecurityID string  `json:"security_id"`
	Quantity   float64 `json:"quantity"`
	Price      float64 `json:"price"`
}

// PriceSeries is one security's daily bars: unadjusted close, the cash
// dividend per share going ex that day, and the split ratio that day (new
// shares per old share, 1 on ordinary days).
type PriceSeries struct {
	SecurityID string      `json:"security_id"`
	Dates      []time.Time `json:"dates"`
	Close      []float64   `json:"close"`
	Dividend   []float64   `json:"dividend"`
	Split      []float64   `json:"split"`
}

// YieldCurve is one day's zero-coupon yields (annually compounded,
// decimal) by tenor in months.
type YieldCurve struct {
	Date   time.Time `json:"date"`
	Tenors []int     `json:"tenors_months"`
	Yields []float64 `json:"yields"`
}

// DatedValue is a value on a date.
type DatedValue struct {
	Date  time.Time `json:"date"`
	Value float64   `json:"value"`
}

// Assumption is a security's valuation assumptions from an effective date.
type Assumption struct {
	SecurityID     string    `json:"security_id"`
	Effective      time.Time `json:"effective"`
	AnnualDividend float64   `json:"annual_dividend"`
	Frequency      int       `json:"frequency"`
	Growth         float64   `json:"growth"`
	Beta           *float64  `json:"beta,omitempty"`
	DiscountRate   *float64  `json:"discount_rate,omitempty"`
	Stages         []Stage   `json:"stages,omitempty"`
}

// Stage is one finite stage of a multi-stage forecast.
type Stage struct {
	Years  float64  `json:"years"`
	Growth float64  `json:"growth"`
	Rate   *float64 `json:"rate,omitempty"`
}
