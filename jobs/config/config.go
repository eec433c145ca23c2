// Package config reads Plumbline's TOML configuration file.
//
// Decoding is strict: an unknown key, a value of the wrong type or a value
// that fails validation is an error naming the file and the line. Defaults
// live in Default and nowhere else; templates/plumbline.toml shows them with
// comments and a test keeps the two in step.
package config

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"

	toml "github.com/pelletier/go-toml/v2"
	"github.com/pelletier/go-toml/v2/unstable"
)

// Config is the whole configuration. Field groups that belong to one
// concern live in their own file (stress.go, daemon.go, report.go).
type Config struct {
	// Database is the SQLite file. Empty means ./plumbline.db.
	Database string `toml:"database" json:"database"`
	// BaseCurrency is the ISO 4217 code every amount is expressed in.
	BaseCurrency string `toml:"base_currency" json:"base_currency"`
	// Risk holds the parameters of the measures.
	Risk Risk `toml:"risk" json:"risk"`
	// Scenarios are user-defined stress scenarios added to the built-in set.
	Scenarios []Scenario `toml:"scenario" json:"scenarios"`
	// Limits are the committee's risk limits.
	Limits []Limit `toml:"limit" json:"limits"`
	// Stress holds the stress-test and historical-replay settings.
	Stress Stress `toml:"stress" json:"stress"`
	// Drift sets when a metric's week-over-week change is flagged.
	Drift Drift `toml:"drift" json:"drift"`
	// Report sets the PDF's texts, paper and sections.
	Report Report `toml:"report" json:"report"`
	// Daemon settings: sources, schedules, recipients, mail, status.
	Sources    Sources     `toml:"sources" json:"sources"`
	Schedule   Schedule    `toml:"schedule" json:"schedule"`
	Portfolios []Portfolio `toml:"portfolio" json:"portfolios"`
	Mail       Mail        `toml:"mail" json:"mail"`
	Status     Status      `toml:"status" json:"status"`

	path  string
	lines map[string]int
}

// Risk holds the parameters of the risk measures.
type Risk struct {
	// RiskFreeTenorMonths picks the yield used as rf in k = rf + beta*ERP.
	RiskFreeTenorMonths int `toml:"risk_free_tenor_months" json:"risk_free_tenor_months"`
	// GrowthConvention is "d0" (trailing dividend held fixed) or "d1".
	GrowthConvention string `toml:"growth_convention" json:"growth_convention"`
	// RollingWindows are the rolling-statistics windows in trading days.
	RollingWindows []int `toml:"rolling_windows" json:"rolling_windows"`
	// EWMALambda is the decay of the EWMA variance (0.94 daily is common practice).
	EWMALambda float64 `toml:"ewma_lambda" json:"ewma_lambda"`
	// VaRLookbackDays is the history used for VaR and ES.
	VaRLookbackDays int `toml:"var_lookback_days" json:"var_lookback_days"`
	// BacktestDays is the VaR backtest window (250 for the 1996 Basel zones).
	BacktestDays int `toml:"backtest_days" json:"backtest_days"`
	// LargeFlowFraction is the external flow, as a fraction of portfolio
	// value, at and above which the portfolio is revalued (GIPS large flow).
	LargeFlowFraction float64 `toml:"large_flow_fraction" json:"large_flow_fraction"`
	// EmpiricalTenorMonths is the yield whose weekly changes the empirical
	// duration regresses on; EmpiricalWindowWeeks its window.
	EmpiricalTenorMonths int `toml:"empirical_tenor_months" json:"empirical_tenor_months"`
	EmpiricalWindowWeeks int `toml:"empirical_window_weeks" json:"empirical_window_weeks"`
	// BetaWindowWeeks is the window of weekly total returns used to
	// estimate a beta the assumptions do not give.
	BetaWindowWeeks int `toml:"beta_window_weeks" json:"beta_window_weeks"`
	// StalePriceDays is how many calendar days an old price may be carried
	// for a holding with no price on the as-of date before it is excluded.
	StalePriceDays int `toml:"stale_price_days" json:"stale_price_days"`
	// UseCurve values holdings without an explicit discount rate on the
	// fitted Nelson-Siegel curve plus beta*ERP (term-structure model).
	UseCurve bool `toml:"use_curve" json:"use_curve"`
	// ChartDays is how many recent trading days the pack's series keep.
	ChartDays int `toml:"chart_days" json:"chart_days"`
}

// Default returns the configuration used when no file is given, and the
// base every file is decoded onto.
func Default() *Config {
	c := defaultCore()
	defaultDaemon(c)
	return c
}

func defaultCore() *Config {
	return &Config{
		Database:     "plumbline.db",
		BaseCurrency: "USD",
		Risk: Risk{
			RiskFreeTenorMonths:  120,
			GrowthConvention:     "d0",
			RollingWindows:       []int{21, 63, 252},
			EWMALambda:           0.94,
			VaRLookbackDays:      500,
			BacktestDays:         250,
			LargeFlowFraction:    0.10,
			EmpiricalTenorMonths: 120,
			EmpiricalWindowWeeks: 104,
			BetaWindowWeeks:      104,
			StalePriceDays:       5,
			ChartDays:            504,
		},
		Drift:  Drift{ZThreshold: 2.5, MinHistory: 8},
		Stress: Stress{WorstWindowDays: 10, UseStandardSet: true},
		Report: defaultReport(),
	}
}

// Error is a configuration problem at a place in a file.
type Error struct {
	File string
	Line int // 0 when the problem has no single line
	Key  string
	Msg  string
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Key != "" {
		b.WriteString(e.Key)
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// Errors is every problem found in one file.
type Errors []*Error

func (es Errors) Error() string {
	s := make([]string, len(es))
	for i, e := range es {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// Load reads and validates the file at path. An empty path returns Default.
func Load(path string) (*Config, error) {
	if path == "" {
		c := Default()
		c.path = "(defaults)"
		return c, nil
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("config: %w", err)
	}
	return Parse(path, data)
}

// Parse decodes data, naming it path in errors, onto Default and validates
// the result.
func Parse(path string, data []byte) (*Config, error) {
	c := Default()
	// Lists given in the file replace the defaults rather than merge.
	c.Risk.RollingWindows = nil
	c.path = path
	lines, err := keyLines(data)
	if err != nil {
		var pe *unstable.ParserError
		if errors.As(err, &pe) {
			p := unstable.Parser{}
			p.Reset(data)
			line := lineOfSubslice(data, pe.Highlight)
			return nil, &Error{File: path, Line: line, Msg: pe.Message}
		}
		return nil, &Error{File: path, Msg: err.Error()}
	}
	c.lines = lines
	dec := toml.NewDecoder(bytes.NewReader(data)).DisallowUnknownFields()
	if err := dec.Decode(c); err != nil {
		var sm *toml.StrictMissingError
		if errors.As(err, &sm) {
			var es Errors
			for i := range sm.Errors {
				row, _ := sm.Errors[i].Position()
				es = append(es, &Error{File: path, Line: row, Key: strings.Join(sm.Errors[i].Key(), "."), Msg: "unknown key"})
			}
			return nil, es
		}
		var de *toml.DecodeError
		if errors.As(err, &de) {
			row, _ := de.Position()
			return nil, &Error{File: path, Line: row, Key: strings.Join(de.Key(), "."), Msg: de.Error()}
		}
		return nil, &Error{File: path, Msg: err.Error()}
	}
	if c.Risk.RollingWindows == nil {
		c.Risk.RollingWindows = Default().Risk.RollingWindows
	}
	if err := c.Validate(); err != nil {
		return nil, err
	}
	return c, nil
}

// Path is the file the configuration came from, or "(defaults)".
func (c *Config) Path() string { return c.path }

// Line returns the line of a key given as a dotted path with array-table
// indexes, such as "risk.ewma_lambda" or "scenario.2.rates_bp". It returns
// 0 for a key not written in the file (a default).
func (c *Config) Line(key string) int { return c.lines[key] }

// errAt builds an Error for key with the key's line.
func (c *Config) errAt(key, format string, a ...any) *Error {
	return &Error{File: c.path, Line: c.Line(key), Key: key, Msg: fmt.Sprintf(format, a...)}
}

// Validate checks every value; each problem names file, line and key.
func (c *Config) Validate() error {
	var es Errors
	add := func(e *Error) { es = append(es, e) }
	if len(c.BaseCurrency) != 3 || strings.ToUpper(c.BaseCurrency) != c.BaseCurrency {
		add(c.errAt("base_currency", "%q is not a three-letter upper-case ISO 4217 code", c.BaseCurrency))
	}
	r := c.Risk
	if r.RiskFreeTenorMonths < 1 || r.RiskFreeTenorMonths > 600 {
		add(c.errAt("risk.risk_free_tenor_months", "%d is outside 1..600", r.RiskFreeTenorMonths))
	}
	if r.GrowthConvention != "d0" && r.GrowthConvention != "d1" {
		add(c.errAt("risk.growth_convention", "%q: want \"d0\" or \"d1\"", r.GrowthConvention))
	}
	if len(r.RollingWindows) == 0 {
		add(c.errAt("risk.rolling_windows", "at least one window is needed"))
	}
	for _, w := range r.RollingWindows {
		if w < 2 || w > 2520 {
			add(c.errAt("risk.rolling_windows", "window %d is outside 2..2520 days", w))
		}
	}
	if !(r.EWMALambda > 0 && r.EWMALambda < 1) {
		add(c.errAt("risk.ewma_lambda", "%v is outside (0, 1)", r.EWMALambda))
	}
	if r.VaRLookbackDays < 20 {
		add(c.errAt("risk.var_lookback_days", "%d is below 20 days", r.VaRLookbackDays))
	}
	if r.BacktestDays < 20 {
		add(c.errAt("risk.backtest_days", "%d is below 20 days", r.BacktestDays))
	}
	if !(r.LargeFlowFraction > 0 && r.LargeFlowFraction <= 1) {
		add(c.errAt("risk.large_flow_fraction", "%v is outside (0, 1]", r.LargeFlowFraction))
	}
	if r.EmpiricalTenorMonths < 1 || r.EmpiricalTenorMonths > 600 {
		add(c.errAt("risk.empirical_tenor_months", "%d is outside 1..600", r.EmpiricalTenorMonths))
	}
	if r.EmpiricalWindowWeeks < 8 {
		add(c.errAt("risk.empirical_window_weeks", "%d is below 8 weeks", r.EmpiricalWindowWeeks))
	}
	if r.BetaWindowWeeks < 8 {
		add(c.errAt("risk.beta_window_weeks", "%d is below 8 weeks", r.BetaWindowWeeks))
	}
	if r.ChartDays < 20 || r.ChartDays > 5040 {
		add(c.errAt("risk.chart_days", "%d is outside 20..5040 days", r.ChartDays))
	}
	if r.StalePriceDays < 0 {
		add(c.errAt("risk.stale_price_days", "%d is negative", r.StalePriceDays))
	}
	es = append(es, c.validateDrift()...)
	es = append(es, c.validateReport()...)
	es = append(es, c.validateDaemon()...)
	for _, v := range c.validators() {
		es = append(es, v()...)
	}
	if len(es) > 0 {
		return es
	}
	return nil
}

// Canonical returns the configuration as canonical JSON: the effective
// values after defaults, with secrets left out. It is what a run stores and
// what its config hash covers.
func (c *Config) Canonical() ([]byte, error) {
	b, err := json.Marshal(c)
	if err != nil {
		return nil, err
	}
	// Re-encode through a generic value so keys are sorted.
	var v any
	if err := json.Unmarshal(b, &v); err != nil {
		return nil, err
	}
	return json.Marshal(v)
}

// Hash is the hex sha256 of Canonical.
func (c *Config) Hash() (string, error) {
	b, err := c.Canonical()
	if err != nil {
		return "", err
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:]), nil
}

// FromCanonical rebuilds a configuration stored with a run.
func FromCanonical(b []byte) (*Config, error) {
	c := &Config{path: "(stored run)"}
	if err := json.Unmarshal(b, c); err != nil {
		return nil, fmt.Errorf("config: stored configuration: %w", err)
	}
	return c, nil
}

// keyLines maps every key written in the document to its line. Keys of
// array tables carry the element index: "scenario.0.name".
func keyLines(data []byte) (map[string]int, error) {
	lines := map[string]int{}
	counts := map[string]int{}
	var p unstable.Parser
	p.Reset(data)
	prefix := ""
	for p.NextExpression() {
		e := p.Expression()
		switch e.Kind {
		case unstable.Table, unstable.ArrayTable:
			name := joinKey(e.Key())
			line := lineOfNode(&p, e)
			if e.Kind == unstable.ArrayTable {
				i := counts[name]
				counts[name] = i + 1
				prefix = name + "." + strconv.Itoa(i)
			} else {
				prefix = name
			}
			lines[prefix] = line
		case unstable.KeyValue:
			k := joinKey(e.Key())
			if prefix != "" {
				k = prefix + "." + k
			}
			lines[k] = lineOfNode(&p, e)
		}
	}
	return lines, p.Error()
}

func joinKey(it unstable.Iterator) string {
	var parts []string
	for it.Next() {
		parts = append(parts, string(it.Node().Data))
	}
	return strings.Join(parts, ".")
}

// lineOfNode is the line of the first key part of a table header or a
// key-value expression.
func lineOfNode(p *unstable.Parser, e *unstable.Node) int {
	it := e.Key()
	if it.Next() {
		return p.Shape(it.Node().Raw).Start.Line
	}
	return 0
}

func lineOfSubslice(data, sub []byte) int {
	if len(sub) == 0 {
		return 0
	}
	for i := range data {
		if &data[i] == &sub[0] {
			return bytes.Count(data[:i], []byte("\n")) + 1
		}
	}
	return 0
}
