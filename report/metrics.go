package report

import (
	"fmt"
	"strconv"
	"strings"

	"plumbline/risk/limits"
	"plumbline/risk/pack"
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

// knownMetrics labels the headline metrics and the limit metrics.
var knownMetrics = map[string]metricInfo{
	pack.MetricValue:          {"Market value (incl. cash)", unitMoney, 0},
	pack.MetricReturnWeek:     {"Return, week", unitPct, 0},
	pack.MetricReturnMTD:      {"Return, month to date", unitPct, 0},
	pack.MetricReturnQTD:      {"Return, quarter to date", unitPct, 0},
	pack.MetricReturnYTD:      {"Return, year to date", unitPct, 0},
	pack.MetricReturnSI:       {"Return since inception", unitPct, 0},
	pack.MetricEWMA:           {"EWMA volatility (ann.)", unitPct, 0},
	pack.MetricDurModified:    {"Modified duration", unitYears, 0},
	pack.MetricDurMacaulay:    {"Macaulay duration", unitYears, 0},
	pack.MetricDurEmpirical:   {"Empirical duration", unitYears, 0},
	pack.MetricConvexity:      {"Convexity", unitYears2, 0},
	pack.MetricGrowthDuration: {"Growth duration", unitYears, 0},
	pack.MetricBeta:           {"Beta (CAPM)", unitNumber, 2},
	pack.MetricTrackingError:  {"Tracking error (ann.)", unitPct, 0},
	pack.MetricMaxDrawdown:    {"Maximum drawdown since inception", unitPct, 0},
	pack.MetricHHI:            {"Concentration index (HHI)", unitNumber, 4},
	pack.MetricMaxSingleName:  {"Largest single name", unitPct, 0},
	"effective_n":             {"Effective number of names", unitNumber, 1},
	"top5_weight":             {"Top five weight", unitPct, 0},
	"max_sector_weight":       {"Largest sector", unitPct, 0},
	"cash_weight":             {"Cash weight", unitPct, 0},
	"current_drawdown":        {"Current drawdown", unitPct, 0},
	"growth_convexity":        {"Growth convexity", unitYears2, 0},
	"benchmark_beta":          {"Beta to benchmark", unitNumber, 2},
	"worst_window_loss":       {"Worst replayed window, loss", unitPct, 0},
	"scenario_loss":           {"Scenario loss", unitPct, 0},
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
	if label, ok := lossLabel(name); ok {
		return metricInfo{label, unitPct, 0}
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

// lossLabel labels a VaR or ES name of pack.LossMetric: "var_99_1d" ->
// "VaR 99%, 1 day", "es_normal_975_1d" -> "ES 97.5%, 1 day (normal)".
func lossLabel(name string) (string, bool) {
	kind, rest, _ := strings.Cut(name, "_")
	label := map[string]string{"var": "VaR", "es": "ES"}[kind]
	parts := strings.Split(rest, "_")
	if label == "" || len(parts) < 2 {
		return "", false
	}
	c, h := parts[len(parts)-2], parts[len(parts)-1]
	n, err := strconv.Atoi(strings.TrimSuffix(h, "d"))
	if _, cerr := strconv.Atoi(c); err != nil || cerr != nil || len(c) < 2 || !strings.HasSuffix(h, "d") {
		return "", false
	}
	s := fmt.Sprintf("%s %s%%, %d day%s", label, c[:2]+dotRest(c[2:]), n, plural(n))
	switch m := strings.Join(parts[:len(parts)-2], "_"); m {
	case "":
	default:
		if strings.HasPrefix(m, "amount") {
			return "", false
		}
		s += " (" + methodLabel(m) + ")"
	}
	return s, true
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
	return "" // the chart's title names the figure
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
