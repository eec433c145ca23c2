// Package pack assembles every measure of one portfolio on one as-of date
// into a results Document: the single, versioned record that is persisted
// with a run, rendered into the PDF, mailed, and recomputed by verify.
//
// Conventions: amounts are in the base currency; rates, returns, weights
// and durations' shocks are decimals (0.05 means 5%); durations are in
// years (per unit change of the rate); dates are "YYYY-MM-DD". A figure
// that could not be computed is absent (null in JSON), never zero.
package pack

// SchemaVersion identifies the layout of Document. Bump it on any change
// that alters the meaning of a field; readers refuse unknown versions.
const SchemaVersion = "plumbline.pack/1"

// Document is the full result of one pack run for one portfolio.
type Document struct {
	Schema       string        `json:"schema"`
	Portfolio    PortfolioInfo `json:"portfolio"`
	AsOf         string        `json:"as_of"`
	BaseCurrency string        `json:"base_currency"`

	Summary       Summary        `json:"summary"`
	Holdings      []Holding      `json:"holdings"`
	Sectors       []Sector       `json:"sectors"`
	Concentration Concentration  `json:"concentration"`
	Curve         *Curve         `json:"curve,omitempty"`
	Explain       *Explain       `json:"explain,omitempty"`
	Series        Series         `json:"series"`
	VaR           []VaRFigure    `json:"var"`
	Backtest      *Backtest      `json:"backtest,omitempty"`
	Stress        []StressResult `json:"stress"`
	Replays       []StressResult `json:"replays"`
	Limits        []LimitStatus  `json:"limits"`
	Drift         []DriftItem    `json:"drift"`
	Excluded      []Exclusion    `json:"excluded"`
	DataQuality   []Finding      `json:"data_quality"`
	Methodology   Methodology    `json:"methodology"`
	// History is the headline metrics of this portfolio's earlier current
	// runs and of this one, oldest first, so charts of drift render from
	// the document alone.
	History []HistoryPoint `json:"history"`
}

// HistoryPoint is one run's headline metrics.
type HistoryPoint struct {
	AsOf    string             `json:"as_of"`
	Metrics map[string]float64 `json:"metrics"`
}

// PortfolioInfo describes the portfolio as loaded.
type PortfolioInfo struct {
	ID              string `json:"id"`
	Name            string `json:"name"`
	Strategy        string `json:"strategy"`
	Inception       string `json:"inception"`
	BenchmarkMethod string `json:"benchmark_method"`
}

// Summary holds the headline figures of the one-page summary.
type Summary struct {
	Value        float64 `json:"value"`         // market value incl. cash
	Cash         float64 `json:"cash"`          // cash line
	HoldingCount int     `json:"holding_count"` // securities held (cash excluded)

	Returns Returns `json:"returns"`

	// Volatility is the annualised sample standard deviation of daily
	// discrete returns over each configured window (sqrt(252) scaling).
	Volatility []WindowVol `json:"volatility"`
	// EWMAVolatility is annualised EWMA volatility of daily returns.
	EWMAVolatility *float64 `json:"ewma_volatility,omitempty"`

	// Rate sensitivity, value-weighted over holdings with a model value
	// (cash at zero duration): modified duration -(1/V)dV/dk, Macaulay
	// duration, convexity (1/V)d2V/dk2.
	ModifiedDuration *float64 `json:"modified_duration,omitempty"`
	MacaulayDuration *float64 `json:"macaulay_duration,omitempty"`
	Convexity        *float64 `json:"convexity,omitempty"`
	// DollarDuration01 is the change of value for a 1 bp rise in k (negative
	// for a rise in value when k falls), in currency.
	DollarDuration01 *float64 `json:"dollar_duration_01,omitempty"`
	GrowthDuration   *float64 `json:"growth_duration,omitempty"`
	GrowthConvexity  *float64 `json:"growth_convexity,omitempty"`
	Beta             *float64 `json:"beta,omitempty"`
	// NS factor durations -(1/V)dV/dfactor for level, slope, curvature.
	LevelDuration     *float64 `json:"level_duration,omitempty"`
	SlopeDuration     *float64 `json:"slope_duration,omitempty"`
	CurvatureDuration *float64 `json:"curvature_duration,omitempty"`
	// Empirical duration: minus the slope of weekly total returns on weekly
	// yield changes, with its standard error and R-squared.
	Empirical *Regression `json:"empirical_duration,omitempty"`

	// Against the benchmark built from the store's securities.
	BenchmarkBeta   *float64 `json:"benchmark_beta,omitempty"`
	TrackingError   *float64 `json:"tracking_error,omitempty"` // annualised
	MaxDrawdown     *float64 `json:"max_drawdown,omitempty"`   // negative decimal
	CurrentDrawdown *float64 `json:"current_drawdown,omitempty"`
}

// Returns are time-weighted returns (GIPS: large flows revalued, Modified
// Dietz in between, sub-periods linked geometrically). Periods over a year
// carry an annualised figure too.
type Returns struct {
	Week                *float64 `json:"week,omitempty"`
	MonthToDate         *float64 `json:"month_to_date,omitempty"`
	QuarterToDate       *float64 `json:"quarter_to_date,omitempty"`
	YearToDate          *float64 `json:"year_to_date,omitempty"`
	SinceInception      *float64 `json:"since_inception,omitempty"`
	SinceInceptionAnn   *float64 `json:"since_inception_annualised,omitempty"`
	InceptionDate       string   `json:"inception_date"`
	BenchmarkWeek       *float64 `json:"benchmark_week,omitempty"`
	BenchmarkYearToDate *float64 `json:"benchmark_year_to_date,omitempty"`
}

// WindowVol is one rolling window's latest annualised volatility.
type WindowVol struct {
	WindowDays int      `json:"window_days"`
	Discrete   *float64 `json:"discrete,omitempty"`
	Log        *float64 `json:"log,omitempty"`
	// Dollar is the daily standard deviation of value changes, currency.
	Dollar *float64 `json:"dollar,omitempty"`
}

// Regression is an OLS slope with its standard error and fit.
type Regression struct {
	Value  float64 `json:"value"`
	StdErr float64 `json:"std_err"`
	R2     float64 `json:"r2"`
	N      int     `json:"n"`
}

// Holding is one line of the portfolio with its sensitivities.
type Holding struct {
	ID        string  `json:"id"`
	Name      string  `json:"name"`
	Sector    string  `json:"sector"`
	Quantity  float64 `json:"quantity"`
	Price     float64 `json:"price"`
	PriceDate string  `json:"price_date"`
	Value     float64 `json:"value"`
	Weight    float64 `json:"weight"`

	// Model is "constant_growth", "multi_stage" or "term_structure"; empty
	// when the holding is excluded (see Document.Excluded).
	Model       string   `json:"model,omitempty"`
	K           *float64 `json:"k,omitempty"`
	G           *float64 `json:"g,omitempty"`
	D0          *float64 `json:"d0,omitempty"`
	ModelValue  *float64 `json:"model_value,omitempty"` // per share
	Beta        *float64 `json:"beta,omitempty"`
	BetaSource  string   `json:"beta_source,omitempty"` // "assumption" or "estimated"
	ModDuration *float64 `json:"modified_duration,omitempty"`
	MacDuration *float64 `json:"macaulay_duration,omitempty"`
	Convexity   *float64 `json:"convexity,omitempty"`
	GrowthDur   *float64 `json:"growth_duration,omitempty"`
	GrowthConv  *float64 `json:"growth_convexity,omitempty"`
	LevelDur    *float64 `json:"level_duration,omitempty"`
	SlopeDur    *float64 `json:"slope_duration,omitempty"`
	CurveDur    *float64 `json:"curvature_duration,omitempty"`
	// Contributions: weight x measure, summing to the portfolio figure.
	ContribDuration       *float64    `json:"contrib_duration,omitempty"`
	ContribGrowthDuration *float64    `json:"contrib_growth_duration,omitempty"`
	Empirical             *Regression `json:"empirical_duration,omitempty"`
	// NumericalError is the estimated error of the numerical duration.
	NumericalError *float64 `json:"numerical_error,omitempty"`
	// Explain is the week's return explanation for the holding.
	Explain *Explain `json:"explain,omitempty"`
}

// Sector aggregates holdings of one sector.
type Sector struct {
	Name                  string   `json:"name"`
	Weight                float64  `json:"weight"`
	Value                 float64  `json:"value"`
	ContribDuration       *float64 `json:"contrib_duration,omitempty"`
	ContribGrowthDuration *float64 `json:"contrib_growth_duration,omitempty"`
}

// Concentration summarises how concentrated the book is.
type Concentration struct {
	// HHI is the Herfindahl-Hirschman index sum(w_i^2) over securities.
	HHI float64 `json:"hhi"`
	// EffectiveN is 1/HHI.
	EffectiveN    float64 `json:"effective_n"`
	Top5Weight    float64 `json:"top5_weight"`
	MaxSingleName float64 `json:"max_single_name"`
	MaxSingleID   string  `json:"max_single_id"`
	MaxSector     float64 `json:"max_sector"`
	MaxSectorName string  `json:"max_sector_name"`
	CashWeight    float64 `json:"cash_weight"`
}

// Curve is the Nelson-Siegel fit of the as-of yield curve.
type Curve struct {
	Date      string       `json:"date"`
	Level     float64      `json:"level"`
	Slope     float64      `json:"slope"`
	Curvature float64      `json:"curvature"`
	Lambda    float64      `json:"lambda"` // decay, per year
	RMSE      float64      `json:"rmse"`
	Points    []CurvePoint `json:"points"`
}

// CurvePoint is an observed yield beside the fitted one.
type CurvePoint struct {
	TenorMonths int     `json:"tenor_months"`
	Yield       float64 `json:"yield"`
	Fitted      float64 `json:"fitted"`
}

// Explain is a second-order Taylor explanation of a return from changes
// in k and g between two dates, beside full revaluation.
//
// For a holding, DeltaK and DeltaG are its own changes k1 − k0 and
// g1 − g0 (decimal). For the portfolio, whose Taylor terms sum each
// holding's own, they are the value-weighted averages of the included
// holdings' changes, Δk_p = Σ_i MV_i·Δk_i / Σ_i MV_i with MV_i at From
// (cash and holdings left out of the explanation not counted; zero when
// no holding is included): a summary of how far k and g moved, not a
// move the Taylor terms were computed from.
type Explain struct {
	From     string   `json:"from"`
	To       string   `json:"to"`
	DeltaK   float64  `json:"delta_k"`
	DeltaG   float64  `json:"delta_g"`
	Taylor   float64  `json:"taylor"`           // estimated model return
	Full     float64  `json:"full"`             // full-revaluation model return
	Residual float64  `json:"residual"`         // Full - Taylor
	Actual   *float64 `json:"actual,omitempty"` // realised total return
}

// Series holds the time series behind the charts, oldest first.
type Series struct {
	Dates     []string        `json:"dates"`
	Value     []float64       `json:"value"`
	Discrete  []float64       `json:"discrete"`  // daily TWR returns
	Log       []float64       `json:"log"`       // ln(1+r)
	Dollar    []float64       `json:"dollar"`    // flow-adjusted value change
	Benchmark []float64       `json:"benchmark"` // benchmark index level
	Rolling   []RollingSeries `json:"rolling"`
}

// RollingSeries is one rolling statistic aligned with Series.Dates; null
// where the window is not yet full.
type RollingSeries struct {
	WindowDays int        `json:"window_days"`
	Kind       string     `json:"kind"` // "discrete", "log" or "dollar"
	Stat       string     `json:"stat"` // "std_ann" or "std"
	Values     []*float64 `json:"values"`
}

// VaRFigure is one VaR/ES estimate as a positive loss fraction of value
// and in currency.
type VaRFigure struct {
	Method      string  `json:"method"` // "historical", "normal", "cornish_fisher"
	Confidence  float64 `json:"confidence"`
	HorizonDays int     `json:"horizon_days"`
	VaR         float64 `json:"var"`
	ES          float64 `json:"es"`
	VaRAmount   float64 `json:"var_amount"`
	ESAmount    float64 `json:"es_amount"`
}

// Backtest compares realised daily returns with the 1-day 99% VaR.
type Backtest struct {
	Days       int     `json:"days"`
	Confidence float64 `json:"confidence"`
	Exceptions int     `json:"exceptions"`
	Expected   float64 `json:"expected"`
	KupiecLR   float64 `json:"kupiec_lr"`
	PValue     float64 `json:"p_value"`
	Zone       string  `json:"zone"` // "green", "yellow", "red"
}

// StressResult is one scenario or historical replay.
type StressResult struct {
	Name        string        `json:"name"`
	Description string        `json:"description"`
	From        string        `json:"from,omitempty"` // replays only
	To          string        `json:"to,omitempty"`
	PnL         float64       `json:"pnl"`
	PnLPct      float64       `json:"pnl_pct"`
	Taylor      *float64      `json:"taylor_pnl,omitempty"`
	TaylorPct   *float64      `json:"taylor_pct,omitempty"`
	Error       *float64      `json:"error,omitempty"` // full - Taylor, currency
	Top         []Contributor `json:"top"`
	Failed      []Exclusion   `json:"failed,omitempty"`
}

// Contributor is one holding's share of a scenario's P&L.
type Contributor struct {
	ID     string   `json:"id"`
	Sector string   `json:"sector"`
	PnL    float64  `json:"pnl"`
	Pct    float64  `json:"pct"` // of the holding's value
	Taylor *float64 `json:"taylor_pnl,omitempty"`
}

// LimitStatus is one limit's reading.
type LimitStatus struct {
	Name   string `json:"name"`
	Metric string `json:"metric"`
	// Scenario names the scenario of a scenario_loss limit.
	Scenario string   `json:"scenario,omitempty"`
	Value    *float64 `json:"value,omitempty"`
	Status   string   `json:"status"` // "ok", "warning", "breach", "no_data"
	// Side tells which bound Level is: "max" (a ceiling, Headroom =
	// Level − Value) or "min" (a floor, Headroom = Value − Level); for a
	// range, the one nearer the value (max on a tie or without a value).
	// Documents written before the field have none.
	Side     string   `json:"side,omitempty"`
	Level    *float64 `json:"level,omitempty"`    // the breach level nearest the value
	Headroom *float64 `json:"headroom,omitempty"` // to the breach level, metric units
}

// DriftItem is a headline metric's change since the previous run.
type DriftItem struct {
	Metric   string   `json:"metric"`
	Value    float64  `json:"value"`
	Previous *float64 `json:"previous,omitempty"`
	Change   *float64 `json:"change,omitempty"`
	// Z is the change divided by the standard deviation of past changes.
	Z       *float64 `json:"z,omitempty"`
	History int      `json:"history"` // past changes used
	Flagged bool     `json:"flagged"`
}

// Exclusion is a holding left out of a measure, with why and how much.
type Exclusion struct {
	ID         string  `json:"id"`
	Reason     string  `json:"reason"`
	ValueShare float64 `json:"value_share"`
}

// Finding is a data-quality observation.
type Finding struct {
	Kind       string  `json:"kind"` // e.g. "stale_price", "missing_price", "no_assumptions"
	ID         string  `json:"id,omitempty"`
	Detail     string  `json:"detail"`
	ValueShare float64 `json:"value_share"`
}

// Methodology records the models, conventions and parameters used, taken
// from the run's own configuration and inputs.
type Methodology struct {
	Parameters  map[string]string `json:"parameters"`
	Models      []string          `json:"models"`
	DataSources []string          `json:"data_sources"`
}
