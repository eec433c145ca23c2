package report

import (
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"time"

	"plumbline/risk/pack"
)

// The fixture is a fictional portfolio of invented companies with about
// two years of synthetic daily data. Its figures are made to hang together
// (weights sum to one, contributions sum to the portfolio durations,
// durations follow 1/(k-g)) so that the pages read like a real pack, but
// they are not results of the project's own computations.

func f64(x float64) *float64 { return &x }

var (
	sylA = []string{"Quorv", "Ymbr", "Halv", "Drev", "Ostr", "Glim", "Wrenn", "Tamsk", "Pryd", "Zent", "Krag", "Velm", "Olvar", "Brisk", "Fyrn", "Caskel"}
	sylB = []string{"elle", "ora", "ix", "undy", "avel", "esto", "ion", "ara", "wick", "mont"}
	// sectors with a business word each for the company names.
	sectors = [][2]string{
		{"Utilities", "Power"}, {"Water", "Water"}, {"Food & Household", "Foods"}, {"Telecom", "Networks"},
		{"Pipelines", "Pipelines"}, {"Health Care", "Health"}, {"Property", "Estates"}, {"Industrial", "Engineering"},
	}
)

// weekdays returns n weekdays ending on end.
func weekdays(end time.Time, n int) []time.Time {
	out := make([]time.Time, 0, n)
	for d := end; len(out) < n; d = d.AddDate(0, 0, -1) {
		if d.Weekday() == time.Saturday || d.Weekday() == time.Sunday {
			continue
		}
		out = append(out, d)
	}
	for i, j := 0, len(out)-1; i < j; i, j = i+1, j-1 {
		out[i], out[j] = out[j], out[i]
	}
	return out
}

func sampleStd(x []float64) float64 {
	n := float64(len(x))
	m := 0.0
	for _, v := range x {
		m += v
	}
	m /= n
	s := 0.0
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	return math.Sqrt(s / (n - 1))
}

// fixtureMeta is the run record of the fixture.
func fixtureMeta() Meta {
	sup := int64(40)
	return Meta{
		RunID:          42,
		Revision:       2,
		Supersedes:     &sup,
		CreatedAt:      time.Date(2025, 6, 14, 6, 30, 12, 0, time.UTC),
		ProgramVersion: "0.4.0",
		ConfigHash:     "3f1c9a0b6d2e4f8a1b7c5d3e9f0a2b4c6d8e0f1a3b5c7d9e1f2a4b6c8d0e2f4a",
		InputHash:      "a8e4c2f0b6d4e2a0c8f6b4d2e0a8c6f4b2d0e8a6c4f2b0d8e6a4c2f0b8d6e4a2",
		Firm:           "Quillfeather Asset Partners",
	}
}

// fixtureDoc builds a pack of nHold holdings (one of them excluded).
func fixtureDoc(nHold int) *pack.Document {
	rng := rand.New(rand.NewPCG(7, 11))
	asOf := time.Date(2025, 6, 13, 0, 0, 0, 0, time.UTC)
	d := &pack.Document{
		Schema: pack.SchemaVersion,
		Portfolio: pack.PortfolioInfo{
			ID: "MERIDIAN", Name: "Meridian Income", Strategy: "Dividend-growth equities",
			Inception: "2022-01-03", BenchmarkMethod: "value",
		},
		AsOf:         asOf.Format(time.DateOnly),
		BaseCurrency: "USD",
	}

	// Holdings.
	used := map[string]bool{}
	type raw struct {
		id, name, sector string
		q, p             float64
	}
	var rs []raw
	for i := 0; i < nHold; i++ {
		sec := sectors[i%len(sectors)]
		name := sylA[rng.IntN(len(sylA))] + sylB[rng.IntN(len(sylB))] + " " + sec[1]
		id := ""
		if i == 0 {
			name, id = "Hulgrave Cable Works", "HGCW"
		} else {
			base := strings.ToUpper(name[:3])
			for k := 0; ; k++ {
				id = base + string(rune('A'+k%26))
				if k >= 26 {
					id += string(rune('A' + k/26))
				}
				if !used[id] {
					break
				}
			}
		}
		used[id] = true
		rs = append(rs, raw{id, name, sec[0], float64(1000 * (5 + rng.IntN(60))), 20 + 130*rng.Float64()})
	}
	total := 0.0
	for _, r := range rs {
		total += r.q * r.p
	}
	cash := total * 0.025
	total += cash
	excluded := nHold - 1
	var modDur, macDur, conv, gDur, gConv, beta, lvl, slp, crv, dv01 float64
	models := []string{"constant_growth", "multi_stage", "term_structure"}
	for i, r := range rs {
		v := r.q * r.p
		w := v / total
		h := pack.Holding{
			ID: r.id, Name: r.name, Sector: r.sector, Quantity: r.q, Price: math.Round(r.p*100) / 100,
			PriceDate: d.AsOf, Value: v, Weight: w,
		}
		if i == excluded {
			h.PriceDate = "2025-06-06"
			d.Excluded = append(d.Excluded, pack.Exclusion{ID: r.id, Reason: "no dividend assumptions in effect on the as-of date", ValueShare: w})
			d.Holdings = append(d.Holdings, h)
			continue
		}
		k := 0.07 + 0.03*rng.Float64()
		g := 0.02 + 0.03*rng.Float64()
		md := 1 / (k - g)
		h.Model = models[i%3]
		h.K, h.G = f64(k), f64(g)
		h.D0 = f64(r.p * (k - g) / (1 + g))
		h.ModelValue = f64(r.p * (0.85 + 0.3*rng.Float64()))
		h.Beta = f64(0.6 + 0.6*rng.Float64())
		h.BetaSource = "estimated"
		if i%4 == 0 {
			h.BetaSource = "assumption"
		}
		h.ModDuration = f64(md)
		h.MacDuration = f64((1 + k) * md)
		h.Convexity = f64(2 * md * md)
		h.GrowthDur = f64(md * (1 + k) / (1 + g))
		h.GrowthConv = f64(2 * md * md * 0.9)
		h.LevelDur = f64(md * 0.95)
		h.SlopeDur = f64(md * 0.4)
		h.CurveDur = f64(md * 0.15)
		h.ContribDuration = f64(w * md)
		h.ContribGrowthDuration = f64(w * *h.GrowthDur)
		h.Empirical = &pack.Regression{Value: md * 0.3 * rng.Float64(), StdErr: 1.5 + rng.Float64(), R2: 0.02 + 0.1*rng.Float64(), N: 104}
		h.NumericalError = f64(1e-7 * (1 + rng.Float64()))
		dk, dg := (rng.Float64()-0.5)*0.002, (rng.Float64()-0.5)*0.001
		tay := -md*dk + *h.GrowthDur*dg + 0.5**h.Convexity*dk*dk
		full := tay + 0.00002*(rng.Float64()-0.5)
		h.Explain = &pack.Explain{From: "2025-06-06", To: d.AsOf, DeltaK: dk, DeltaG: dg, Taylor: tay, Full: full, Residual: full - tay, Actual: f64(full + 0.01*(rng.Float64()-0.5))}
		modDur += w * md
		macDur += w * *h.MacDuration
		conv += w * *h.Convexity
		gDur += w * *h.GrowthDur
		gConv += w * *h.GrowthConv
		beta += w * *h.Beta
		lvl += w * *h.LevelDur
		slp += w * *h.SlopeDur
		crv += w * *h.CurveDur
		dv01 += -v * md * 1e-4
		d.Holdings = append(d.Holdings, h)
	}

	// Sectors and concentration.
	bySec := map[string]*pack.Sector{}
	hhi := 0.0
	ws := make([]float64, 0, len(d.Holdings))
	for _, h := range d.Holdings {
		s := bySec[h.Sector]
		if s == nil {
			s = &pack.Sector{Name: h.Sector, ContribDuration: f64(0), ContribGrowthDuration: f64(0)}
			bySec[h.Sector] = s
		}
		s.Weight += h.Weight
		s.Value += h.Value
		if h.ContribDuration != nil {
			*s.ContribDuration += *h.ContribDuration
			*s.ContribGrowthDuration += *h.ContribGrowthDuration
		}
		hhi += h.Weight * h.Weight
		ws = append(ws, h.Weight)
	}
	for _, s := range bySec {
		d.Sectors = append(d.Sectors, *s)
	}
	sort.Slice(d.Sectors, func(i, j int) bool { return d.Sectors[i].Weight > d.Sectors[j].Weight })
	sort.Sort(sort.Reverse(sort.Float64Slice(ws)))
	top5 := 0.0
	for i := 0; i < 5 && i < len(ws); i++ {
		top5 += ws[i]
	}
	maxID := ""
	for _, h := range d.Holdings {
		if h.Weight == ws[0] {
			maxID = h.ID
		}
	}
	d.Concentration = pack.Concentration{
		HHI: hhi, EffectiveN: 1 / hhi, Top5Weight: top5, MaxSingleName: ws[0], MaxSingleID: maxID,
		MaxSector: d.Sectors[0].Weight, MaxSectorName: d.Sectors[0].Name, CashWeight: cash / total,
	}

	// Daily series.
	days := weekdays(asOf, 500)
	n := len(days)
	sr := pack.Series{}
	value := total / 1.12
	bench := 1000.0
	for i, day := range days {
		r := 0.0003 + 0.0085*rng.NormFloat64()
		if i == 0 {
			r = 0
		}
		flow := 0.0
		if i == 300 {
			flow = 2_500_000
		}
		prev := value
		value = prev*(1+r) + flow
		bench *= 1 + 0.0003 + 0.0095*rng.NormFloat64()*0.8 + r*0.3
		sr.Dates = append(sr.Dates, day.Format(time.DateOnly))
		sr.Value = append(sr.Value, value)
		sr.Discrete = append(sr.Discrete, r)
		sr.Log = append(sr.Log, math.Log1p(r))
		sr.Dollar = append(sr.Dollar, value-prev-flow)
		sr.Benchmark = append(sr.Benchmark, bench)
	}
	// Scale the series so that its last value is the holdings' value.
	k := total / value
	for i := range sr.Value {
		sr.Value[i] *= k
		sr.Dollar[i] *= k
	}
	windows := []int{21, 63, 252}
	for _, w := range windows {
		for _, kind := range []string{"discrete", "log", "dollar"} {
			src := map[string][]float64{"discrete": sr.Discrete, "log": sr.Log, "dollar": sr.Dollar}[kind]
			rsr := pack.RollingSeries{WindowDays: w, Kind: kind, Stat: "std_ann", Values: make([]*float64, n)}
			if kind == "dollar" {
				rsr.Stat = "std"
			}
			for i := w; i < n; i++ {
				s := sampleStd(src[i-w+1 : i+1])
				if kind != "dollar" {
					s *= math.Sqrt(252)
				}
				rsr.Values[i] = f64(s)
			}
			sr.Rolling = append(sr.Rolling, rsr)
		}
	}
	d.Series = sr

	// Summary.
	week := 1.0
	for _, r := range sr.Discrete[n-5:] {
		week *= 1 + r
	}
	s := pack.Summary{
		Value: total, Cash: cash, HoldingCount: nHold,
		Returns: pack.Returns{
			Week: f64(week - 1), MonthToDate: f64(0.0132), QuarterToDate: f64(-0.0071), YearToDate: f64(0.0418),
			SinceInception: f64(0.2261), SinceInceptionAnn: f64(0.0605), InceptionDate: "2022-01-03",
			BenchmarkWeek: f64(0.0049), BenchmarkYearToDate: f64(0.0377),
		},
		EWMAVolatility:   f64(0.1288),
		ModifiedDuration: f64(modDur), MacaulayDuration: f64(macDur), Convexity: f64(conv),
		DollarDuration01: f64(dv01), GrowthDuration: f64(gDur), GrowthConvexity: f64(gConv), Beta: f64(beta),
		LevelDuration: f64(lvl), SlopeDuration: f64(slp), CurvatureDuration: f64(crv),
		Empirical:     &pack.Regression{Value: 6.84, StdErr: 2.31, R2: 0.081, N: 104},
		BenchmarkBeta: f64(0.87), TrackingError: f64(0.0412), MaxDrawdown: f64(-0.1375), CurrentDrawdown: f64(-0.0218),
	}
	for _, w := range windows {
		wv := pack.WindowVol{WindowDays: w}
		for _, rr := range sr.Rolling {
			if rr.WindowDays == w {
				switch rr.Kind {
				case "discrete":
					wv.Discrete = rr.Values[n-1]
				case "log":
					wv.Log = rr.Values[n-1]
				case "dollar":
					wv.Dollar = rr.Values[n-1]
				}
			}
		}
		s.Volatility = append(s.Volatility, wv)
	}
	d.Summary = s

	// VaR: historical from the series, parametric ones scaled from it.
	sorted := append([]float64(nil), sr.Discrete...)
	sort.Float64s(sorted)
	for _, c := range []float64{0.95, 0.975, 0.99} {
		idx := int(math.Floor((1 - c) * float64(n)))
		v := -sorted[idx]
		es := 0.0
		for _, x := range sorted[:idx+1] {
			es -= x
		}
		es /= float64(idx + 1)
		for _, m := range []struct {
			name string
			f    float64
		}{{"historical", 1}, {"normal", 0.93}, {"cornish_fisher", 1.04}} {
			d.VaR = append(d.VaR, pack.VaRFigure{Method: m.name, Confidence: c, HorizonDays: 1,
				VaR: v * m.f, ES: es * m.f, VaRAmount: v * m.f * total, ESAmount: es * m.f * total})
		}
	}
	h := d.VaR[6] // historical 99%
	d.VaR = append(d.VaR, pack.VaRFigure{Method: "historical", Confidence: 0.99, HorizonDays: 10,
		VaR: h.VaR * math.Sqrt(10), ES: h.ES * math.Sqrt(10), VaRAmount: h.VaRAmount * math.Sqrt(10), ESAmount: h.ESAmount * math.Sqrt(10)})
	d.Backtest = &pack.Backtest{Days: 250, Confidence: 0.99, Exceptions: 4, Expected: 2.5, KupiecLR: 0.7758, PValue: 0.3784, Zone: "green"}

	// Curve.
	cv := &pack.Curve{Date: d.AsOf, Level: 0.0452, Slope: -0.0081, Curvature: 0.0123, Lambda: 0.6, RMSE: 0.00031}
	for _, m := range []int{1, 3, 6, 12, 24, 36, 60, 84, 120, 240, 360} {
		t := float64(m) / 12
		x := cv.Lambda * t
		f1 := (1 - math.Exp(-x)) / x
		fit := cv.Level + cv.Slope*f1 + cv.Curvature*(f1-math.Exp(-x))
		cv.Points = append(cv.Points, pack.CurvePoint{TenorMonths: m, Yield: fit + 0.0004*(rng.Float64()-0.5), Fitted: fit})
	}
	d.Curve = cv
	d.Explain = &pack.Explain{From: "2025-06-06", To: d.AsOf, DeltaK: 0.0007, DeltaG: -0.0002, Taylor: -0.0151, Full: -0.0148, Residual: 0.0003, Actual: f64(week - 1)}

	// Stress scenarios and replays.
	scen := []struct {
		name, desc string
		dk, dg     float64
	}{
		{"Rates up 100 bp", "Discount rates of every holding rise by one percentage point.", 0.01, 0},
		{"Rates down 100 bp", "Discount rates fall by one percentage point.", -0.01, 0},
		{"Rates up 200 bp", "Discount rates rise by two percentage points.", 0.02, 0},
		{"Growth down 1 pt", "Long-run dividend growth falls by one point for every holding.", 0, -0.01},
		{"Growth up 1 pt", "Long-run dividend growth rises by one point.", 0, 0.01},
		{"Rates up, growth down", "Discount rates up 150 bp and growth down 50 bp together.", 0.015, -0.005},
		{"Risk premium up 150 bp", "Equity risk premium up 1.5 points; discount rates move with each beta.", 0.015 * beta, 0},
		{"Curve steepens", "Long yields up 75 bp, short yields unchanged.", 0.006, 0},
		{"Curve flattens", "Short yields up 75 bp, long yields unchanged.", 0.002, 0},
	}
	for si, sc := range scen {
		tay := (-modDur*sc.dk + 0.5*conv*sc.dk*sc.dk + gDur*sc.dg + 0.5*gConv*sc.dg*sc.dg) * total
		full := tay * (1 + 0.08*math.Abs(sc.dk+sc.dg)*10)
		res := pack.StressResult{Name: sc.name, Description: sc.desc, PnL: full, PnLPct: full / total,
			Taylor: f64(tay), TaylorPct: f64(tay / total), Error: f64(full - tay)}
		for _, hh := range d.Holdings[:5] {
			if hh.ModDuration == nil {
				continue
			}
			pnl := hh.Value * (-*hh.ModDuration*sc.dk + *hh.GrowthDur*sc.dg)
			res.Top = append(res.Top, pack.Contributor{ID: hh.ID, Sector: hh.Sector, PnL: pnl * 1.02, Pct: pnl * 1.02 / hh.Value, Taylor: f64(pnl)})
		}
		if si == 0 {
			ex := d.Excluded[0]
			res.Failed = []pack.Exclusion{ex}
		}
		d.Stress = append(d.Stress, res)
	}
	d.Replays = []pack.StressResult{
		{Name: "Autumn rate shock", Description: "Price moves of a quarter in which long yields rose fast.", From: "2023-08-01", To: "2023-10-31", PnL: -0.087 * total, PnLPct: -0.087},
		{Name: "Spring rebound", Description: "Price moves of a quarter of falling yields.", From: "2024-03-01", To: "2024-05-31", PnL: 0.054 * total, PnLPct: 0.054},
	}

	// Limits: one warning, one breach.
	d.Limits = []pack.LimitStatus{
		{Name: "Single name cap", Metric: "max_single_name_weight", Value: f64(d.Concentration.MaxSingleName), Status: "ok", Side: "max", Level: f64(0.15), Headroom: f64(0.15 - d.Concentration.MaxSingleName)},
		{Name: "Sector cap", Metric: "max_sector_weight", Value: f64(0.237), Status: "warning", Side: "max", Level: f64(0.25), Headroom: f64(0.013)},
		{Name: "Daily VaR budget", Metric: "var_99_1d", Value: f64(h.VaR), Status: "breach", Side: "max", Level: f64(0.015), Headroom: f64(0.015 - h.VaR)},
		{Name: "Duration band", Metric: pack.MetricDurModified, Value: f64(modDur), Status: "ok", Side: "max", Level: f64(30), Headroom: f64(30 - modDur)},
		{Name: "Cash floor", Metric: "cash_weight", Value: f64(cash / total), Status: "ok", Side: "min", Level: f64(0.01), Headroom: f64(cash/total - 0.01)},
		{Name: "Tracking error ceiling", Metric: pack.MetricTrackingError, Status: "no_data"},
	}

	// History: 26 weekly runs, the last being this one, of the metrics
	// pack follows, under pack's own names.
	cur := pack.Headline(d)
	names := make([]string, 0, len(cur))
	for m := range cur {
		names = append(names, m)
	}
	sort.Strings(names)
	const nh = 26
	hist := make([]pack.HistoryPoint, nh)
	for i := range hist {
		hist[i] = pack.HistoryPoint{AsOf: asOf.AddDate(0, 0, -7*(nh-1-i)).Format(time.DateOnly), Metrics: map[string]float64{}}
	}
	for _, m := range names {
		c := cur[m]
		vals := make([]float64, nh)
		vals[nh-1] = c
		step := 0.01 * math.Abs(c)
		if m == pack.MetricReturnWeek {
			step = 0.01
		}
		if m == pack.MetricDurModified {
			vals[nh-2] = c - 1.9 // the flagged jump
		} else {
			vals[nh-2] = c - step*rng.NormFloat64()
		}
		for i := nh - 3; i >= 0; i-- {
			if m == pack.MetricReturnWeek {
				vals[i] = 0.002 + 0.012*rng.NormFloat64()
				continue
			}
			vals[i] = vals[i+1] - step*rng.NormFloat64()
		}
		if m == pack.MetricDurModified {
			for i := nh - 3; i >= 0; i-- {
				vals[i] = vals[i+1] - 0.3*rng.NormFloat64()
			}
		}
		for i := range hist {
			hist[i].Metrics[m] = vals[i]
		}
		prev := vals[nh-2]
		var past []float64
		for i := 1; i < nh-1; i++ {
			past = append(past, vals[i]-vals[i-1])
		}
		z := (c - prev) / sampleStd(past)
		d.Drift = append(d.Drift, pack.DriftItem{Metric: m, Value: c, Previous: f64(prev), Change: f64(c - prev), Z: f64(z), History: len(past), Flagged: m == pack.MetricDurModified})
	}
	d.History = hist

	d.DataQuality = []pack.Finding{
		{Kind: "no_assumptions", ID: d.Excluded[0].ID, Detail: "No dividend assumptions in effect on 2025-06-13; holding left out of model measures.", ValueShare: d.Excluded[0].ValueShare},
		{Kind: "stale_price", ID: d.Excluded[0].ID, Detail: "Last price dated 2025-06-06, carried forward 5 days.", ValueShare: d.Excluded[0].ValueShare},
		{Kind: "missing_yield_tenor", Detail: "No 7-year yield on 2025-06-13; the curve was fitted without it.", ValueShare: 0},
	}
	d.Methodology = pack.Methodology{
		Parameters: map[string]string{
			"risk.risk_free_tenor_months": "120", "risk.growth_convention": "d0", "risk.rolling_windows": "21, 63, 252",
			"risk.ewma_lambda": "0.94", "risk.var_lookback_days": "500", "risk.backtest_days": "250",
			"risk.large_flow_fraction": "0.10", "risk.empirical_tenor_months": "120", "risk.empirical_window_weeks": "104",
			"drift.z_threshold": "2.5", "drift.min_history": "8", "base_currency": "USD",
		},
		Models: []string{
			"Constant-growth dividend discount model (Gordon), D0 convention",
			"Multi-stage dividend discount model with explicit forecast stages",
			"Term-structure dividend discount model discounting on the fitted curve",
			"Nelson-Siegel yield curve, decay fixed by least squares over a grid",
			"Historical, normal and Cornish-Fisher VaR; Kupiec proportion-of-failures backtest",
		},
		DataSources: []string{
			"holdings_2025-06-13.csv (sha256 5be1...09af)",
			"prices_2025-06-13.csv (sha256 77c2...e1d4)",
			"yields_2025-06-13.csv (sha256 0d9a...c3b7)",
			"assumptions_2025-Q2.csv (sha256 c41e...8a20)",
		},
	}
	return d
}
