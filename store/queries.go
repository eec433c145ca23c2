package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"time"
)

// Read API for the pipeline. Dates are time.Time at UTC midnight; a date
// argument means the calendar day of t as written in its location. Ranges
// [from, to] are inclusive; a zero from or to leaves that end open. On a
// view from At, every method below reads only the rows of ledger entries
// up to the view's mark.

// ErrNotFound means the requested rows do not exist.
var ErrNotFound = errors.New("not found")

// Portfolio is one row of a portfolios file.
type Portfolio struct {
	ID              string
	Name            string
	Strategy        string
	Inception       time.Time
	BenchmarkMethod string // value, price, equal or equal_geometric
}

// Security is one row of a securities file.
type Security struct {
	ID                string
	Name              string
	Sector            string
	Currency          string
	SharesOutstanding float64 // shares
}

// Stage is one step of a multi-stage dividend forecast.
type Stage struct {
	Years  int
	Growth float64  // decimal, per year
	Rate   *float64 // discount rate for the stage; nil: the assumption's
}

// Assumption is the valuation assumption of a security from Effective on.
type Assumption struct {
	SecurityID     string
	Effective      time.Time
	AnnualDividend float64 // D0, per share, base currency
	Frequency      int     // payments per year: 1, 2, 4 or 12
	Growth         float64 // long-run growth, decimal
	Beta           *float64
	DiscountRate   *float64 // k; nil: CAPM
	Stages         []Stage
}

// HoldingLine is one position of a snapshot; SecurityID "CASH" is the
// cash line (Quantity = amount, Price = 1).
type HoldingLine struct {
	SecurityID string
	Quantity   float64
	Price      float64
}

// Snapshot is a holdings snapshot of one portfolio on one date.
type Snapshot struct {
	Portfolio  string
	AsOf       time.Time
	Revision   int
	SourceFile string // name of the file it came from
	// SupersededBy is the revision that replaced this one, 0 if current
	// (both as of the view's mark, see At).
	SupersededBy int
	Lines        []HoldingLine
}

// Price is one security's close on one trading day.
type Price struct {
	Date       time.Time
	SecurityID string
	Close      float64 // unadjusted
	Dividend   float64 // per share going ex on Date
	SplitRatio float64 // new shares per old share, 1 on ordinary days
}

// Yield is an annually compounded zero-coupon yield, decimal.
type Yield struct {
	Date        time.Time
	TenorMonths int
	Yield       float64
}

// Premium is the equity risk premium on a date, decimal.
type Premium struct {
	Date              time.Time
	EquityRiskPremium float64
}

// Flow is a net external cash flow of a portfolio at the end of a day.
type Flow struct {
	Date      time.Time
	Portfolio string
	Amount    float64 // + in, - out, base currency
}

// Latest holds the most recent input dates; zero when there is none.
type Latest struct {
	Prices   time.Time
	Holdings map[string]time.Time // portfolio -> latest current snapshot
}

// LedgerEntry is one file offered to Ingest.
type LedgerEntry struct {
	ID         int64
	Name       string
	Path       string
	SHA256     string
	Kind       Kind // empty for a file whose header was not recognised
	Rows       int
	Outcome    Outcome
	Error      string
	IngestedAt time.Time
}

func lowDate(t time.Time) string {
	if t.IsZero() {
		return "0000-01-01"
	}
	return dateString(t)
}

func highDate(t time.Time) string {
	if t.IsZero() {
		return "9999-12-31"
	}
	return dateString(t)
}

// dateCache parses the few distinct dates of a large result once.
type dateCache map[string]time.Time

func (c dateCache) parse(s string) (time.Time, error) {
	if t, ok := c[s]; ok {
		return t, nil
	}
	t, err := dateOf(s)
	if err != nil {
		return t, fmt.Errorf("stored date %q: %w", s, err)
	}
	c[s] = t
	return t, nil
}

func floatPtr(n sql.NullFloat64) *float64 {
	if !n.Valid {
		return nil
	}
	v := n.Float64
	return &v
}

// Portfolios returns every portfolio, by id.
func (db *DB) Portfolios(ctx context.Context) ([]Portfolio, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT portfolio_id, name, strategy, inception_date, benchmark_method
FROM portfolios WHERE source_file_id <= ? ORDER BY portfolio_id`, db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("portfolios: %w", err)
	}
	defer rows.Close()
	var out []Portfolio
	for rows.Next() {
		var p Portfolio
		var inc string
		if err := rows.Scan(&p.ID, &p.Name, &p.Strategy, &inc, &p.BenchmarkMethod); err != nil {
			return nil, fmt.Errorf("portfolios: %w", err)
		}
		if p.Inception, err = dateOf(inc); err != nil {
			return nil, fmt.Errorf("portfolios: %w", err)
		}
		out = append(out, p)
	}
	return out, rows.Err()
}

// Securities returns every security, by id.
func (db *DB) Securities(ctx context.Context) ([]Security, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT security_id, name, sector, currency, shares_outstanding
FROM securities WHERE source_file_id <= ? ORDER BY security_id`, db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("securities: %w", err)
	}
	defer rows.Close()
	var out []Security
	for rows.Next() {
		var s Security
		if err := rows.Scan(&s.ID, &s.Name, &s.Sector, &s.Currency, &s.SharesOutstanding); err != nil {
			return nil, fmt.Errorf("securities: %w", err)
		}
		out = append(out, s)
	}
	return out, rows.Err()
}

// AssumptionsAsOf returns, for each security that has one, the assumption
// in effect on date: the one with the latest effective date <= date.
func (db *DB) AssumptionsAsOf(ctx context.Context, date time.Time) (map[string]Assumption, error) {
	const current = `SELECT a.id FROM assumptions a
WHERE a.source_file_id <= ?2
  AND a.effective_date = (SELECT max(b.effective_date) FROM assumptions b
                          WHERE b.security_id = a.security_id AND b.effective_date <= ?1 AND b.source_file_id <= ?2)`
	d, mark := dateString(date), db.visibleTo()
	rows, err := db.sql.QueryContext(ctx, `SELECT id, security_id, effective_date, annual_dividend, frequency, growth, beta, discount_rate
FROM assumptions WHERE id IN (`+current+`)`, d, mark)
	if err != nil {
		return nil, fmt.Errorf("assumptions: %w", err)
	}
	defer rows.Close()
	out := map[string]Assumption{}
	byID := map[int64]string{}
	for rows.Next() {
		var a Assumption
		var id int64
		var eff string
		var beta, rate sql.NullFloat64
		if err := rows.Scan(&id, &a.SecurityID, &eff, &a.AnnualDividend, &a.Frequency, &a.Growth, &beta, &rate); err != nil {
			return nil, fmt.Errorf("assumptions: %w", err)
		}
		if a.Effective, err = dateOf(eff); err != nil {
			return nil, fmt.Errorf("assumptions: %w", err)
		}
		a.Beta, a.DiscountRate = floatPtr(beta), floatPtr(rate)
		out[a.SecurityID] = a
		byID[id] = a.SecurityID
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("assumptions: %w", err)
	}
	rows.Close()
	srows, err := db.sql.QueryContext(ctx, `SELECT assumption_id, years, growth, rate FROM assumption_stages
WHERE assumption_id IN (`+current+`) ORDER BY assumption_id, ordinal`, d, mark)
	if err != nil {
		return nil, fmt.Errorf("assumption stages: %w", err)
	}
	defer srows.Close()
	for srows.Next() {
		var id int64
		var s Stage
		var rate sql.NullFloat64
		if err := srows.Scan(&id, &s.Years, &s.Growth, &rate); err != nil {
			return nil, fmt.Errorf("assumption stages: %w", err)
		}
		s.Rate = floatPtr(rate)
		sec := byID[id]
		a := out[sec]
		a.Stages = append(a.Stages, s)
		out[sec] = a
	}
	return out, srows.Err()
}

// Snapshot queries take the highest visible source_file_id as ?1. A
// revision is visible once its file is; the current revision of a
// (portfolio, as_of) is the latest visible one, and a revision is
// superseded by the next visible one. Without a mark this is the
// superseded_by chain, since each revision supersedes the one before.
const (
	snapshotCols = `s.id, s.portfolio_id, s.as_of, s.revision, f.name,
ifnull((SELECT min(n.revision) FROM holding_snapshots n WHERE n.portfolio_id = s.portfolio_id AND n.as_of = s.as_of
        AND n.revision > s.revision AND n.source_file_id <= ?1), 0)
FROM holding_snapshots s JOIN ingest_files f ON f.id = s.source_file_id
WHERE s.source_file_id <= ?1`
	snapshotCurrent = `NOT EXISTS (SELECT 1 FROM holding_snapshots n WHERE n.portfolio_id = s.portfolio_id AND n.as_of = s.as_of
        AND n.revision > s.revision AND n.source_file_id <= ?1)`
)

// snapshots runs a query selecting snapshotCols and loads their lines.
func (db *DB) snapshots(ctx context.Context, q string, args ...any) ([]Snapshot, error) {
	rows, err := db.sql.QueryContext(ctx, q, args...)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var out []Snapshot
	var ids []int64
	for rows.Next() {
		var s Snapshot
		var id int64
		var asOf string
		if err := rows.Scan(&id, &s.Portfolio, &asOf, &s.Revision, &s.SourceFile, &s.SupersededBy); err != nil {
			return nil, err
		}
		if s.AsOf, err = dateOf(asOf); err != nil {
			return nil, err
		}
		out = append(out, s)
		ids = append(ids, id)
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	rows.Close()
	for i, id := range ids {
		lines, err := db.sql.QueryContext(ctx, `SELECT ifnull(security_id, 'CASH'), quantity, price
FROM holding_lines WHERE snapshot_id = ? ORDER BY security_id IS NOT NULL, security_id`, id)
		if err != nil {
			return nil, err
		}
		for lines.Next() {
			var l HoldingLine
			if err := lines.Scan(&l.SecurityID, &l.Quantity, &l.Price); err != nil {
				lines.Close()
				return nil, err
			}
			out[i].Lines = append(out[i].Lines, l)
		}
		err = lines.Err()
		lines.Close()
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}

// Holdings returns the current revision of portfolio's latest snapshot on
// or before asOf (its AsOf may be earlier), cash line first, then
// securities by id. It returns ErrNotFound when there is none.
func (db *DB) Holdings(ctx context.Context, portfolio string, asOf time.Time) (Snapshot, error) {
	ss, err := db.snapshots(ctx, `SELECT `+snapshotCols+`
  AND s.portfolio_id = ?2 AND s.as_of <= ?3 AND `+snapshotCurrent+`
ORDER BY s.as_of DESC LIMIT 1`, db.visibleTo(), portfolio, dateString(asOf))
	if err != nil {
		return Snapshot{}, fmt.Errorf("holdings of %s on %s: %w", portfolio, dateString(asOf), err)
	}
	if len(ss) == 0 {
		return Snapshot{}, fmt.Errorf("holdings of %s on or before %s: %w", portfolio, dateString(asOf), ErrNotFound)
	}
	return ss[0], nil
}

// HoldingsSnapshots returns the current snapshots of portfolio dated in
// [from, to], oldest first.
func (db *DB) HoldingsSnapshots(ctx context.Context, portfolio string, from, to time.Time) ([]Snapshot, error) {
	ss, err := db.snapshots(ctx, `SELECT `+snapshotCols+`
  AND s.portfolio_id = ?2 AND s.as_of BETWEEN ?3 AND ?4 AND `+snapshotCurrent+`
ORDER BY s.as_of`, db.visibleTo(), portfolio, lowDate(from), highDate(to))
	if err != nil {
		return nil, fmt.Errorf("holdings snapshots of %s: %w", portfolio, err)
	}
	return ss, nil
}

// HoldingsRevisions returns every revision of portfolio's snapshot dated
// exactly asOf, superseded ones included, oldest first: the audit view.
func (db *DB) HoldingsRevisions(ctx context.Context, portfolio string, asOf time.Time) ([]Snapshot, error) {
	ss, err := db.snapshots(ctx, `SELECT `+snapshotCols+`
  AND s.portfolio_id = ?2 AND s.as_of = ?3 ORDER BY s.revision`, db.visibleTo(), portfolio, dateString(asOf))
	if err != nil {
		return nil, fmt.Errorf("holdings revisions of %s on %s: %w", portfolio, dateString(asOf), err)
	}
	return ss, nil
}

// Prices returns every security's prices dated in [from, to], by date
// then security.
func (db *DB) Prices(ctx context.Context, from, to time.Time) ([]Price, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT date, security_id, close, dividend, split_ratio
FROM prices WHERE date BETWEEN ? AND ? AND source_file_id <= ? ORDER BY date, security_id`, lowDate(from), highDate(to), db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("prices: %w", err)
	}
	defer rows.Close()
	dc := dateCache{}
	var out []Price
	var d string
	for rows.Next() {
		var p Price
		if err := rows.Scan(&d, &p.SecurityID, &p.Close, &p.Dividend, &p.SplitRatio); err != nil {
			return nil, fmt.Errorf("prices: %w", err)
		}
		if p.Date, err = dc.parse(d); err != nil {
			return nil, fmt.Errorf("prices: %w", err)
		}
		out = append(out, p)
	}
	return out, rows.Err()
}

// Yields returns the yields dated in [from, to], by date then tenor.
func (db *DB) Yields(ctx context.Context, from, to time.Time) ([]Yield, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT date, tenor_months, yield
FROM yields WHERE date BETWEEN ? AND ? AND source_file_id <= ? ORDER BY date, tenor_months`, lowDate(from), highDate(to), db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("yields: %w", err)
	}
	defer rows.Close()
	dc := dateCache{}
	var out []Yield
	var d string
	for rows.Next() {
		var y Yield
		if err := rows.Scan(&d, &y.TenorMonths, &y.Yield); err != nil {
			return nil, fmt.Errorf("yields: %w", err)
		}
		if y.Date, err = dc.parse(d); err != nil {
			return nil, fmt.Errorf("yields: %w", err)
		}
		out = append(out, y)
	}
	return out, rows.Err()
}

// Premiums returns the equity risk premiums dated in [from, to], by date.
func (db *DB) Premiums(ctx context.Context, from, to time.Time) ([]Premium, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT date, equity_risk_premium
FROM premiums WHERE date BETWEEN ? AND ? AND source_file_id <= ? ORDER BY date`, lowDate(from), highDate(to), db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("premiums: %w", err)
	}
	defer rows.Close()
	var out []Premium
	var d string
	for rows.Next() {
		var p Premium
		if err := rows.Scan(&d, &p.EquityRiskPremium); err != nil {
			return nil, fmt.Errorf("premiums: %w", err)
		}
		if p.Date, err = dateOf(d); err != nil {
			return nil, fmt.Errorf("premiums: %w", err)
		}
		out = append(out, p)
	}
	return out, rows.Err()
}

// Flows returns portfolio's external flows dated in [from, to], by date.
func (db *DB) Flows(ctx context.Context, portfolio string, from, to time.Time) ([]Flow, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT date, portfolio_id, amount
FROM flows WHERE portfolio_id = ? AND date BETWEEN ? AND ? AND source_file_id <= ? ORDER BY date`, portfolio, lowDate(from), highDate(to), db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("flows of %s: %w", portfolio, err)
	}
	defer rows.Close()
	var out []Flow
	var d string
	for rows.Next() {
		var f Flow
		if err := rows.Scan(&d, &f.Portfolio, &f.Amount); err != nil {
			return nil, fmt.Errorf("flows of %s: %w", portfolio, err)
		}
		if f.Date, err = dateOf(d); err != nil {
			return nil, fmt.Errorf("flows of %s: %w", portfolio, err)
		}
		out = append(out, f)
	}
	return out, rows.Err()
}

// LatestDates returns the latest price date and, per portfolio, the date
// of its latest current holdings snapshot.
func (db *DB) LatestDates(ctx context.Context) (Latest, error) {
	l := Latest{Holdings: map[string]time.Time{}}
	var p sql.NullString
	if err := db.sql.QueryRowContext(ctx, `SELECT max(date) FROM prices WHERE source_file_id <= ?`, db.visibleTo()).Scan(&p); err != nil {
		return l, fmt.Errorf("latest dates: %w", err)
	}
	if p.Valid {
		t, err := dateOf(p.String)
		if err != nil {
			return l, fmt.Errorf("latest dates: %w", err)
		}
		l.Prices = t
	}
	// Every date with a visible revision has a current one at the mark.
	rows, err := db.sql.QueryContext(ctx, `SELECT portfolio_id, max(as_of) FROM holding_snapshots
WHERE source_file_id <= ? GROUP BY portfolio_id`, db.visibleTo())
	if err != nil {
		return l, fmt.Errorf("latest dates: %w", err)
	}
	defer rows.Close()
	for rows.Next() {
		var pf, d string
		if err := rows.Scan(&pf, &d); err != nil {
			return l, fmt.Errorf("latest dates: %w", err)
		}
		t, err := dateOf(d)
		if err != nil {
			return l, fmt.Errorf("latest dates: %w", err)
		}
		l.Holdings[pf] = t
	}
	return l, rows.Err()
}

// Ledger returns every file offered to Ingest, oldest first.
func (db *DB) Ledger(ctx context.Context) ([]LedgerEntry, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT id, name, path, sha256, ifnull(kind, ''), rows, outcome, ifnull(error, ''), ingested_at
FROM ingest_files WHERE id <= ? ORDER BY id`, db.visibleTo())
	if err != nil {
		return nil, fmt.Errorf("ledger: %w", err)
	}
	defer rows.Close()
	var out []LedgerEntry
	for rows.Next() {
		var e LedgerEntry
		var kind, outcome, at string
		if err := rows.Scan(&e.ID, &e.Name, &e.Path, &e.SHA256, &kind, &e.Rows, &outcome, &e.Error, &at); err != nil {
			return nil, fmt.Errorf("ledger: %w", err)
		}
		e.Kind, e.Outcome = Kind(kind), Outcome(outcome)
		if e.IngestedAt, err = time.Parse(time.RFC3339Nano, at); err != nil {
			return nil, fmt.Errorf("ledger: ingested_at %q: %w", at, err)
		}
		out = append(out, e)
	}
	return out, rows.Err()
}
