package main

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"time"
)

// packSize is one run of the packs benchmark: portfolios x holdings per
// portfolio x years of daily prices.
type packSize struct {
	Portfolios int `json:"portfolios"`
	Holdings   int `json:"holdings"`
	Years      int `json:"years"`
}

func (s packSize) String() string { return fmt.Sprintf("%dx%dx%d", s.Portfolios, s.Holdings, s.Years) }

func parsePackSize(v string) (packSize, error) {
	var s packSize
	if n, err := fmt.Sscanf(v, "%dx%dx%d", &s.Portfolios, &s.Holdings, &s.Years); err != nil || n != 3 || s.String() != v {
		return s, fmt.Errorf("size %q: want PORTFOLIOSxHOLDINGSxYEARS, e.g. 100x200x10", v)
	}
	if s.Portfolios < 1 || s.Holdings < 1 || s.Years < 1 {
		return s, fmt.Errorf("size %q: every dimension must be positive", v)
	}
	return s, nil
}

// universe is the number of securities in the store for holdings h: each
// portfolio holds h of them, and the benchmark is built from all.
func universe(h, perHolding int) int { return h * perHolding }

// dataStats counts what writePackData wrote.
type dataStats struct {
	Securities   int `json:"securities"`
	Days         int `json:"days"`
	PriceRows    int `json:"price_rows"`
	HoldingRows  int `json:"holding_rows"`
	Snapshots    int `json:"snapshots_per_portfolio"`
	TotalRows    int `json:"total_rows"`
	FileMegabyte int `json:"file_mb"`
}

// The synthetic market ends on a fixed Friday so that every run of a size
// writes the same bytes.
var packDataEnd = time.Date(2025, 6, 27, 0, 0, 0, 0, time.UTC)

// writePackData writes the input files of one size into dir: fictional
// securities SYN0001... and portfolios SYNP001..., 252 weekdays of prices
// per year (a random walk with quarterly dividends and a 2-for-1 split in
// every seventh security), daily yield curves and premiums, one
// assumptions row per security (some with a beta, some without, some with
// stages), a holdings snapshot per portfolio every 63 trading days and on
// the last day, and a monthly external flow per portfolio.
func writePackData(dir string, s packSize, perHolding int) (dataStats, error) {
	nSec := universe(s.Holdings, perHolding)
	nDays := 252 * s.Years
	days := make([]time.Time, nDays)
	d := packDataEnd
	for i := nDays - 1; i >= 0; d = d.AddDate(0, 0, -1) {
		if wd := d.Weekday(); wd != time.Saturday && wd != time.Sunday {
			days[i] = d
			i--
		}
	}
	dates := make([]string, nDays)
	for i, d := range days {
		dates[i] = d.Format(time.DateOnly)
	}
	st := dataStats{Securities: nSec, Days: nDays}
	rng := xorshift(0x9E3779B97F4A7C15)
	ids := make([]string, nSec)
	for i := range ids {
		ids[i] = fmt.Sprintf("SYN%04d", i+1)
	}

	// Closes are kept for the holdings' prices: nSec x nDays floats.
	closes := make([][]float64, nSec)
	sectors := []string{"Utilities", "Consumer Staples", "Industrials", "Health Care", "Financials", "Energy", "Materials"}
	err := writeRows(dir, "securities.csv", "security_id,security_name,sector,currency,shares_outstanding", &st, func(w *rowWriter) {
		for i, id := range ids {
			w.line("%s,Synthetic Holdings %d,%s,USD,%d", id, i+1, sectors[i%len(sectors)], 5000000+7919*i)
		}
	})
	if err != nil {
		return st, err
	}
	err = writeRows(dir, "prices.csv", "date,security_id,close,dividend,split_ratio", &st, func(w *rowWriter) {
		px := make([]float64, nSec)
		splitAt := make([]int, nSec)
		for i := range px {
			px[i] = 20 + 80*rng.float()
			closes[i] = make([]float64, nDays)
			splitAt[i] = -1
			if i%7 == 3 {
				splitAt[i] = nDays/3 + int(rng.float()*float64(nDays/3))
			}
		}
		for t, day := range dates {
			for i, id := range ids {
				px[i] *= math.Exp(0.0002 + 0.015*rng.norm())
				split := "1"
				if t == splitAt[i] {
					px[i] /= 2
					split = "2"
				}
				div := "0"
				if t%63 == (i*11)%63 {
					div = strconv.FormatFloat(px[i]*0.008, 'f', 4, 64)
				}
				// Round as written, so holdings carry the close as stored.
				px[i], _ = strconv.ParseFloat(strconv.FormatFloat(px[i], 'f', 4, 64), 64)
				closes[i][t] = px[i]
				w.b = append(w.b, day...)
				w.b = append(w.b, ',')
				w.b = append(w.b, id...)
				w.b = append(w.b, ',')
				w.b = strconv.AppendFloat(w.b, px[i], 'f', 4, 64)
				w.b = append(w.b, ',')
				w.b = append(w.b, div...)
				w.b = append(w.b, ',')
				w.b = append(w.b, split...)
				w.end()
				st.PriceRows++
			}
		}
	})
	if err != nil {
		return st, err
	}
	err = writeRows(dir, "assumptions.csv", "security_id,effective_date,annual_dividend,frequency,growth,beta,discount_rate,stages", &st, func(w *rowWriter) {
		for i, id := range ids {
			d0 := closes[i][0] * 0.032
			g := 0.01 + 0.03*rng.float()
			beta, stages := strconv.FormatFloat(0.6+0.8*rng.float(), 'f', 3, 64), ""
			switch i % 4 {
			case 1:
				stages = "3:0.08;2:0.06"
			case 2:
				beta = "" // estimated from returns
			}
			w.line("%s,%s,%.4f,4,%.4f,%s,,%s", id, dates[0], d0, g, beta, stages)
		}
	})
	if err != nil {
		return st, err
	}
	err = writeRows(dir, "yields.csv", "date,tenor_months,yield", &st, func(w *rowWriter) {
		for t, day := range dates {
			for _, tn := range []int{3, 12, 24, 60, 120, 360} {
				y := 0.03 + 0.01*(1-math.Exp(-float64(tn)/30)) + 0.005*math.Sin(float64(t)/50) + 0.0005*rng.norm()
				w.line("%s,%d,%.5f", day, tn, y)
			}
		}
	})
	if err != nil {
		return st, err
	}
	err = writeRows(dir, "premiums.csv", "date,equity_risk_premium", &st, func(w *rowWriter) {
		for _, day := range dates {
			w.line("%s,0.05", day)
		}
	})
	if err != nil {
		return st, err
	}
	methods := []string{"value", "price", "equal", "equal_geometric"}
	err = writeRows(dir, "portfolios.csv", "portfolio_id,portfolio_name,strategy,inception_date,benchmark_method", &st, func(w *rowWriter) {
		for p := range s.Portfolios {
			w.line("SYNP%03d,Synthetic Portfolio %d,Synthetic dividend equity,%s,%s", p+1, p+1, dates[0], methods[p%len(methods)])
		}
	})
	if err != nil {
		return st, err
	}
	var snapDays []int
	for t := 0; t < nDays-1; t += 63 {
		snapDays = append(snapDays, t)
	}
	snapDays = append(snapDays, nDays-1)
	st.Snapshots = len(snapDays)
	err = writeRows(dir, "holdings.csv", "as_of,portfolio_id,security_id,quantity,price", &st, func(w *rowWriter) {
		for p := range s.Portfolios {
			off := (p * 37) % nSec
			for q, t := range snapDays {
				for j := range s.Holdings {
					i := (off + j) % nSec
					target := 1e6 * (0.5 + float64((j*13+q*7+p)%10)/10)
					w.line("%s,SYNP%03d,%s,%.0f,%.4f", dates[t], p+1, ids[i], math.Max(1, math.Round(target/closes[i][t])), closes[i][t])
				}
				w.line("%s,SYNP%03d,CASH,%.2f,1", dates[t], p+1, 2e6+1e4*float64(q))
				st.HoldingRows += s.Holdings + 1
			}
		}
	})
	if err != nil {
		return st, err
	}
	err = writeRows(dir, "flows.csv", "date,portfolio_id,amount", &st, func(w *rowWriter) {
		for p := range s.Portfolios {
			for t := 21; t < nDays; t += 21 {
				a := 5e4 * (rng.float() - 0.4)
				if a == 0 {
					a = 1
				}
				w.line("%s,SYNP%03d,%.2f", dates[t], p+1, a)
			}
		}
	})
	if err != nil {
		return st, err
	}
	var size int64
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if fi, err := e.Info(); err == nil {
			size += fi.Size()
		}
	}
	st.FileMegabyte = int(size >> 20)
	return st, nil
}

// rowWriter buffers one CSV file's lines.
type rowWriter struct {
	w    *bufio.Writer
	b    []byte
	rows int
}

func (w *rowWriter) line(format string, a ...any) {
	w.b = fmt.Appendf(w.b, format, a...)
	w.end()
}

func (w *rowWriter) end() {
	w.b = append(w.b, '\n')
	w.w.Write(w.b)
	w.b = w.b[:0]
	w.rows++
}

func writeRows(dir, name, header string, st *dataStats, fill func(*rowWriter)) error {
	f, err := os.Create(filepath.Join(dir, name))
	if err != nil {
		return err
	}
	w := &rowWriter{w: bufio.NewWriterSize(f, 1<<20)}
	w.w.WriteString(header + "\n")
	fill(w)
	st.TotalRows += w.rows
	if err := w.w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// xorshift is a deterministic xorshift64* generator.
type xorshift uint64

func (x *xorshift) float() float64 { // uniform in [0, 1)
	s := uint64(*x)
	s ^= s >> 12
	s ^= s << 25
	s ^= s >> 27
	*x = xorshift(s)
	return float64((s*2685821657736338717)>>11) / (1 << 53)
}

// norm is a standard normal draw (Box-Muller).
func (x *xorshift) norm() float64 {
	u := x.float()
	for u == 0 {
		u = x.float()
	}
	return math.Sqrt(-2*math.Log(u)) * math.Cos(2*math.Pi*x.float())
}
