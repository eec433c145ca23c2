package report

import (
	"fmt"
	"strconv"
	"strings"

	"plumbline/risk/limits"
)

// unit says how a metric's value is printed.
type unit int

const (
	unitNumber unit = iota // plain number, dec decimals
	unitMoney              // currency amount
	unitPct                // decimal shown in percent; changes in pp
	unitYears              // duration in years
	unitYears2             // convexity in years squared
)

// metricInfo is a metric's label and unit.
type metricInfo struct {
	label string
	unit  unit
	dec   int // decimals for unitNumber
}

// Headline metric names, as found in Document.Drift and in the metrics
// of Document.History. They follow the names of the limits package
// (risk/limits.Metrics) where it has one; value and returns are added.
const (
	mValue       = "value"                  // market value incl. cash, currency
	mReturnWeek  = "return_week"            // TWR, decimal
	mReturnMTD   = "return_mtd"             // TWR month to date
	mReturnQTD   = "return_qtd"             // TWR quarter to date
	mReturnYTD   = "return_ytd"             // TWR year to date
	mReturnSI    = "return_since_inception" // TWR since inception, cumulative
	mEWMA        = "volatility_ewma_ann"    // decimal
	mDurModified = "duration_modified"      // years
	mDurEmp      = "duration_empirical"     // years
	mConvexity   = "convexity"              // years squared
	mGrowthDur   = "growth_duration"        // years
	mBeta        = "beta"                   // ratio
	mTracking    = "tracking_error_ann"     // decimal
	mMaxDrawdown = "max_drawdown"           // negative decimal
)

// volMetric is the name of the annualised volatility over a window,
// "volatility_ann_63d".
func volMetric(windowDays int) string { return "volatility_ann_" + strconv.Itoa(windowDays) + "d" }

// lossMetric is the name of a VaR or ES figure, "var_99_1d", "es_975_1d":
// the confidence's digits after "0.".
func lossMetric(kind string, confidence float64, horizonDays int) string {
	c := strings.TrimPrefix(strconv.FormatFloat(confidence, 'f', -1, 64), "0.")
	if len(c) == 1 {
		c += "0"
	}
	return kind + "_" + c + "_" + strconv.Itoa(horizonDays) + "d"
}

// knownMetrics labels the headline metrics and the limit metrics.
var knownMetrics = map[string]metricInfo{
	mValue:                   {"Market value (incl. cash)", unitMoney, 0},
	mReturnWeek:              {"Return, week", unitPct, 0},
	mReturnMTD:               {"Return, month to date", unitPct, 0},
	mReturnQTD:               {"Return, quarter to date", unitPct, 0},
	mReturnYTD:               {"Return, year to date", unitPct, 0},
	mReturnSI:                {"Return since inception", unitPct, 0},
	mEWMA:                    {"EWMA volatility (ann.)", unitPct, 0},
	mDurModified:             {"Modified duration", unitYears, 0},
	mDurEmp:                  {"Empirical duration", unitYears, 0},
	mConvexity:               {"Convexity", unitYears2, 0},
	mGrowthDur:               {"Growth duration", unitYears, 0},
	mBeta:                    {"Beta (CAPM)", unitNumber, 2},
	mTracking:                {"Tracking error (ann.)", unitPct, 0},
	mMaxDrawdown:             {"Maximum drawdown", unitPct, 0},
	"duration_macaulay":      {"Macaulay duration", unitYears, 0},
	"hhi":                    {"Concentration index (HHI)", unitNumber, 4},
	"effective_n":            {"Effective number of names", unitNumber, 1},
	"top5_weight":            {"Top five weight", unitPct, 0},
	"max_single_name_weight": {"Largest single name", unitPct, 0},
	"max_sector_weight":      {"Largest sector", unitPct, 0},
	"cash_weight":            {"Cash weight", unitPct, 0},
	"current_drawdown":       {"Current drawdown", unitPct, 0},
	"growth_convexity":       {"Growth convexity", unitYears2, 0},
	"benchmark_beta":         {"Beta to benchmark", unitNumber, 2},
	"worst_window_loss":      {"Worst replayed window, loss", unitPct, 0},
	"scenario_loss":          {"Scenario loss", unitPct, 0},
}

// metricOf returns the label and unit of a metric name. Names it does not
// know take their unit from the limits package, else from their words, so
// a metric added later still prints with a sensible unit.
func metricOf(name string) metricInfo {
	if mi, ok := knownMetrics[name]; ok {
		return mi
	}
	if w, ok := strings.CutPrefix(name, "volatility_ann_"); ok {
		if n, err := strconv.Atoi(strings.TrimSuffix(w, "d")); err == nil {
			return metricInfo{"Volatility " + strconv.Itoa(n) + "-day (ann.)", unitPct, 0}
		}
	}
	for k, label := range map[string]string{"var": "VaR", "es": "ES"} {
		if w, ok := strings.CutPrefix(name, k+"_"); ok {
			c, h, _ := strings.Cut(w, "_")
			if n, err := strconv.Atoi(strings.TrimSuffix(h, "d")); err == nil && len(c) >= 2 {
				return metricInfo{fmt.Sprintf("%s %s%%, %d day%s", label, c[:2]+dotRest(c[2:]), n, plural(n)), unitPct, 0}
			}
		}
	}
	mi := metricInfo{label: humanize(name), unit: unitNumber, dec: 4}
	if li, ok := limits.Lookup(name); ok {
		switch li.Unit {
		case "years":
			mi.unit = unitYears
		case "decimal":
			mi.unit = unitPct
		case "ratio":
			mi.dec = 2
		default:
			if strings.HasPrefix(li.Unit, "years") {
				mi.unit = unitYears2
			}
		}
		return mi
	}
	has := func(words ...string) bool {
		for _, w := range words {
			if strings.Contains(name, w) {
				return true
			}
		}
		return false
	}
	switch {
	case has("convexity"):
		mi.unit = unitYears2
	case has("duration"):
		mi.unit = unitYears
	case has("weight", "return", "volatility", "drawdown", "var_", "es_", "tracking", "share", "loss"):
		mi.unit = unitPct
	case has("value", "pnl", "amount"):
		mi.unit = unitMoney
	}
	return mi
}

// dotRest writes the digits of a confidence after the first two as
// decimals: "5" -> ".5" (97.5%).
func dotRest(s string) string {
	if s == "" {
		return ""
	}
	return "." + s
}

// format prints a value of the metric.
func (mi metricInfo) format(x float64, ccy string) string {
	switch mi.unit {
	case unitMoney:
		return Money(x, ccy)
	case unitPct:
		return Pct(x)
	case unitYears:
		return Years(x)
	case unitYears2:
		return Convexity(x)
	}
	return Num(x, mi.dec)
}

// change prints a change of the metric, signed; rates change in pp.
func (mi metricInfo) change(x float64, ccy string) string {
	switch mi.unit {
	case unitMoney:
		return MoneySigned(x, ccy)
	case unitPct:
		return PP(x)
	case unitYears:
		return YearsSigned(x)
	case unitYears2:
		return ConvexitySigned(x)
	}
	return NumSigned(x, mi.dec)
}

// axis is the unit written on a chart axis for the metric.
func (mi metricInfo) axis(ccy string) string {
	switch mi.unit {
	case unitMoney:
		return ccy
	case unitPct:
		return "%"
	case unitYears:
		return "years"
	case unitYears2:
		return "years^2"
	}
	return mi.label
}

// scale is the factor from the stored value to the value plotted on the
// axis (percent for rates).
func (mi metricInfo) scale() float64 {
	if mi.unit == unitPct {
		return 100
	}
	return 1
}

// humanize turns a snake_case name into words: "stale_price" -> "Stale price".
func humanize(name string) string {
	s := strings.ReplaceAll(name, "_", " ")
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
