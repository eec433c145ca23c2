package store

import (
	"bytes"
	"database/sql/driver"
	"fmt"
	"strconv"
	"strings"
)

// Assumptions: security_id,effective_date,annual_dividend,frequency,growth,
// beta,discount_rate,stages. (security_id, effective_date) is the key; a
// re-ingested assumption must equal the stored one, stages included.

const maxStages = 20

// stage is one step of a multi-stage dividend forecast, "years:growth[:rate]".
type stage struct {
	years  int64
	growth float64
	rate   any // float64, or nil for "the assumption's discount rate"
}

// parseStages parses `years:growth[:rate]` items separated by ';'. rule
// is the reason when it fails.
func parseStages(b []byte) (st []stage, rule string) {
	if len(b) == 0 {
		return nil, ""
	}
	parts := bytes.Split(b, []byte{';'})
	if len(parts) > maxStages {
		return nil, fmt.Sprintf("has %d stages, more than %d", len(parts), maxStages)
	}
	for i, p := range parts {
		n := i + 1
		f := bytes.Split(p, []byte{':'})
		if len(f) < 2 || len(f) > 3 {
			return nil, fmt.Sprintf("stage %d: want years:growth or years:growth:rate", n)
		}
		years, ok := parseCount(f[0])
		if !ok || years < 1 {
			return nil, fmt.Sprintf("stage %d: years must be a whole number > 0", n)
		}
		g, ok := parseDecimal(f[1])
		if !ok || !(g > -1) {
			return nil, fmt.Sprintf("stage %d: growth must be a decimal > -1", n)
		}
		s := stage{years: years, growth: g}
		if len(f) == 3 {
			rate, ok := parseDecimal(f[2])
			if !ok || !(rate > 0) {
				return nil, fmt.Sprintf("stage %d: rate must be a decimal > 0", n)
			}
			s.rate = rate
		}
		st = append(st, s)
	}
	return st, ""
}

func formatStages(st []stage) string {
	var parts []string
	for _, s := range st {
		p := strconv.FormatInt(s.years, 10) + ":" + strconv.FormatFloat(s.growth, 'f', -1, 64)
		if s.rate != nil {
			p += ":" + strconv.FormatFloat(s.rate.(float64), 'f', -1, 64)
		}
		parts = append(parts, p)
	}
	return strings.Join(parts, ";")
}

func sameStages(a, b []stage) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].years != b[i].years || a[i].growth != b[i].growth || !sameValue(a[i].rate, b[i].rate) {
			return false
		}
	}
	return true
}

const (
	insertAssumption = `INSERT INTO assumptions (security_id, effective_date, annual_dividend, frequency, growth, beta, discount_rate, source_file_id, source_line)
VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`
	insertStage    = `INSERT INTO assumption_stages (assumption_id, ordinal, years, growth, rate) VALUES (?, ?, ?, ?, ?)`
	findAssumption = `SELECT a.annual_dividend, a.frequency, a.growth, a.beta, a.discount_rate, a.id, a.source_file_id, a.source_line, f.name
FROM assumptions a JOIN ingest_files f ON f.id = a.source_file_id
WHERE a.security_id = ? AND a.effective_date = ?`
	findStages = `SELECT years, growth, rate FROM assumption_stages WHERE assumption_id = ? ORDER BY ordinal`
)

type assumptionLoader struct{}

func newAssumptionLoader() loader { return assumptionLoader{} }

func (assumptionLoader) row(lc *loadCtx, r *row) error {
	sec, err := knownSecurity(lc, r, 0)
	if err != nil {
		return err
	}
	r.date(1)
	div, ok := r.num(2)
	if ok && !(div >= 0) {
		r.fail(2, "must be >= 0")
	}
	freq, ok := r.count(3)
	if ok && freq != 1 && freq != 2 && freq != 4 && freq != 12 {
		r.fail(3, "must be 1, 2, 4 or 12 payments a year")
	}
	g, ok := r.num(4)
	if ok && !(g > -1 && g < 1) {
		r.fail(4, "must be a decimal > -1 and < 1; 0.03 means 3%")
	}
	var beta, rate any
	if v, present, _ := r.optNum(5); present {
		beta = v
	}
	if v, present, ok := r.optNum(6); present {
		if ok && !(v > 0) {
			r.fail(6, "must be > 0 when given")
		}
		rate = v
	}
	stages, rule := parseStages(r.f[7])
	if rule != "" {
		r.fail(7, rule)
	}
	if !r.ok {
		return nil
	}
	vals := []driver.Value{div, freq, g, beta, rate}

	// Assumption files are small: look the key up first rather than
	// decode a conflict.
	dest := make([]driver.Value, 9)
	found, err := lc.c.queryRow(findAssumption, []any{sec, string(r.f[1])}, dest)
	if err != nil {
		return err
	}
	if found {
		return lc.compareAssumption(r, vals, stages, dest)
	}
	s, err := lc.c.prepare(insertAssumption)
	if err != nil {
		return err
	}
	s.set(sec, string(r.f[1]), div, freq, g, beta, rate, lc.fileID, r.line)
	res, err := s.exec()
	if err != nil {
		return err
	}
	id, err := res.LastInsertId()
	if err != nil {
		return err
	}
	for i, st := range stages {
		if _, err := lc.c.exec(insertStage, id, i+1, st.years, st.growth, st.rate); err != nil {
			return err
		}
	}
	return nil
}

func (lc *loadCtx) compareAssumption(r *row, vals []driver.Value, stages []stage, dest []driver.Value) error {
	id, srcFile, srcLine, srcName := asInt(dest[5]), asInt(dest[6]), asInt(dest[7]), asString(dest[8])
	if srcFile == lc.fileID {
		r.failf(1, "repeats the key (%s, %s) of line %d", r.f[0], r.f[1], srcLine)
		return nil
	}
	same := true
	for i, v := range vals {
		if !sameValue(v, dest[i]) {
			same = false
			r.failf(i+2, "differs from the value %s stored from %s line %d", showValue(dest[i]), srcName, srcLine)
		}
	}
	var stored []stage
	err := lc.c.query(findStages, []any{id}, 3, func(d []driver.Value) error {
		s := stage{years: asInt(d[0]), rate: d[2]}
		s.growth, _ = d[1].(float64)
		stored = append(stored, s)
		return nil
	})
	if err != nil {
		return err
	}
	if !sameStages(stages, stored) {
		same = false
		r.failf(7, "differs from the stages %q stored from %s line %d", formatStages(stored), srcName, srcLine)
	}
	if same {
		lc.unchanged++
	}
	return nil
}

func (assumptionLoader) finish(*loadCtx) error { return nil }
