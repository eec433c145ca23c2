package report

import (
	"math"
	"testing"
)

// Expected strings are worked by hand from the definitions: a percentage
// is the decimal times 100 (0.05 means 5%, the project convention); a
// basis point is 1/100 of a percentage point; thousands are grouped by
// commas (common practice in English-language financial reports). Inputs
// avoid rounding ties so the expectation does not depend on the rounding
// rule.
func TestFormat(t *testing.T) {
	tests := []struct {
		name string
		got  string
		want string
	}{
		{"pct", Pct(0.0123), "1.23%"},
		{"pct negative", Pct(-0.1375), "-13.75%"},
		{"pct rounds", Pct(0.123456), "12.35%"},
		{"pct tiny negative is not -0.00", Pct(-0.00001), "0.00%"},
		{"pct signed", PctSigned(0.0049), "+0.49%"},
		{"pp", PP(0.0025), "+0.25 pp"},
		{"pp negative", PP(-0.01), "-1.00 pp"},
		{"bp", BP(0.0007), "+7.0 bp"},
		{"bp negative", BP(-0.00025), "-2.5 bp"},
		{"money", Money(52817584.4, "USD"), "USD 52,817,584"},
		{"money negative", Money(-1234567.8, "USD"), "USD -1,234,568"},
		{"money small", Money(999.4, "EUR"), "EUR 999"},
		{"money thousand", Money(1000, "EUR"), "EUR 1,000"},
		{"money signed", MoneySigned(674967.2, "USD"), "USD +674,967"},
		{"years", Years(19.1838), "19.18 yrs"},
		{"years signed", YearsSigned(-0.054), "-0.05 yrs"},
		{"convexity", Convexity(1359.73), "1,359.7 yrs^2"},
		{"num", Num(1234567.891, 2), "1,234,567.89"},
		{"num no decimals", Num(123, 0), "123"},
		{"num signed", NumSigned(6.14, 1), "+6.1"},
		{"sci", Sci(0.000000123), "1.2e-07"},
		{"nan", Pct(math.NaN()), NA},
		{"inf", Money(math.Inf(1), "USD"), NA},
		{"nil", Opt(nil, Pct), NA},
		{"opt", Opt(f64(0.5), Pct), "50.00%"},
	}
	for _, tt := range tests {
		if tt.got != tt.want {
			t.Errorf("%s: got %q, want %q", tt.name, tt.got, tt.want)
		}
	}
}

// An absent figure prints n/a, never zero: common practice, and the rule
// of the results document ("absent (null in JSON), never zero").
func TestMetricFormatting(t *testing.T) {
	tests := []struct {
		metric, value, change string
		x, dx                 float64
	}{
		{"value", "USD 1,500,000", "USD +20,000", 1.5e6, 2e4},
		{"var_99_1d", "1.69%", "+0.04 pp", 0.0169, 0.0004},
		{"es_975_1d", "1.83%", "-0.01 pp", 0.0183, -0.0001},
		{"duration_modified", "19.18 yrs", "+1.90 yrs", 19.18, 1.9},
		{"convexity", "823.8 yrs^2", "-4.5 yrs^2", 823.8, -4.5},
		{"volatility_ann_63d", "12.31%", "+0.12 pp", 0.1231, 0.0012},
		{"beta", "0.82", "-0.01", 0.82, -0.01},
		// Unknown names take their unit from their words.
		{"sector_weight_max", "23.70%", "+1.30 pp", 0.237, 0.013},
		{"spread_duration", "4.00 yrs", "+0.50 yrs", 4, 0.5},
	}
	for _, tt := range tests {
		mi := metricOf(tt.metric)
		if got := mi.format(tt.x, "USD"); got != tt.value {
			t.Errorf("%s: format = %q, want %q", tt.metric, got, tt.value)
		}
		if got := mi.change(tt.dx, "USD"); got != tt.change {
			t.Errorf("%s: change = %q, want %q", tt.metric, got, tt.change)
		}
	}
	for name, want := range map[string]string{
		"volatility_ann_63d": "Volatility 63-day (ann.)",
		"var_99_1d":          "VaR 99%, 1 day",
		"es_975_1d":          "ES 97.5%, 1 day",
		"var_95_10d":         "VaR 95%, 10 days",
		// pack.LossMetric names other methods between kind and level.
		"var_normal_99_1d":         "VaR 99%, 1 day (normal)",
		"es_cornish_fisher_975_1d": "ES 97.5%, 1 day (Cornish-Fisher)",
	} {
		if got := metricOf(name).label; got != want {
			t.Errorf("label(%s) = %q, want %q", name, got, want)
		}
	}
	if got := humanize("stale_price"); got != "Stale price" {
		t.Errorf("humanize = %q", got)
	}
}

// Long decimals of messages written for logs are cut to four significant
// digits (the precision of every rate the pack prints, common practice);
// dates, identifiers and short figures pass unchanged.
func TestTidyText(t *testing.T) {
	for _, tt := range []struct{ in, want string }{
		{"terminal k - g = -0.0020000000000000018", "terminal k - g = -0.002"},
		{"ratio 1.23456789 is not finite", "ratio 1.235 is not finite"},
		{"error 1.2345678e-05 left", "error 1.235e-05 left"},
		{"dated 2026-11-20, weight 0.0604, ID QRGN", "dated 2026-11-20, weight 0.0604, ID QRGN"},
	} {
		if got := tidyText(tt.in); got != tt.want {
			t.Errorf("tidyText(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}
