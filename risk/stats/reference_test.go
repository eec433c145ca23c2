package stats

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"strconv"
	"testing"
)

// Reference values come from testdata/reference/gen_stats.py, which computes
// them with numpy 1.24, pandas 1.5 and scipy 1.10 (Debian bookworm packages)
// on the committed inputs in testdata/reference/inputs. The JSON rounds every
// value to 12 significant digits (so that it does not depend on the BLAS
// kernel), hence no comparison below is tighter than 1e-11 relative.
const refDir = "../../testdata/reference/"

type varRef struct {
	N   int     `json:"n"`
	VaR float64 `json:"var"`
	ES  float64 `json:"es"`
	ZCF float64 `json:"zcf"`
}

type reference struct {
	Rolling map[string]struct {
		Mean []float64 `json:"mean"`
		Std  []float64 `json:"std"`
	} `json:"rolling"`
	EWMA       map[string][]float64 `json:"ewma"`
	CovSample  [][]float64          `json:"cov_sample"`
	CovEWMA094 [][]float64          `json:"cov_ewma_094"`
	Contrib    struct {
		Weights   []float64 `json:"weights"`
		Vol       float64   `json:"vol"`
		Marginal  []float64 `json:"marginal"`
		Component []float64 `json:"component"`
	} `json:"contrib"`
	Moments struct {
		Mean, Std, Skew, Kurt float64
	} `json:"moments"`
	NormPPF map[string]float64           `json:"norm_ppf"`
	VaR     map[string]map[string]varRef `json:"var"`
	Kupiec  []struct {
		N, X   int
		P, LR  float64
		PValue float64 `json:"pvalue"`
	} `json:"kupiec"`
	Chi2PPF095  float64   `json:"chi2_ppf_095_df1"`
	BinomCDF250 []float64 `json:"binom_cdf_250_001"`
	Regression  struct {
		Beta, Alpha, R2 float64
		TrackingError   float64 `json:"tracking_error"`
	} `json:"regression"`
	Drawdown struct {
		Max      float64   `json:"max"`
		Peak     int       `json:"peak"`
		Trough   int       `json:"trough"`
		Recovery int       `json:"recovery"`
		Current  float64   `json:"current"`
		Series   []float64 `json:"series"`
	} `json:"drawdown"`
}

func loadReference(t *testing.T) reference {
	t.Helper()
	b, err := os.ReadFile(refDir + "stats_reference.json")
	if err != nil {
		t.Fatalf("reading reference values: %v", err)
	}
	var ref reference
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatalf("parsing reference values: %v", err)
	}
	return ref
}

// readColumns reads a reference input CSV and returns its numeric columns
// (every column but the first, which is the date) by header name.
func readColumns(t *testing.T, name string) (header []string, cols map[string][]float64) {
	t.Helper()
	f, err := os.Open(refDir + "inputs/" + name)
	if err != nil {
		t.Fatalf("opening %s: %v", name, err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("reading %s: %v", name, err)
	}
	header = rows[0][1:]
	cols = map[string][]float64{}
	for _, row := range rows[1:] {
		for j, h := range header {
			v, err := strconv.ParseFloat(row[j+1], 64)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			cols[h] = append(cols[h], v)
		}
	}
	return header, cols
}

// assetReturns returns the "asset" and "bench" columns of returns.csv.
func assetReturns(t *testing.T) (asset, bench []float64) {
	t.Helper()
	_, c := readColumns(t, "returns.csv")
	return c["asset"], c["bench"]
}

// close reports whether got is within rel·max(|want|, floor) of want.
func closeTo(got, want, rel, floor float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), floor)
}
