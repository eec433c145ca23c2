package pack

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// Headline metric names: the keys of HistoryPoint.Metrics and the
// DriftItem.Metric values, and the names readers (the report, the e-mails,
// the history command) look figures up by. They are the names of the
// limits package (limits.Metrics) where it has the measure; value and
// returns are added. VolatilityMetric and LossMetric name the others.
const (
	MetricValue          = "value"                  // market value incl. cash, currency
	MetricReturnWeek     = "return_week"            // trailing-week TWR, decimal
	MetricReturnMTD      = "return_mtd"             // TWR month to date
	MetricReturnQTD      = "return_qtd"             // TWR quarter to date
	MetricReturnYTD      = "return_ytd"             // TWR year to date
	MetricReturnSI       = "return_since_inception" // TWR since inception, cumulative
	MetricEWMA           = "volatility_ewma_ann"    // annualised, decimal
	MetricDurModified    = "duration_modified"      // years
	MetricDurMacaulay    = "duration_macaulay"      // years
	MetricDurEmpirical   = "duration_empirical"     // years
	MetricConvexity      = "convexity"              // years squared
	MetricGrowthDuration = "growth_duration"        // years
	MetricBeta           = "beta"                   // value-weighted CAPM beta
	MetricTrackingError  = "tracking_error_ann"     // annualised, decimal
	MetricMaxDrawdown    = "max_drawdown"           // since inception, negative decimal
	MetricHHI            = "hhi"                    // sum of squared weights
	MetricMaxSingleName  = "max_single_name_weight" // decimal
)

// Names of the limit metrics (limits.Metrics) that pack measures beyond
// the headline ones, all decimals of portfolio value.
const (
	MetricCashWeight      = "cash_weight"       // cash, negative for an overdraft
	MetricMaxSector       = "max_sector_weight" // the largest sector
	MetricWorstWindowLoss = "worst_window_loss" // the worst replayed window's loss, positive
)

// VolatilityMetric is the name of the annualised volatility over a
// window, "volatility_ann_63d" (decimal).
func VolatilityMetric(windowDays int) string {
	return "volatility_ann_" + strconv.Itoa(windowDays) + "d"
}

// LossMetric is the name of a VaR or ES figure, "var_99_1d", "es_975_1d":
// kind ("var", "es", "var_amount", ...), the confidence's percent digits
// and the horizon; methods other than historical are named between kind
// and confidence, "var_normal_99_1d".
func LossMetric(kind string, v *VaRFigure) string {
	m := ""
	if v.Method != "historical" {
		m = v.Method + "_"
	}
	return fmt.Sprintf("%s_%s%s_%dd", kind, m, confidenceTag(v.Confidence), v.HorizonDays)
}

// Headline returns the headline metrics of a Document: the ones the
// history charts and drift follow (names and units above). Volatilities
// are those of every configured window (VolatilityMetric); VaR and ES are
// historical, 1 day, at 99% (and ES at 97.5%). A figure the Document does
// not have is left out, never zero.
func Headline(doc *Document) map[string]float64 {
	m := map[string]float64{}
	put := func(name string, v *float64) {
		if v != nil {
			m[name] = *v
		}
	}
	s := &doc.Summary
	m[MetricValue] = s.Value
	r := &s.Returns
	put(MetricReturnWeek, r.Week)
	put(MetricReturnMTD, r.MonthToDate)
	put(MetricReturnQTD, r.QuarterToDate)
	put(MetricReturnYTD, r.YearToDate)
	put(MetricReturnSI, r.SinceInception)
	put(MetricEWMA, s.EWMAVolatility)
	for _, w := range s.Volatility {
		put(VolatilityMetric(w.WindowDays), w.Discrete)
	}
	if v := FindVaR(doc, "historical", 0.99, 1); v != nil {
		m[LossMetric("var", v)], m[LossMetric("es", v)] = v.VaR, v.ES
	}
	if v := FindVaR(doc, "historical", 0.975, 1); v != nil {
		m[LossMetric("es", v)] = v.ES
	}
	put(MetricDurModified, s.ModifiedDuration)
	put(MetricDurMacaulay, s.MacaulayDuration)
	if s.Empirical != nil {
		m[MetricDurEmpirical] = s.Empirical.Value
	}
	put(MetricConvexity, s.Convexity)
	put(MetricGrowthDuration, s.GrowthDuration)
	put(MetricBeta, s.Beta)
	put(MetricTrackingError, s.TrackingError)
	put(MetricMaxDrawdown, s.MaxDrawdown)
	if len(doc.Holdings) > 0 {
		m[MetricHHI] = doc.Concentration.HHI
		m[MetricMaxSingleName] = doc.Concentration.MaxSingleName
	}
	return m
}

// Metric is one number of a Document in long form, for SQL.
type Metric struct {
	// Scope is "portfolio", "sector", "holding", "scenario" (stress
	// scenarios and historical replays) or "limit".
	Scope string
	// Key is "" for the portfolio, else the sector name, security ID,
	// scenario or replay name, or limit name.
	Key   string
	Name  string
	Value float64
}

// Scopes of Metric.
const (
	ScopePortfolio = "portfolio"
	ScopeSector    = "sector"
	ScopeHolding   = "holding"
	ScopeScenario  = "scenario"
	ScopeLimit     = "limit"
)

// Metrics returns every number of a Document in long form: the headline
// metrics and every numeric Summary, Concentration, VaR and backtest
// figure (portfolio scope), each holding's value, weight and
// sensitivities, each sector's weight and contributions, each scenario's
// and replay's P&L, and each limit's value, level and headroom. Absent
// figures are left out. The order is sorted by scope, key and name; a
// name appears once per scope and key.
func Metrics(doc *Document) []Metric {
	var out []Metric
	add := func(scope, key, name string, v float64) {
		out = append(out, Metric{Scope: scope, Key: key, Name: name, Value: v})
	}
	opt := func(scope, key, name string, v *float64) {
		if v != nil {
			add(scope, key, name, *v)
		}
	}
	reg := func(scope, key, name string, g *Regression) {
		if g != nil {
			add(scope, key, name, g.Value)
			add(scope, key, name+"_std_err", g.StdErr)
			add(scope, key, name+"_r2", g.R2)
			add(scope, key, name+"_n", float64(g.N))
		}
	}
	const P = ScopePortfolio
	s := &doc.Summary
	add(P, "", MetricValue, s.Value)
	add(P, "", "cash", s.Cash)
	add(P, "", "holding_count", float64(s.HoldingCount))
	r := &s.Returns
	opt(P, "", MetricReturnWeek, r.Week)
	opt(P, "", MetricReturnMTD, r.MonthToDate)
	opt(P, "", MetricReturnQTD, r.QuarterToDate)
	opt(P, "", MetricReturnYTD, r.YearToDate)
	opt(P, "", MetricReturnSI, r.SinceInception)
	opt(P, "", "return_si_annualised", r.SinceInceptionAnn)
	opt(P, "", "benchmark_return_week", r.BenchmarkWeek)
	opt(P, "", "benchmark_return_ytd", r.BenchmarkYearToDate)
	for _, w := range s.Volatility {
		opt(P, "", VolatilityMetric(w.WindowDays), w.Discrete)
		opt(P, "", "log_"+VolatilityMetric(w.WindowDays), w.Log)
		opt(P, "", "dollar_volatility_"+strconv.Itoa(w.WindowDays)+"d", w.Dollar)
	}
	opt(P, "", MetricEWMA, s.EWMAVolatility)
	opt(P, "", MetricDurModified, s.ModifiedDuration)
	opt(P, "", MetricDurMacaulay, s.MacaulayDuration)
	opt(P, "", MetricConvexity, s.Convexity)
	opt(P, "", "dollar_duration_01", s.DollarDuration01)
	opt(P, "", MetricGrowthDuration, s.GrowthDuration)
	opt(P, "", "growth_convexity", s.GrowthConvexity)
	opt(P, "", MetricBeta, s.Beta)
	opt(P, "", "duration_level", s.LevelDuration)
	opt(P, "", "duration_slope", s.SlopeDuration)
	opt(P, "", "duration_curvature", s.CurvatureDuration)
	reg(P, "", MetricDurEmpirical, s.Empirical)
	opt(P, "", "benchmark_beta", s.BenchmarkBeta)
	opt(P, "", MetricTrackingError, s.TrackingError)
	opt(P, "", MetricMaxDrawdown, s.MaxDrawdown)
	opt(P, "", "current_drawdown", s.CurrentDrawdown)
	c := &doc.Concentration
	add(P, "", MetricHHI, c.HHI)
	add(P, "", "effective_n", c.EffectiveN)
	add(P, "", "top5_weight", c.Top5Weight)
	add(P, "", MetricMaxSingleName, c.MaxSingleName)
	add(P, "", MetricMaxSector, c.MaxSector)
	add(P, "", MetricCashWeight, c.CashWeight)
	for _, v := range doc.VaR {
		add(P, "", LossMetric("var", &v), v.VaR)
		add(P, "", LossMetric("es", &v), v.ES)
		add(P, "", LossMetric("var_amount", &v), v.VaRAmount)
		add(P, "", LossMetric("es_amount", &v), v.ESAmount)
	}
	if b := doc.Backtest; b != nil {
		add(P, "", "backtest_days", float64(b.Days))
		add(P, "", "backtest_exceptions", float64(b.Exceptions))
		add(P, "", "backtest_expected", b.Expected)
		add(P, "", "backtest_kupiec_lr", b.KupiecLR)
		add(P, "", "backtest_p_value", b.PValue)
	}
	for _, h := range doc.Holdings {
		const H = ScopeHolding
		add(H, h.ID, "quantity", h.Quantity)
		add(H, h.ID, "price", h.Price)
		add(H, h.ID, "value", h.Value)
		add(H, h.ID, "weight", h.Weight)
		opt(H, h.ID, "k", h.K)
		opt(H, h.ID, "g", h.G)
		opt(H, h.ID, "d0", h.D0)
		opt(H, h.ID, "model_value", h.ModelValue)
		opt(H, h.ID, MetricBeta, h.Beta)
		opt(H, h.ID, MetricDurModified, h.ModDuration)
		opt(H, h.ID, MetricDurMacaulay, h.MacDuration)
		opt(H, h.ID, MetricConvexity, h.Convexity)
		opt(H, h.ID, MetricGrowthDuration, h.GrowthDur)
		opt(H, h.ID, "growth_convexity", h.GrowthConv)
		opt(H, h.ID, "duration_level", h.LevelDur)
		opt(H, h.ID, "duration_slope", h.SlopeDur)
		opt(H, h.ID, "duration_curvature", h.CurveDur)
		opt(H, h.ID, "contrib_duration", h.ContribDuration)
		opt(H, h.ID, "contrib_growth_duration", h.ContribGrowthDuration)
		opt(H, h.ID, "numerical_error", h.NumericalError)
		reg(H, h.ID, MetricDurEmpirical, h.Empirical)
		if e := h.Explain; e != nil {
			add(H, h.ID, "explain_taylor", e.Taylor)
			add(H, h.ID, "explain_full", e.Full)
			opt(H, h.ID, "explain_actual", e.Actual)
		}
	}
	for _, sc := range doc.Sectors {
		add(ScopeSector, sc.Name, "value", sc.Value)
		add(ScopeSector, sc.Name, "weight", sc.Weight)
		opt(ScopeSector, sc.Name, "contrib_duration", sc.ContribDuration)
		opt(ScopeSector, sc.Name, "contrib_growth_duration", sc.ContribGrowthDuration)
	}
	for _, x := range append(append([]StressResult(nil), doc.Stress...), doc.Replays...) {
		add(ScopeScenario, x.Name, "pnl", x.PnL)
		add(ScopeScenario, x.Name, "pnl_pct", x.PnLPct)
		opt(ScopeScenario, x.Name, "taylor_pnl", x.Taylor)
		opt(ScopeScenario, x.Name, "taylor_pct", x.TaylorPct)
		opt(ScopeScenario, x.Name, "error", x.Error)
	}
	for _, l := range doc.Limits {
		opt(ScopeLimit, l.Name, "value", l.Value)
		opt(ScopeLimit, l.Name, "level", l.Level)
		opt(ScopeLimit, l.Name, "headroom", l.Headroom)
	}
	// Every name is added once per scope and key; the compaction only
	// guards against a document whose scenario and replay share a name
	// (Params.Validate refuses that since; older documents may have it).
	slices.SortStableFunc(out, func(a, b Metric) int {
		return cmp.Or(cmp.Compare(a.Scope, b.Scope), cmp.Compare(a.Key, b.Key), cmp.Compare(a.Name, b.Name))
	})
	return slices.CompactFunc(out, func(a, b Metric) bool {
		return a.Scope == b.Scope && a.Key == b.Key && a.Name == b.Name
	})
}

// confidenceTag writes a confidence as its percent digits: 0.95 -> "95",
// 0.975 -> "975".
func confidenceTag(c float64) string {
	return strings.ReplaceAll(strconv.FormatFloat(math.Round(c*1e4)/100, 'f', -1, 64), ".", "")
}
