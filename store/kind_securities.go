package store

// Securities: security_id,security_name,sector,currency,shares_outstanding.

const insertSecurity = `INSERT INTO securities (security_id, name, sector, currency, shares_outstanding, source_file_id, source_line)
VALUES (?, ?, ?, ?, ?, ?, ?)`

var securityTable = keyedTable{
	lookup: `SELECT s.name, s.sector, s.currency, s.shares_outstanding, s.source_file_id, s.source_line, f.name
FROM securities s JOIN ingest_files f ON f.id = s.source_file_id
WHERE s.security_id = ?`,
	key:  []int{0},
	cols: []int{1, 2, 3, 4},
}

type securityLoader struct{}

func newSecurityLoader() loader { return securityLoader{} }

func (securityLoader) row(lc *loadCtx, r *row) error {
	if r.match(0, securityIDRe, securityIDRule) && string(r.f[0]) == cashID {
		r.fail(0, "is reserved for the cash line of holdings")
	}
	name := r.text(1)
	sector := r.text(2)
	if r.match(3, currencyRe, "currency (three capital letters, ISO 4217)") && string(r.f[3]) != lc.opt.BaseCurrency {
		r.failf(3, "is not the base currency %s; FX is not supported yet", lc.opt.BaseCurrency)
	}
	shares, ok := r.num(4)
	if ok && !(shares > 0) {
		r.fail(4, "must be > 0")
	}
	if !r.ok {
		return nil
	}
	s, err := lc.c.prepare(insertSecurity)
	if err != nil {
		return err
	}
	s.set(string(r.f[0]), name, sector, string(r.f[3]), shares, lc.fileID, r.line)
	return lc.put(s, &securityTable, r)
}

func (securityLoader) finish(*loadCtx) error { return nil }
