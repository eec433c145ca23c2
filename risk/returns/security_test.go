package returns

import (
	"errors"
	"math"
	"testing"
	"time"
)

// TestSecurityReturnsAgainstPandas: pandas 1.5
// split·(close + dividend)/close.shift(1) - 1, numpy log1p, and
// 100·cumprod(1 + r) on prices.csv (four fictional securities with splits
// and dividends). Tolerance 1e-11 relative (12-digit JSON; the index is a
// product of 79 factors, rounding grows to about 1e-14).
func TestSecurityReturnsAgainstPandas(t *testing.T) {
	ref := loadReference(t)
	prices, _ := refPrices(t)
	if len(ref.Security) != len(prices) {
		t.Fatalf("%d securities in reference, %d in prices.csv", len(ref.Security), len(prices))
	}
	for id, p := range prices {
		want := ref.Security[id]
		sr, err := SecurityReturnSeries(p)
		if err != nil {
			t.Fatal(err)
		}
		tri, err := TotalReturnIndex(p, 100)
		if err != nil {
			t.Fatal(err)
		}
		for i := range want.Discrete {
			if !closeTo(sr.Discrete[i], want.Discrete[i], 1e-11, 1e-3) || !closeTo(sr.Log[i], want.Log[i], 1e-11, 1e-3) {
				t.Errorf("%s day %d: r %v log %v, pandas %v %v", id, i, sr.Discrete[i], sr.Log[i], want.Discrete[i], want.Log[i])
			}
		}
		for i := range want.TRI {
			if !closeTo(tri[i], want.TRI[i], 1e-11, 0) {
				t.Errorf("%s TRI[%d] = %v, pandas %v", id, i, tri[i], want.TRI[i])
			}
		}
	}
}

func d(s string) time.Time { return date(s) }

// TestSecurityWorkedExamples (common practice):
//   - a stock at 100 going ex a 2.00 dividend and closing at 98 has a total
//     return of 0 and a price return of -2%, and a dollar change of 0;
//   - after a 2-for-1 split effective at the open, a close of 49.49 against
//     98 the day before is a 1% return (2·49.49/98 = 1.01);
//   - a 3-for-2 split with close 66.00 against 99: 1.5·66/99 - 1 = 0.
func TestSecurityWorkedExamples(t *testing.T) {
	p := []PricePoint{
		{Date: d("2024-03-01"), Close: 100},
		{Date: d("2024-03-04"), Close: 98, Dividend: 2},
		{Date: d("2024-03-05"), Close: 49.49, SplitRatio: 2},
		{Date: d("2024-03-06"), Close: 99},
		{Date: d("2024-03-07"), Close: 66, SplitRatio: 1.5},
	}
	sr, err := SecurityReturnSeries(p)
	if err != nil {
		t.Fatal(err)
	}
	// Each return is a quotient of exact decimals: 1e-15 absolute.
	want := []float64{0, 0.01, 99/49.49 - 1, 0}
	for i, w := range want {
		if math.Abs(sr.Discrete[i]-w) > 1e-15 {
			t.Errorf("return %d = %v, want %v", i, sr.Discrete[i], w)
		}
	}
	if math.Abs(sr.Price[0]+0.02) > 1e-15 || sr.Dollar[0] != 0 || sr.Log[0] != 0 {
		t.Errorf("ex-dividend day: price %v dollar %v log %v", sr.Price[0], sr.Dollar[0], sr.Log[0])
	}
	if !sr.Dates[0].Equal(d("2024-03-04")) {
		t.Errorf("first return dated %v", sr.Dates[0])
	}
}

// TestTotalReturnIndexReinvestment: the index equals the value of a holding
// whose dividends buy shares at the ex-date close and whose share count
// follows the splits (the GIPS reinvestment assumption, simulated share by
// share). 1e-13 relative: a few dozen multiplications each way.
func TestTotalReturnIndexReinvestment(t *testing.T) {
	prices, _ := refPrices(t)
	for id, p := range prices {
		tri, err := TotalReturnIndex(p, 1000)
		if err != nil {
			t.Fatal(err)
		}
		shares := 1000 / p[0].Close
		for i := 1; i < len(p); i++ {
			shares *= p[i].Split()
			cash := shares * p[i].Dividend
			shares += cash / p[i].Close // reinvested at the close
			if v := shares * p[i].Close; !closeTo(tri[i], v, 1e-13, 0) {
				t.Fatalf("%s day %d: index %v, holding %v", id, i, tri[i], v)
			}
		}
	}
}

func TestSecurityErrors(t *testing.T) {
	ok := PricePoint{Date: d("2024-01-02"), Close: 10}
	cases := []struct {
		name string
		p    []PricePoint
		want error
	}{
		{"zero close", []PricePoint{ok, {Date: d("2024-01-03"), Close: 0}}, ErrPrice},
		{"negative dividend", []PricePoint{ok, {Date: d("2024-01-03"), Close: 10, Dividend: -1}}, ErrDividend},
		{"negative split", []PricePoint{ok, {Date: d("2024-01-03"), Close: 10, SplitRatio: -2}}, ErrSplit},
		{"dates out of order", []PricePoint{ok, {Date: d("2024-01-02"), Close: 10}}, ErrOrder},
		{"NaN close", []PricePoint{ok, {Date: d("2024-01-03"), Close: math.NaN()}}, ErrPrice},
		{"one price", []PricePoint{ok}, ErrEmpty},
	}
	for _, c := range cases {
		if _, err := SecurityReturnSeries(c.p); !errors.Is(err, c.want) {
			t.Errorf("%s: %v, want %v", c.name, err, c.want)
		}
	}
	if _, err := TotalReturnIndex([]PricePoint{ok}, 0); !errors.Is(err, ErrNonPositive) {
		t.Errorf("base 0: %v", err)
	}
}
