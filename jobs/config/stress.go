package config

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	toml "github.com/pelletier/go-toml/v2"

	"plumbline/risk/limits"
	"plumbline/risk/pack"
	"plumbline/risk/stress"
)

// Stress is the [stress] table.
type Stress struct {
	// WorstWindowDays is the length, in trading days, of the worst
	// historical window searched for on the current holdings.
	WorstWindowDays int `toml:"worst_window_days" json:"worst_window_days"`
	// UseStandardSet puts the built-in scenarios (stress.Standard) before
	// the [[scenario]] tables.
	UseStandardSet bool `toml:"use_standard_set" json:"use_standard_set"`
	// Replays are named historical windows, [[stress.replay]].
	Replays []Replay `toml:"replay" json:"replays"`
}

// Replay is a named historical window replayed on the current holdings.
// From and To are inclusive dates written either as TOML dates
// (2022-09-01) or as strings ("2022-09-01"); they stay as decoded (a
// toml.LocalDate or a string, both rendered "YYYY-MM-DD" in JSON) and are
// read through ReplayWindows.
type Replay struct {
	Name string `toml:"name" json:"name"`
	From any    `toml:"from" json:"from"`
	To   any    `toml:"to" json:"to"`
}

// ReplayWindow is a Replay with its dates read, at UTC midnight.
type ReplayWindow struct {
	Name     string
	From, To time.Time
}

// Scenario is a [[scenario]] table: a user-defined stress scenario.
//
// Units: basis points for rates_bp, erp_bp and the ns_*_bp Nelson-Siegel
// factor shifts; percentage points for growth_pp and growth_by_sector
// (sector shifts add to growth_pp); percent for market_move_pct (-20 is a
// 20% fall, passed to each holding through its beta). beta_scale multiplies
// betas and beta_shift is then added; leaving beta_scale out means no
// scaling.
type Scenario struct {
	Name           string             `toml:"name" json:"name"`
	Description    string             `toml:"description" json:"description"`
	RatesBP        float64            `toml:"rates_bp" json:"rates_bp"`
	ERPBP          float64            `toml:"erp_bp" json:"erp_bp"`
	GrowthPP       float64            `toml:"growth_pp" json:"growth_pp"`
	GrowthBySector map[string]float64 `toml:"growth_by_sector" json:"growth_by_sector,omitempty"`
	BetaShift      float64            `toml:"beta_shift" json:"beta_shift"`
	BetaScale      float64            `toml:"beta_scale" json:"beta_scale"`
	MarketMovePct  float64            `toml:"market_move_pct" json:"market_move_pct"`
	NSLevelBP      float64            `toml:"ns_level_bp" json:"ns_level_bp"`
	NSSlopeBP      float64            `toml:"ns_slope_bp" json:"ns_slope_bp"`
	NSCurvatureBP  float64            `toml:"ns_curvature_bp" json:"ns_curvature_bp"`
}

// Limit is a [[limit]] table. metric is one of limits.Metrics(); levels
// are in the metric's unit (decimals for weights, volatilities, VaR and
// losses: 0.10 = 10%). A maximum side needs breach_max (warn_max optional,
// at or below it), a minimum side breach_min (warn_min optional, at or
// above it). scenario names the scenario of a scenario_loss limit.
type Limit struct {
	Name      string   `toml:"name" json:"name"`
	Metric    string   `toml:"metric" json:"metric"`
	Scenario  string   `toml:"scenario" json:"scenario,omitempty"`
	WarnMax   *float64 `toml:"warn_max" json:"warn_max,omitempty"`
	BreachMax *float64 `toml:"breach_max" json:"breach_max,omitempty"`
	WarnMin   *float64 `toml:"warn_min" json:"warn_min,omitempty"`
	BreachMin *float64 `toml:"breach_min" json:"breach_min,omitempty"`
}

// Bounds that catch unit slips (a percentage written as basis points).
const (
	maxShiftBP      = 2000 // rates, ERP and curve factors: ±20 points
	maxGrowthPP     = 20   // growth: ±20 points
	maxBetaShift    = 5
	maxBetaScale    = 5
	maxMarketUpPct  = 500
	maxWindowDays   = 2520 // ten years of trading days
	stressDateShape = "2006-01-02"
)

// validators lists the section validators beyond the core ones.
func (c *Config) validators() []func() Errors {
	return []func() Errors{c.validateStress, c.validateScenarios, c.validateLimits}
}

// errIn builds an Error for key inside the table at path (such as
// "scenario.2"), with the key's line, or the table's when the key is not
// written. An empty key means the table itself.
func (c *Config) errIn(table, key, format string, a ...any) *Error {
	path := table
	if key != "" {
		path = table + "." + key
	}
	line := c.Line(path)
	if line == 0 {
		line = c.Line(table)
	}
	return &Error{File: c.path, Line: line, Key: path, Msg: fmt.Sprintf(format, a...)}
}

func (c *Config) validateStress() Errors {
	var es Errors
	s := c.Stress
	if s.WorstWindowDays < 1 || s.WorstWindowDays > maxWindowDays {
		es = append(es, c.errAt("stress.worst_window_days", "%d is outside 1..%d trading days", s.WorstWindowDays, maxWindowDays))
	}
	// Scenarios, replays and the worst-window replay share one namespace:
	// their results are stored under the scenario scope by name.
	worst := pack.WorstWindowName(s.WorstWindowDays)
	seen := map[string]int{}
	for i, r := range s.Replays {
		t := "stress.replay." + strconv.Itoa(i)
		if r.Name == "" {
			es = append(es, c.errIn(t, "name", "a replay window needs a name"))
		} else if j, dup := seen[r.Name]; dup {
			es = append(es, c.errIn(t, "name", "replay name %q is already used at line %d", r.Name, c.Line("stress.replay."+strconv.Itoa(j))))
		} else if r.Name == worst {
			es = append(es, c.errIn(t, "name", "replay name %q is the name of the worst-window replay (stress.worst_window_days = %d); choose another", r.Name, s.WorstWindowDays))
		} else if where := c.scenarioNamed(r.Name); where != "" {
			es = append(es, c.errIn(t, "name", "replay name %q is already a scenario's name (%s); replays and scenarios need distinct names", r.Name, where))
		} else {
			seen[r.Name] = i
		}
		from, errFrom := stressDate(r.From)
		if errFrom != nil {
			es = append(es, c.errIn(t, "from", "%v", errFrom))
		}
		to, errTo := stressDate(r.To)
		if errTo != nil {
			es = append(es, c.errIn(t, "to", "%v", errTo))
		}
		if errFrom == nil && errTo == nil && from.After(to) {
			es = append(es, c.errIn(t, "to", "window ends %s, before it starts %s", to.Format(stressDateShape), from.Format(stressDateShape)))
		}
	}
	return es
}

// scenarioNamed says where the scenario called name is defined: "line N"
// for a [[scenario]] table, "built in" for one of the standard set in
// use, "" when there is none.
func (c *Config) scenarioNamed(name string) string {
	for i, s := range c.Scenarios {
		if s.Name == name {
			return fmt.Sprintf("line %d", c.Line("scenario."+strconv.Itoa(i)))
		}
	}
	if c.Stress.UseStandardSet {
		for _, s := range stress.Standard() {
			if s.Name == name {
				return "built in"
			}
		}
	}
	return ""
}

// stressDate reads a replay date: a TOML local date or a "YYYY-MM-DD"
// string, at UTC midnight.
func stressDate(v any) (time.Time, error) {
	switch d := v.(type) {
	case nil:
		return time.Time{}, fmt.Errorf("a date YYYY-MM-DD is required")
	case toml.LocalDate:
		t := time.Date(d.Year, time.Month(d.Month), d.Day, 0, 0, 0, 0, time.UTC)
		if t.Day() != d.Day {
			return time.Time{}, fmt.Errorf("%v is not a calendar date", d)
		}
		return t, nil
	case string:
		t, err := time.Parse(stressDateShape, d)
		if err != nil {
			return time.Time{}, fmt.Errorf("%q is not a date YYYY-MM-DD", d)
		}
		return t, nil
	default:
		return time.Time{}, fmt.Errorf("%v: want a date YYYY-MM-DD, without a time", v)
	}
}

// ReplayWindows returns the [[stress.replay]] windows with their dates read.
func (c *Config) ReplayWindows() ([]ReplayWindow, error) {
	out := make([]ReplayWindow, 0, len(c.Stress.Replays))
	for i, r := range c.Stress.Replays {
		from, err := stressDate(r.From)
		if err != nil {
			return nil, c.errIn("stress.replay."+strconv.Itoa(i), "from", "%v", err)
		}
		to, err := stressDate(r.To)
		if err != nil {
			return nil, c.errIn("stress.replay."+strconv.Itoa(i), "to", "%v", err)
		}
		out = append(out, ReplayWindow{Name: r.Name, From: from, To: to})
	}
	return out, nil
}

// shock converts a scenario table to a stress.Shock.
func (s Scenario) shock() stress.Shock {
	var bySector map[string]float64
	if len(s.GrowthBySector) > 0 {
		bySector = make(map[string]float64, len(s.GrowthBySector))
		for k, v := range s.GrowthBySector {
			bySector[k] = v
		}
	}
	return stress.Shock{
		RatesBP:        s.RatesBP,
		ERP:            s.ERPBP / 1e4,
		GrowthPP:       s.GrowthPP,
		GrowthBySector: bySector,
		BetaShift:      s.BetaShift,
		BetaScale:      s.BetaScale,
		MarketMove:     s.MarketMovePct / 100,
		NSLevelBP:      s.NSLevelBP,
		NSSlopeBP:      s.NSSlopeBP,
		NSCurvatureBP:  s.NSCurvatureBP,
	}
}

func (c *Config) validateScenarios() Errors {
	var es Errors
	add := func(e *Error) { es = append(es, e) }
	standard := map[string]bool{}
	if c.Stress.UseStandardSet {
		for _, s := range stress.Standard() {
			standard[s.Name] = true
		}
	}
	seen := map[string]int{}
	for i, s := range c.Scenarios {
		t := "scenario." + strconv.Itoa(i)
		before := len(es)
		switch {
		case s.Name == "":
			add(c.errIn(t, "name", "a scenario needs a name"))
		case standard[s.Name]:
			add(c.errIn(t, "name", "%q is a built-in scenario; choose another name or set stress.use_standard_set = false", s.Name))
		case s.Name == pack.WorstWindowName(c.Stress.WorstWindowDays):
			add(c.errIn(t, "name", "scenario name %q is the name of the worst-window replay (stress.worst_window_days = %d); choose another", s.Name, c.Stress.WorstWindowDays))
		default:
			if j, dup := seen[s.Name]; dup {
				add(c.errIn(t, "name", "scenario name %q is already used at line %d", s.Name, c.Line("scenario."+strconv.Itoa(j))))
			} else {
				seen[s.Name] = i
			}
		}
		bounded := []struct {
			key   string
			v     float64
			limit float64
			unit  string
		}{
			{"rates_bp", s.RatesBP, maxShiftBP, "bp"},
			{"erp_bp", s.ERPBP, maxShiftBP, "bp"},
			{"ns_level_bp", s.NSLevelBP, maxShiftBP, "bp"},
			{"ns_slope_bp", s.NSSlopeBP, maxShiftBP, "bp"},
			{"ns_curvature_bp", s.NSCurvatureBP, maxShiftBP, "bp"},
			{"growth_pp", s.GrowthPP, maxGrowthPP, "pp"},
			{"beta_shift", s.BetaShift, maxBetaShift, ""},
		}
		for _, b := range bounded {
			if math.IsNaN(b.v) || math.Abs(b.v) > b.limit {
				add(c.errIn(t, b.key, "%v is outside ±%v%s", b.v, b.limit, b.unit))
			}
		}
		for _, sec := range sectorNames(s.GrowthBySector) {
			v := s.GrowthBySector[sec]
			key := scenarioSectorKey(c, t, sec)
			if strings.TrimSpace(sec) == "" {
				add(c.errIn(t, key, "an empty sector name"))
			}
			if math.IsNaN(v) || math.Abs(v) > maxGrowthPP {
				add(c.errIn(t, key, "sector %q: %v is outside ±%vpp", sec, v, maxGrowthPP))
			}
		}
		if c.Line(t+".beta_scale") != 0 && !(s.BetaScale > 0) || s.BetaScale < 0 || s.BetaScale > maxBetaScale || math.IsNaN(s.BetaScale) {
			add(c.errIn(t, "beta_scale", "%v is outside (0, %v]; leave it out for no scaling", s.BetaScale, maxBetaScale))
		}
		if !(s.MarketMovePct > -100 && s.MarketMovePct <= maxMarketUpPct) {
			add(c.errIn(t, "market_move_pct", "%v%% is outside (-100, %v]", s.MarketMovePct, maxMarketUpPct))
		}
		sh := s.shock()
		if sh.IsZero() {
			add(c.errIn(t, "", "scenario %q shocks nothing: give at least one of rates_bp, erp_bp, growth_pp, growth_by_sector, beta_shift, beta_scale, market_move_pct, ns_level_bp, ns_slope_bp, ns_curvature_bp", s.Name))
		} else if len(es) == before {
			if err := sh.Validate(); err != nil {
				add(c.errIn(t, "", "%v", err))
			}
		}
	}
	return es
}

// scenarioSectorKey is the key of one sector of growth_by_sector relative
// to the scenario table: the sector's own line when written as a dotted key,
// else growth_by_sector's line.
func scenarioSectorKey(c *Config, table, sector string) string {
	if c.Line(table+".growth_by_sector."+sector) != 0 {
		return "growth_by_sector." + sector
	}
	return "growth_by_sector"
}

func sectorNames(m map[string]float64) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	slices.Sort(ks)
	return ks
}

// CheckSectors refuses growth_by_sector entries naming a sector not in
// known (the sectors of the securities in the store), each error with
// file, line and, where the case differs only, the intended name.
func (c *Config) CheckSectors(known []string) error {
	set := make(map[string]bool, len(known))
	for _, k := range known {
		set[k] = true
	}
	list := slices.Clone(known)
	slices.Sort(list)
	var es Errors
	for i, s := range c.Scenarios {
		t := "scenario." + strconv.Itoa(i)
		for _, sec := range sectorNames(s.GrowthBySector) {
			if set[sec] {
				continue
			}
			msg := fmt.Sprintf("scenario %q: unknown sector %q", s.Name, sec)
			if hint := caseMatch(sec, list); hint != "" {
				msg += fmt.Sprintf(" (did you mean %q?)", hint)
			} else {
				msg += fmt.Sprintf(" (known: %s)", strings.Join(list, ", "))
			}
			es = append(es, c.errIn(t, scenarioSectorKey(c, t, sec), "%s", msg))
		}
	}
	if len(es) > 0 {
		return es
	}
	return nil
}

func caseMatch(s string, list []string) string {
	for _, k := range list {
		if strings.EqualFold(strings.TrimSpace(s), k) {
			return k
		}
	}
	return ""
}

// StressScenarios returns the scenarios of a run: the built-in set when
// stress.use_standard_set is true, then the [[scenario]] tables in file
// order.
func (c *Config) StressScenarios() []stress.Scenario {
	var out []stress.Scenario
	if c.Stress.UseStandardSet {
		out = stress.Standard()
	}
	for _, s := range c.Scenarios {
		out = append(out, stress.Scenario{Name: s.Name, Description: s.Description, Shock: s.shock()})
	}
	return out
}

// limit converts a limit table.
func (l Limit) limit() limits.Limit {
	return limits.Limit{Name: l.Name, Metric: l.Metric, Scenario: l.Scenario,
		WarnMax: l.WarnMax, BreachMax: l.BreachMax, WarnMin: l.WarnMin, BreachMin: l.BreachMin}
}

// RiskLimits returns the [[limit]] tables as limits.Limit, in file order.
func (c *Config) RiskLimits() []limits.Limit {
	out := make([]limits.Limit, len(c.Limits))
	for i, l := range c.Limits {
		out[i] = l.limit()
	}
	return out
}

func (c *Config) validateLimits() Errors {
	var es Errors
	scenarios := map[string]bool{}
	for _, s := range c.StressScenarios() {
		scenarios[s.Name] = true
	}
	builtin := map[string]bool{}
	for _, s := range stress.Standard() {
		builtin[s.Name] = true
	}
	seen := map[string]int{}
	for i, l := range c.Limits {
		t := "limit." + strconv.Itoa(i)
		for _, p := range l.limit().Problems() {
			msg := p.Msg
			if p.Field == "metric" {
				msg += metricHint(l.Metric)
			}
			es = append(es, c.errIn(t, p.Field, "limit %q: %s", l.Name, msg))
		}
		if l.Name != "" {
			if j, dup := seen[l.Name]; dup {
				es = append(es, c.errIn(t, "name", "limit name %q is already used at line %d", l.Name, c.Line("limit."+strconv.Itoa(j))))
			} else {
				seen[l.Name] = i
			}
		}
		if l.Scenario != "" && l.limit().Scope() == limits.ScopeScenario && !scenarios[l.Scenario] {
			hint := nameHint(l.Scenario, scenarioNames(scenarios))
			if builtin[l.Scenario] {
				hint = " (it is built in, but stress.use_standard_set is false)"
			}
			es = append(es, c.errIn(t, "scenario", "limit %q: unknown scenario %q%s", l.Name, l.Scenario, hint))
		}
	}
	return es
}

func scenarioNames(m map[string]bool) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	slices.Sort(ks)
	return ks
}

// metricHint suggests the metric closest to name, or lists them all.
func metricHint(name string) string {
	var names []string
	for _, m := range limits.Metrics() {
		names = append(names, m.Name)
	}
	if h := nameHint(name, names); h != "" {
		return h
	}
	return " (known: " + strings.Join(names, ", ") + ")"
}

// nameHint is " (did you mean X?)" for the closest of names within an
// edit distance of max(3, len(name)/3), or "".
func nameHint(name string, names []string) string {
	best, bestD := "", max(3, len(name)/3)+1
	for _, n := range names {
		if d := levenshtein(strings.ToLower(name), strings.ToLower(n)); d < bestD {
			best, bestD = n, d
		}
	}
	if best == "" {
		return ""
	}
	return fmt.Sprintf(" (did you mean %q?)", best)
}

// levenshtein is the Levenshtein distance between a and b, in bytes.
func levenshtein(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
