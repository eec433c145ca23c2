package returns

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"strconv"
	"testing"
	"time"
)

// Reference values come from testdata/reference/gen_stats.py, which computes
// them with numpy 1.24, pandas 1.5 and scipy 1.10 (Debian bookworm packages)
// on the committed inputs in testdata/reference/inputs. The JSON rounds every
// value to 12 significant digits, hence no comparison below is tighter than
// 1e-11 relative.
const refDir = "../../testdata/reference/"

type reference struct {
	Means struct {
		Arith            float64 `json:"arith"`
		GeoReturn        float64 `json:"geo_return"`
		HmeanPEPositive  float64 `json:"hmean_pe_positive"`
		WHmeanPEPositive float64 `json:"whmean_pe_positive"`
		PELookThrough    float64 `json:"pe_lookthrough"`
	} `json:"means"`
	Security map[string]struct {
		Discrete []float64 `json:"discrete"`
		Log      []float64 `json:"log"`
		TRI      []float64 `json:"tri"`
	} `json:"security"`
	IndexPrice map[string][]float64 `json:"index_price"`
	IndexTotal map[string][]float64 `json:"index_total"`
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

func readCSV(t *testing.T, name string) [][]string {
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
	return rows[1:]
}

func num(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func date(s string) time.Time {
	d, err := time.Parse(time.DateOnly, s)
	if err != nil {
		panic(err)
	}
	return d
}

// refPrices reads prices.csv into price histories by security ID, and the
// sorted list of dates.
func refPrices(t *testing.T) (map[string][]PricePoint, []time.Time) {
	t.Helper()
	out := map[string][]PricePoint{}
	var days []time.Time
	for _, r := range readCSV(t, "prices.csv") {
		d := date(r[0])
		if len(days) == 0 || !days[len(days)-1].Equal(d) {
			days = append(days, d)
		}
		out[r[1]] = append(out[r[1]], PricePoint{Date: d, Close: num(t, r[2]), Dividend: num(t, r[3]), SplitRatio: num(t, r[4])})
	}
	return out, days
}

// refAsset returns the asset column of returns.csv.
func refAsset(t *testing.T) []float64 {
	var x []float64
	for _, r := range readCSV(t, "returns.csv") {
		x = append(x, num(t, r[1]))
	}
	return x
}

func closeTo(got, want, rel, floor float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), floor)
}
