package store

import (
	"database/sql/driver"
	"time"
)

// Holdings: as_of,portfolio_id,security_id,quantity,price. The rows of a
// file with the same (as_of, portfolio_id) form one snapshot. A snapshot
// identical to the current one is a no-op; a different one is stored as
// the next revision and the current one is marked superseded by it.

type holdingLine struct {
	security any // boxed id; nil for cash
	quantity float64
	price    float64
	line     int
}

type snapKey struct{ asOf, portfolio string }

type snapGroup struct {
	key   snapKey
	asOf  time.Time
	lines []holdingLine
	seen  map[string]int // security id (or CASH) -> line
}

type holdingLoader struct {
	groups map[snapKey]*snapGroup
	order  []*snapGroup
}

func newHoldingLoader() loader { return &holdingLoader{groups: map[snapKey]*snapGroup{}} }

func (l *holdingLoader) row(lc *loadCtx, r *row) error {
	asOf, _ := r.date(0)
	pf, err := knownPortfolio(lc, r, 1)
	if err != nil {
		return err
	}
	cash := string(r.f[2]) == cashID
	var sec any
	if !cash {
		if sec, err = knownSecurity(lc, r, 2); err != nil {
			return err
		}
	}
	qty, okQty := r.num(3)
	price, okPrice := r.num(4)
	if cash {
		if okPrice && price != 1 {
			r.fail(4, "must be 1 on the CASH line, whose quantity is the cash amount")
		}
	} else {
		if okQty && !(qty >= 0) {
			r.fail(3, "must be >= 0 shares; only the CASH line may be negative")
		}
		if okPrice && !(price > 0) {
			r.fail(4, "must be > 0")
		}
	}
	if !r.ok {
		return nil
	}
	key := snapKey{asOf: string(r.f[0]), portfolio: pf.(string)}
	g := l.groups[key]
	if g == nil {
		g = &snapGroup{key: key, asOf: asOf, seen: map[string]int{}}
		l.groups[key] = g
		l.order = append(l.order, g)
	}
	id := cashID
	if !cash {
		id = sec.(string)
	}
	if first, dup := g.seen[id]; dup {
		r.failf(2, "appears twice in the snapshot of %s on %s (first on line %d)", key.portfolio, key.asOf, first)
		return nil
	}
	g.seen[id] = r.line
	g.lines = append(g.lines, holdingLine{security: sec, quantity: qty, price: price, line: r.line})
	return nil
}

func (l *holdingLoader) finish(lc *loadCtx) error {
	if len(lc.errs.errs) > 0 {
		return nil // the file is rejected; nothing to write
	}
	for _, g := range l.order {
		if err := l.store(lc, g); err != nil {
			return err
		}
	}
	return nil
}

func (l *holdingLoader) store(lc *loadCtx, g *snapGroup) error {
	c := lc.c
	rev := SnapshotRevision{Portfolio: g.key.portfolio, AsOf: g.asOf}
	cur := make([]driver.Value, 2)
	found, err := c.queryRow(`SELECT id, revision FROM holding_snapshots
WHERE portfolio_id = ? AND as_of = ? AND superseded_by IS NULL`, []any{g.key.portfolio, g.key.asOf}, cur)
	if err != nil {
		return err
	}
	curID := asInt(cur[0])
	if found {
		same, err := l.sameAsStored(c, curID, g)
		if err != nil {
			return err
		}
		if same {
			rev.Revision = int(asInt(cur[1]))
			rev.Unchanged = true
			lc.unchanged += len(g.lines)
			lc.snapshots = append(lc.snapshots, rev)
			return nil
		}
		rev.Supersedes = int(asInt(cur[1]))
	}
	next := make([]driver.Value, 2)
	if _, err := c.queryRow(`SELECT (SELECT ifnull(max(id), 0) + 1 FROM holding_snapshots),
       (SELECT ifnull(max(revision), 0) + 1 FROM holding_snapshots WHERE portfolio_id = ? AND as_of = ?)`,
		[]any{g.key.portfolio, g.key.asOf}, next); err != nil {
		return err
	}
	newID := asInt(next[0])
	rev.Revision = int(asInt(next[1]))
	if found {
		// The foreign key on superseded_by is deferred to the commit, so
		// the old snapshot can point at the new one before it exists.
		if _, err := c.exec(`UPDATE holding_snapshots SET superseded_by = ? WHERE id = ?`, newID, curID); err != nil {
			return err
		}
	}
	if _, err := c.exec(`INSERT INTO holding_snapshots (id, portfolio_id, as_of, revision, source_file_id) VALUES (?, ?, ?, ?, ?)`,
		newID, g.key.portfolio, g.key.asOf, rev.Revision, lc.fileID); err != nil {
		return err
	}
	for _, hl := range g.lines {
		if _, err := c.exec(`INSERT INTO holding_lines (snapshot_id, security_id, quantity, price, source_line) VALUES (?, ?, ?, ?, ?)`,
			newID, hl.security, hl.quantity, hl.price, hl.line); err != nil {
			return err
		}
	}
	lc.snapshots = append(lc.snapshots, rev)
	return nil
}

// sameAsStored reports whether snapshot id has exactly g's lines.
func (l *holdingLoader) sameAsStored(c *rawConn, id int64, g *snapGroup) (bool, error) {
	type qp struct{ q, p float64 }
	want := make(map[string]qp, len(g.lines))
	for _, hl := range g.lines {
		k := cashID
		if hl.security != nil {
			k = hl.security.(string)
		}
		want[k] = qp{hl.quantity, hl.price}
	}
	n, same := 0, true
	err := c.query(`SELECT ifnull(security_id, 'CASH'), quantity, price FROM holding_lines WHERE snapshot_id = ?`,
		[]any{id}, 3, func(d []driver.Value) error {
			n++
			w, ok := want[asString(d[0])]
			q, _ := d[1].(float64)
			p, _ := d[2].(float64)
			if !ok || w.q != q || w.p != p {
				same = false
			}
			return nil
		})
	return same && n == len(want), err
}
