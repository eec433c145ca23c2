package demo

// Firm is the invented manager whose packs the demo shows.
const Firm = "Quillmere Asset Partners"

// Sectors, in the fixed order their factor paths are drawn.
var sectors = []string{
	"Utilities", "Consumer Staples", "Health Care", "Technology", "Financials",
	"Energy", "Industrials", "Real Estate", "Materials", "Communication",
}

// security is one invented company and the parameters of its model.
type security struct {
	id, name, sector string
	sharesM          float64 // shares outstanding, millions
	price0           float64 // first close
	beta             float64 // model beta to the market factor
	idioVol          float64 // daily idiosyncratic volatility, calm regime
	alpha            float64 // annual excess log drift
	yield0           float64 // initial dividend yield, decimal; 0 = non-payer
	freq             int     // payments per year
	divGrowth        float64 // annual dividend raise, decimal
	growth           float64 // long-run growth in the assumptions, decimal
	stages           bool    // multi-stage forecast in the assumptions
	noBeta           bool    // beta column left empty (estimated by the pack)
}

// universe is the fifty invented companies. Names and tickers were made up
// for this scenario; tickers were chosen away from well-known real ones.
// Long-run growth is set so that k = rf + beta*ERP (rf the 10-year yield,
// which stays near or above 1.5%; ERP >= 3.8%) exceeds g by at least half
// a point on every snapshot date, for any seed tried; demo_test checks it.
// Only the deliberate VRDT override (kLeG* below) produces k <= g.
var universe = []security{
	// Utilities: low beta, high yield.
	{"BWPL", "Brackwater Power & Light", "Utilities", 410, 48, 0.55, 0.009, 0, 0.046, 4, 0.03, 0.02, false, false},
	{"FMGD", "Fennmoor Gas Distribution", "Utilities", 180, 36, 0.50, 0.010, 0, 0.049, 4, 0.025, 0.02, false, false},
	{"CLWW", "Callowridge Water Works", "Utilities", 95, 62, 0.50, 0.008, 0, 0.038, 4, 0.04, 0.025, false, false},
	{"SBEL", "Sellbridge Electric", "Utilities", 260, 29, 0.60, 0.010, 0, 0.052, 4, 0.02, 0.015, false, false},
	{"TRNH", "Tarnholm Energy Networks", "Utilities", 150, 54, 0.65, 0.011, 0, 0.044, 2, 0.03, 0.02, false, false},
	// Consumer staples.
	{"OTRM", "Oatridge Mills", "Consumer Staples", 220, 118, 0.70, 0.010, 0.03, 0.028, 4, 0.06, 0.03, false, false},
	{"PVPR", "Pellham & Vane Provisions", "Consumer Staples", 140, 74, 0.65, 0.010, 0, 0.033, 4, 0.04, 0.025, false, false},
	{"GFHG", "Greyfen Household Goods", "Consumer Staples", 310, 88, 0.60, 0.009, 0, 0.031, 4, 0.05, 0.03, false, false},
	{"MRBD", "Marrowby Dairies", "Consumer Staples", 75, 41, 0.70, 0.012, -0.02, 0.036, 4, 0.02, 0.02, false, false},
	{"KSBW", "Kestle Beverage Works", "Consumer Staples", 190, 57, 0.75, 0.011, 0, 0.030, 2, 0.05, 0.03, false, false},
	// Health care.
	{"VRDT", "Veridane Therapeutics", "Health Care", 160, 96, 0.95, 0.016, 0.03, 0.012, 4, 0.08, 0.04, true, false},
	{"HCDX", "Holloway Crest Diagnostics", "Health Care", 120, 132, 1.00, 0.015, 0.02, 0.009, 4, 0.07, 0.04, true, false},
	{"ABSY", "Ambrel Biosystems", "Health Care", 70, 58, 1.25, 0.022, 0.04, 0, 4, 0, 0.04, true, false},
	{"NCMI", "Norrcliff Medical Instruments", "Health Care", 210, 205, 0.90, 0.013, 0, 0.014, 4, 0.06, 0.035, true, false},
	{"WSPH", "Westerly Pharmacal", "Health Care", 380, 67, 0.80, 0.012, 0, 0.027, 4, 0.04, 0.03, false, false},
	{"QRGN", "Quarrendon Genomics", "Health Care", 55, 44, 1.35, 0.024, 0.03, 0, 4, 0, 0.045, true, false},
	// Technology: high beta, low or no dividend.
	{"GLMF", "Glimmerfold Systems", "Technology", 480, 164, 1.30, 0.017, 0.06, 0.006, 4, 0.10, 0.045, true, false},
	{"NTCS", "Nettlecomb Software", "Technology", 270, 212, 1.20, 0.016, 0.04, 0.008, 4, 0.09, 0.045, true, false},
	{"IQSC", "Ironquill Semiconductors", "Technology", 330, 78, 1.50, 0.022, 0.03, 0.011, 4, 0.08, 0.04, true, false},
	{"PLDW", "Pallisade Data Works", "Technology", 150, 93, 1.25, 0.017, 0.02, 0.010, 4, 0.07, 0.04, true, false},
	{"CBTN", "Cobaltine Networks", "Technology", 200, 39, 1.15, 0.016, 0, 0.022, 4, 0.03, 0.03, false, false},
	{"VTCL", "Vantorel Cloud Services", "Technology", 120, 141, 1.45, 0.023, 0.05, 0, 4, 0, 0.045, true, false},
	{"SPRB", "Spindrel Robotics", "Technology", 60, 27, 1.50, 0.026, -0.03, 0, 4, 0, 0.04, true, false},
	// Financials.
	{"ACMB", "Ashcombe Mutual Bank", "Financials", 520, 46, 1.15, 0.012, 0, 0.038, 4, 0.04, 0.03, false, false},
	{"TBST", "Thornbury Savings & Trust", "Financials", 110, 33, 1.05, 0.012, 0, 0.042, 4, 0.03, 0.025, false, false},
	{"RLAG", "Redlake Assurance Group", "Financials", 240, 71, 1.00, 0.011, 0, 0.035, 1, 0.05, 0.03, false, false},
	{"WXCM", "Wexmoor Capital Markets", "Financials", 180, 112, 1.30, 0.015, 0.02, 0.024, 4, 0.06, 0.035, false, false},
	{"HBIH", "Halberd Insurance Holdings", "Financials", 95, 84, 0.95, 0.011, 0, 0.031, 4, 0.05, 0.03, false, false},
	{"CPLF", "Copperleaf Lending", "Financials", 130, 22, 1.25, 0.017, 0, 0.045, 4, 0.02, 0.02, false, false},
	// Energy.
	{"DNPT", "Duncairn Petroleum", "Energy", 690, 61, 1.10, 0.015, 0, 0.048, 4, 0.03, 0.02, false, true},
	{"SMOD", "Saltmarsh Offshore Drilling", "Energy", 85, 18, 1.40, 0.024, -0.02, 0.030, 4, 0, 0.02, false, false},
	{"BBRS", "Brimstone Basin Resources", "Energy", 160, 43, 1.25, 0.019, 0, 0.052, 4, 0.02, 0.02, false, false},
	{"ORPP", "Orrel Pipeline Partners", "Energy", 230, 38, 0.80, 0.011, 0, 0.065, 4, 0.02, 0.015, false, false},
	{"KVRF", "Kelvane Refining", "Energy", 140, 52, 1.15, 0.017, 0, 0.040, 4, 0.04, 0.02, false, false},
	// Industrials.
	{"HGCW", "Harrowgate Cable & Wire", "Industrials", 115, 57, 1.10, 0.013, 0, 0.026, 4, 0.04, 0.03, false, true},
	{"SCMY", "Stonecrop Machinery", "Industrials", 175, 146, 1.15, 0.014, 0.04, 0.021, 4, 0.07, 0.03, false, false},
	{"FRRF", "Ferrand Rail Freight", "Industrials", 300, 98, 1.00, 0.011, 0, 0.024, 4, 0.05, 0.03, false, true},
	{"BTAS", "Blackthorn Aerostructures", "Industrials", 90, 124, 1.30, 0.017, 0.02, 0.012, 4, 0.05, 0.035, false, false},
	{"MREN", "Millrace Engineering", "Industrials", 65, 49, 1.10, 0.014, 0, 0.028, 2, 0.04, 0.025, false, false},
	{"GPLX", "Gantry Point Logistics", "Industrials", 125, 71, 1.20, 0.015, 0.02, 0.016, 4, 0.06, 0.035, false, false},
	// Real estate trusts.
	{"CLPT", "Cloverhythe Property Trust", "Real Estate", 240, 34, 0.85, 0.012, 0, 0.052, 4, 0.025, 0.02, false, false},
	{"WMRT", "Wharfmoor Residential Trust", "Real Estate", 160, 26, 0.80, 0.012, 0, 0.055, 12, 0.02, 0.02, false, false},
	{"KMSP", "Kingsmere Storage Properties", "Real Estate", 105, 63, 0.90, 0.013, 0, 0.041, 4, 0.04, 0.025, false, false},
	// Materials.
	{"QSAG", "Quarrystone Aggregates", "Materials", 80, 77, 1.05, 0.014, 0, 0.022, 1, 0.04, 0.025, false, false},
	{"TMCH", "Tallowmere Chemicals", "Materials", 145, 59, 1.15, 0.014, 0, 0.034, 2, 0.03, 0.025, false, false},
	{"RHPP", "Rookhaven Paper & Pulp", "Materials", 70, 31, 1.10, 0.015, 0, 0.045, 4, 0.02, 0.02, false, true},
	{"SBMN", "Silverbeck Mining", "Materials", 250, 24, 1.35, 0.022, 0, 0.030, 4, 0.03, 0.02, false, false},
	// Communication.
	{"LFMD", "Lanternfield Media", "Communication", 135, 45, 1.05, 0.015, 0, 0.020, 4, 0.03, 0.025, false, true},
	{"PNTL", "Pennarth Telecom", "Communication", 450, 31, 0.70, 0.010, 0, 0.058, 4, 0.01, 0.015, false, false},
	{"EVBC", "Echo Vale Broadcasting", "Communication", 60, 23, 0.90, 0.014, -0.01, 0.047, 4, 0.02, 0.015, false, false},
}

// Securities with planted events. The fractions place them in the history.
const (
	kLeGSecurity   = "VRDT" // assumptions with k <= g near the end
	kLeGDaysAhead  = 63     // business days before End the override takes effect
	kLeGDiscount   = 0.068
	kLeGGrowth     = 0.07
	kLeGStages     = "2:0.16;3:0.1"
	staleSecurity  = "KMSP" // no close on the last snapshot date
	cutSecurity    = "BBRS" // halves its dividend after the crash
	fixedKSecurity = "SMOD" // discount_rate set for the whole history
	fixedK         = 0.115
	stageRateSec   = "NCMI" // stages with an explicit stage discount rate
)

// splitEvent is a stock split at a fraction of the history.
type splitEvent struct {
	id    string
	at    float64
	ratio float64
}

var splitEvents = []splitEvent{
	{"GLMF", 0.58, 2},   // 2-for-1
	{"OTRM", 0.70, 1.5}, // 3-for-2
	{"SCMY", 0.85, 2},   // 2-for-1
}

// Crash and rate-cycle placement as fractions of the history (a third of
// six years is two years).
const (
	crashAt      = 1.0 / 3
	risingFrom   = 0.42
	risingTo     = 0.62
	largeFlowAt  = 0.72
	largeFlowPct = 0.20 // of the value portfolio at the previous snapshot
)

// portfolioDef is one of the firm's portfolios.
type portfolioDef struct {
	id, name, strategy, method string
	value0                     float64 // initial value, base currency
	members                    []string
	swapAt                     float64 // fraction of history of the one swap
	sell, buy                  string
	largeFlow                  bool
}

var portfolioDefs = []portfolioDef{
	{
		id: "INCOME", name: "Quillmere Equity Income",
		strategy: "Dividend income: utilities, staples and property trusts with low beta",
		method:   "value", value0: 42_000_000,
		members: []string{"BWPL", "FMGD", "CLWW", "SBEL", "TRNH", "OTRM", "PVPR", "GFHG", "MRBD",
			"KSBW", "CLPT", "WMRT", "KMSP", "PNTL", "TBST", "ORPP", "HBIH"},
		swapAt: 0.60, sell: "MRBD", buy: "EVBC",
	},
	{
		id: "GROWTH", name: "Quillmere Growth Leaders",
		strategy: "Growth: technology and health care leaders, low dividend, high beta",
		method:   "equal", value0: 31_000_000,
		members: []string{"GLMF", "NTCS", "IQSC", "PLDW", "CBTN", "VTCL", "SPRB", "VRDT", "HCDX",
			"NCMI", "WSPH", "QRGN", "LFMD", "BTAS", "GPLX", "WXCM"},
		swapAt: 0.50, sell: "SPRB", buy: "ABSY",
	},
	{
		id: "VALUE", name: "Quillmere Value Opportunities",
		strategy: "Value: financials, energy, industrials and materials below intrinsic value",
		method:   "price", value0: 26_000_000,
		members: []string{"ACMB", "TBST", "RLAG", "WXCM", "HBIH", "CPLF", "DNPT", "SMOD", "BBRS",
			"ORPP", "KVRF", "HGCW", "SCMY", "FRRF", "MREN", "GPLX", "QSAG", "TMCH", "RHPP", "SBMN"},
		swapAt: 0.45, sell: "SMOD", buy: "BTAS",
		largeFlow: true,
	},
}
