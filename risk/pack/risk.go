package pack

import (
	"fmt"
	"strings"

	"plumbline/risk/stats"
)

// varMethods are the VaR methods in report order, with the Document's names.
var varMethods = []struct {
	m    stats.VaRMethod
	name string
}{{stats.Historical, "historical"}, {stats.Normal, "normal"}, {stats.CornishFisher, "cornish_fisher"}}

// varSpecs are the figures computed for each method: 95% and 99% at one
// and five days, and (historical only) 97.5% at one day, the confidence
// of expected-shortfall limits.
type varSpec struct {
	confidence float64
	horizon    int
	historical bool // historical method only
}

var varSpecs = []varSpec{{0.95, 1, false}, {0.95, 5, false}, {0.975, 1, true}, {0.99, 1, false}, {0.99, 5, false}}

// backtestConfidence is the confidence of the VaR backtest (the Basel
// traffic-light test is defined at 99%, 1 day).
const backtestConfidence = 0.99

// risk fills the VaR figures and the backtest.
//
// VaR and ES come from the last VaRLookbackDays daily portfolio returns
// (stats.EstimateVaR) as positive loss fractions of value; amounts are
// fractions × the as-of value. Five-day figures use the package's default
// square-root-of-time rule (the 1-day figure × √5).
//
// The backtest is out of sample: for each of the last BacktestDays days,
// the 99% 1-day historical VaR is estimated from the VaRLookbackDays
// returns just before it and compared with that day's return
// (stats.Backtest: exceptions, Kupiec's POF test, Basel zone). It needs
// VaRLookbackDays returns before the first backtest day and is shortened
// to the days that have them.
func (r *run) risk() {
	if r.vs == nil {
		return
	}
	doc, port := r.doc, r.port
	n := len(port)
	look := port[max(0, n-r.p.VaRLookbackDays):]
	if len(look) < r.p.VaRLookbackDays {
		r.finding("short_history", "", 1, "VaR and ES from %d daily returns, fewer than the %d configured", len(look), r.p.VaRLookbackDays)
	}
	var failed []string
	for _, m := range varMethods {
		for _, sp := range varSpecs {
			if sp.historical && m.m != stats.Historical {
				continue
			}
			e, err := stats.EstimateVaR(look, stats.VaRSpec{Method: m.m, Confidence: sp.confidence, HorizonDays: sp.horizon})
			if err != nil {
				failed = append(failed, fmt.Sprintf("%s %v %d-day (%v)", m.name, sp.confidence, sp.horizon, err))
				continue
			}
			doc.VaR = append(doc.VaR, VaRFigure{
				Method: m.name, Confidence: sp.confidence, HorizonDays: sp.horizon,
				VaR: e.VaR, ES: e.ES, VaRAmount: e.VaR * r.total, ESAmount: e.ES * r.total,
			})
		}
	}
	if len(failed) > 0 {
		r.finding("var_unavailable", "", 1, "VaR figures not computed: %s", strings.Join(failed, "; "))
	}
	r.backtest()
}

func (r *run) backtest() {
	port, L := r.port, r.p.VaRLookbackDays
	n := len(port)
	days := min(r.p.BacktestDays, n-L)
	if days < 1 {
		r.finding("backtest_unavailable", "", 1, "the backtest needs %d daily returns before its first day; %d are stored", L, n)
		return
	}
	if days < r.p.BacktestDays {
		r.finding("short_history", "", 1, "VaR backtest over %d days, fewer than the %d configured", days, r.p.BacktestDays)
	}
	// forecast[j] is the VaR of the L returns before day n-days+j.
	forecast, err := stats.VaRForecasts(port[n-days-L:], L, stats.VaRSpec{Method: stats.Historical, Confidence: backtestConfidence, HorizonDays: 1})
	if err != nil {
		r.finding("backtest_unavailable", "", 1, "backtest VaR: %v", err)
		return
	}
	bt, err := stats.Backtest(port[n-days:], forecast, backtestConfidence)
	if err != nil {
		r.finding("backtest_unavailable", "", 1, "backtest: %v", err)
		return
	}
	r.doc.Backtest = &Backtest{
		Days: bt.Observations, Confidence: backtestConfidence, Exceptions: bt.Exceptions,
		Expected: float64(bt.Observations) * bt.ExpectedRate, KupiecLR: bt.KupiecLR, PValue: bt.KupiecPValue, Zone: bt.Zone.String(),
	}
}

// FindVaR returns the document's VaR figure of a method ("historical",
// "normal", "cornish_fisher"), confidence (0.99) and horizon (trading
// days), or nil when the document has none. The figure is doc's own, not
// a copy.
func FindVaR(doc *Document, method string, confidence float64, horizonDays int) *VaRFigure {
	for i := range doc.VaR {
		v := &doc.VaR[i]
		if v.Method == method && v.Confidence == confidence && v.HorizonDays == horizonDays {
			return v
		}
	}
	return nil
}
