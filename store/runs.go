package store

import (
	"context"
	"crypto/sha256"
	"database/sql"
	"encoding/hex"
	"errors"
	"fmt"
	"sort"
	"time"
)

// ErrReasonRequired is returned when a run would supersede an earlier run
// of the same portfolio and date without saying why.
var ErrReasonRequired = errors.New("a re-run of an as-of date needs a reason")

// NewRun is what the pipeline hands over to persist a run.
type NewRun struct {
	PortfolioID    string
	AsOf           time.Time
	CreatedAt      time.Time
	Reason         string // required, and stored, only when a current run of the date exists
	ProgramVersion string
	ConfigJSON     []byte
	ConfigHash     string
	InputHash      string
	LedgerMark     int64
	ResultsSchema  string
	ResultsJSON    []byte
	Metrics        []MetricRow
	// Headline is the run's headline metrics: what later runs of the
	// portfolio measure their drift against.
	Headline map[string]float64
}

// MetricRow is one long-form metric of a run.
type MetricRow struct {
	Scope  string  `json:"scope"`
	Key    string  `json:"key"`
	Metric string  `json:"metric"`
	Value  float64 `json:"value"`
}

// Run is a persisted run.
type Run struct {
	ID             int64     `json:"id"`
	PortfolioID    string    `json:"portfolio_id"`
	AsOf           time.Time `json:"as_of"`
	Revision       int       `json:"revision"`
	Supersedes     int64     `json:"supersedes,omitempty"`
	SupersededBy   int64     `json:"superseded_by,omitempty"`
	Reason         string    `json:"reason,omitempty"`
	CreatedAt      time.Time `json:"created_at"`
	ProgramVersion string    `json:"program_version"`
	ConfigHash     string    `json:"config_hash"`
	InputHash      string    `json:"input_hash"`
	LedgerMark     int64     `json:"ledger_mark"`
	ResultsSchema  string    `json:"results_schema"`
	ResultsHash    string    `json:"results_hash"`
	PDFSHA256      string    `json:"pdf_sha256,omitempty"`
	ConfigJSON     []byte    `json:"-"`
	ResultsJSON    []byte    `json:"-"`
}

// Completion is what finishes a run inside its transaction: its PDF
// (rendered from the stored results) and the messages to mail.
type Completion struct {
	PDF    []byte
	Pages  int
	Outbox []OutboxMessage
}

// SaveRun persists a run, its metrics, and whatever complete returns (PDF,
// outbox messages) in one transaction: either all of it is stored or none.
// complete receives the run as stored (results read back from the
// database) and may be nil.
func (db *DB) SaveRun(ctx context.Context, nr NewRun, complete func(*Run) (*Completion, error)) (*Run, error) {
	tx, err := db.sql.BeginTx(ctx, nil)
	if err != nil {
		return nil, fmt.Errorf("store: save run: %w", err)
	}
	defer tx.Rollback()
	asOf := nr.AsOf.Format(time.DateOnly)
	var prevID sql.NullInt64
	var prevRev sql.NullInt64
	err = tx.QueryRowContext(ctx, `SELECT id, revision FROM current_runs WHERE portfolio_id = ? AND as_of = ?
		ORDER BY revision DESC LIMIT 1`, nr.PortfolioID, asOf).Scan(&prevID, &prevRev)
	if err != nil && !errors.Is(err, sql.ErrNoRows) {
		return nil, fmt.Errorf("store: save run: %w", err)
	}
	rev := 1
	var supersedes any
	var reason any
	if prevID.Valid {
		if nr.Reason == "" {
			return nil, fmt.Errorf("store: save run %s %s: run %d exists: %w", nr.PortfolioID, asOf, prevID.Int64, ErrReasonRequired)
		}
		rev = int(prevRev.Int64) + 1
		supersedes = prevID.Int64
		reason = nr.Reason
	}
	res, err := tx.ExecContext(ctx, `INSERT INTO runs (portfolio_id, as_of, revision, supersedes, reason,
		created_at, program_version, config_json, config_hash, input_hash, ledger_mark,
		results_schema, results_json, results_hash) VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?)`,
		nr.PortfolioID, asOf, rev, supersedes, reason, nr.CreatedAt.UTC().Format(time.RFC3339Nano),
		nr.ProgramVersion, string(nr.ConfigJSON), nr.ConfigHash, nr.InputHash, nr.LedgerMark,
		nr.ResultsSchema, string(nr.ResultsJSON), sha256Hex(nr.ResultsJSON))
	if err != nil {
		return nil, fmt.Errorf("store: save run %s %s: %w", nr.PortfolioID, asOf, err)
	}
	id, err := res.LastInsertId()
	if err != nil {
		return nil, err
	}
	stmt, err := tx.PrepareContext(ctx, `INSERT INTO run_metrics (run_id, scope, key, metric, value) VALUES (?,?,?,?,?)`)
	if err != nil {
		return nil, err
	}
	defer stmt.Close()
	for _, m := range nr.Metrics {
		if _, err := stmt.ExecContext(ctx, id, m.Scope, m.Key, m.Metric, m.Value); err != nil {
			return nil, fmt.Errorf("store: save run %d: metric %s/%s/%s: %w", id, m.Scope, m.Key, m.Metric, err)
		}
	}
	for _, name := range sortedKeys(nr.Headline) {
		if _, err := tx.ExecContext(ctx, `INSERT INTO run_headlines (run_id, metric, value) VALUES (?,?,?)`,
			id, name, nr.Headline[name]); err != nil {
			return nil, fmt.Errorf("store: save run %d: headline %s: %w", id, name, err)
		}
	}
	run, err := getRun(ctx, tx, id)
	if err != nil {
		return nil, err
	}
	if complete != nil {
		c, err := complete(run)
		if err != nil {
			return nil, fmt.Errorf("store: complete run %d: %w", id, err)
		}
		if c != nil && c.PDF != nil {
			run.PDFSHA256 = sha256Hex(c.PDF)
			if _, err := tx.ExecContext(ctx, `INSERT INTO run_pdfs (run_id, sha256, pdf, pages) VALUES (?,?,?,?)`,
				id, run.PDFSHA256, c.PDF, c.Pages); err != nil {
				return nil, fmt.Errorf("store: save PDF of run %d: %w", id, err)
			}
		}
		if c != nil {
			for _, m := range c.Outbox {
				m.RunID = id
				if m.AttachmentSHA256 == "" {
					m.AttachmentSHA256 = run.PDFSHA256
				}
				if _, err := enqueue(ctx, tx, m); err != nil {
					return nil, fmt.Errorf("store: queue mail of run %d: %w", id, err)
				}
			}
		}
	}
	if err := tx.Commit(); err != nil {
		return nil, fmt.Errorf("store: save run %d: %w", id, err)
	}
	return run, nil
}

// AttachPDF stores the PDF of a run that has none yet (a run saved
// without rendering). A run's PDF, once stored, never changes.
func (db *DB) AttachPDF(ctx context.Context, runID int64, pdf []byte, pages int) (string, error) {
	sum := sha256Hex(pdf)
	if _, err := db.sql.ExecContext(ctx, `INSERT INTO run_pdfs (run_id, sha256, pdf, pages) VALUES (?,?,?,?)`,
		runID, sum, pdf, pages); err != nil {
		return "", fmt.Errorf("store: attach PDF to run %d: %w", runID, err)
	}
	return sum, nil
}

const runCols = `r.id, r.portfolio_id, r.as_of, r.revision, ifnull(r.supersedes, 0),
	ifnull((SELECT n.id FROM runs n WHERE n.supersedes = r.id), 0), ifnull(r.reason, ''),
	r.created_at, r.program_version, r.config_hash, r.input_hash, r.ledger_mark,
	r.results_schema, r.results_hash, ifnull((SELECT p.sha256 FROM run_pdfs p WHERE p.run_id = r.id), '')`

type rowScanner interface{ Scan(...any) error }

func scanRun(s rowScanner) (*Run, error) {
	var r Run
	var asOf, created string
	if err := s.Scan(&r.ID, &r.PortfolioID, &asOf, &r.Revision, &r.Supersedes, &r.SupersededBy, &r.Reason,
		&created, &r.ProgramVersion, &r.ConfigHash, &r.InputHash, &r.LedgerMark,
		&r.ResultsSchema, &r.ResultsHash, &r.PDFSHA256); err != nil {
		return nil, err
	}
	var err error
	if r.AsOf, err = time.Parse(time.DateOnly, asOf); err != nil {
		return nil, err
	}
	if r.CreatedAt, err = time.Parse(time.RFC3339Nano, created); err != nil {
		return nil, err
	}
	return &r, nil
}

type querier interface {
	QueryRowContext(ctx context.Context, q string, args ...any) *sql.Row
}

func getRun(ctx context.Context, q querier, id int64) (*Run, error) {
	r, err := scanRun(q.QueryRowContext(ctx, `SELECT `+runCols+` FROM runs r WHERE r.id = ?`, id))
	if errors.Is(err, sql.ErrNoRows) {
		return nil, fmt.Errorf("store: run %d: %w", id, ErrNotFound)
	}
	if err != nil {
		return nil, fmt.Errorf("store: run %d: %w", id, err)
	}
	var cfg, results string
	if err := q.QueryRowContext(ctx, `SELECT config_json, results_json FROM runs WHERE id = ?`, id).Scan(&cfg, &results); err != nil {
		return nil, fmt.Errorf("store: run %d: %w", id, err)
	}
	r.ConfigJSON, r.ResultsJSON = []byte(cfg), []byte(results)
	return r, nil
}

// GetRun returns a run with its stored configuration and results.
func (db *DB) GetRun(ctx context.Context, id int64) (*Run, error) {
	return getRun(ctx, db.sql, id)
}

// RunFilter selects runs; zero fields select everything.
type RunFilter struct {
	Portfolio   string
	From, To    time.Time
	CurrentOnly bool
}

// Runs lists runs (without their JSON) by portfolio, as-of date, revision.
func (db *DB) Runs(ctx context.Context, f RunFilter) ([]*Run, error) {
	q := `SELECT ` + runCols + ` FROM runs r WHERE (? = '' OR r.portfolio_id = ?) AND r.as_of BETWEEN ? AND ?`
	if f.CurrentOnly {
		q += ` AND NOT EXISTS (SELECT 1 FROM runs n WHERE n.supersedes = r.id)`
	}
	q += ` ORDER BY r.portfolio_id, r.as_of, r.revision`
	rows, err := db.sql.QueryContext(ctx, q, f.Portfolio, f.Portfolio, lowDate(f.From), highDate(f.To))
	if err != nil {
		return nil, fmt.Errorf("store: runs: %w", err)
	}
	defer rows.Close()
	var out []*Run
	for rows.Next() {
		r, err := scanRun(rows)
		if err != nil {
			return nil, fmt.Errorf("store: runs: %w", err)
		}
		out = append(out, r)
	}
	return out, rows.Err()
}

// MetricPoint is one value of a metric in one run.
type MetricPoint struct {
	RunID       int64     `json:"run_id"`
	PortfolioID string    `json:"portfolio_id"`
	AsOf        time.Time `json:"as_of"`
	Scope       string    `json:"scope"`
	Key         string    `json:"key"`
	Value       float64   `json:"value"`
}

// MetricHistory returns a metric across current runs, by portfolio and
// date. scope "" means portfolio scope.
func (db *DB) MetricHistory(ctx context.Context, metric, scope, key, portfolio string, from, to time.Time) ([]MetricPoint, error) {
	if scope == "" {
		scope = "portfolio"
	}
	rows, err := db.sql.QueryContext(ctx, `SELECT r.id, r.portfolio_id, r.as_of, m.scope, m.key, m.value
		FROM current_runs r JOIN run_metrics m ON m.run_id = r.id
		WHERE m.metric = ? AND m.scope = ? AND (? = '' OR m.key = ?) AND (? = '' OR r.portfolio_id = ?)
		  AND r.as_of BETWEEN ? AND ?
		ORDER BY r.portfolio_id, r.as_of, m.key`, metric, scope, key, key, portfolio, portfolio, lowDate(from), highDate(to))
	if err != nil {
		return nil, fmt.Errorf("store: history of %s: %w", metric, err)
	}
	defer rows.Close()
	var out []MetricPoint
	for rows.Next() {
		var p MetricPoint
		var asOf string
		if err := rows.Scan(&p.RunID, &p.PortfolioID, &asOf, &p.Scope, &p.Key, &p.Value); err != nil {
			return nil, err
		}
		if p.AsOf, err = time.Parse(time.DateOnly, asOf); err != nil {
			return nil, err
		}
		out = append(out, p)
	}
	return out, rows.Err()
}

// MetricNames lists the distinct metric names stored at a scope.
func (db *DB) MetricNames(ctx context.Context, scope string) ([]string, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT DISTINCT metric FROM run_metrics WHERE scope = ? ORDER BY metric`, scope)
	if err != nil {
		return nil, fmt.Errorf("store: metric names: %w", err)
	}
	defer rows.Close()
	var out []string
	for rows.Next() {
		var s string
		if err := rows.Scan(&s); err != nil {
			return nil, err
		}
		out = append(out, s)
	}
	return out, rows.Err()
}

// RunMetrics returns a run's long-form metrics in key order.
func (db *DB) RunMetrics(ctx context.Context, runID int64) ([]MetricRow, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT scope, key, metric, value FROM run_metrics WHERE run_id = ?
		ORDER BY scope, key, metric`, runID)
	if err != nil {
		return nil, fmt.Errorf("store: metrics of run %d: %w", runID, err)
	}
	defer rows.Close()
	var out []MetricRow
	for rows.Next() {
		var m MetricRow
		if err := rows.Scan(&m.Scope, &m.Key, &m.Metric, &m.Value); err != nil {
			return nil, err
		}
		out = append(out, m)
	}
	return out, rows.Err()
}

// Headline is one earlier run's headline metrics.
type Headline struct {
	RunID   int64
	AsOf    time.Time
	Metrics map[string]float64
}

// PriorHeadlines returns the headline metrics of a portfolio's runs with
// an as-of date before asOf, one per date, oldest first: for each date the
// run that was current just before run beforeID was made (0: now).
// Bounding by id makes a run's history the same when it is verified later.
func (db *DB) PriorHeadlines(ctx context.Context, portfolio string, asOf time.Time, beforeID int64) ([]Headline, error) {
	rows, err := db.sql.QueryContext(ctx, `SELECT r.id, r.as_of, h.metric, h.value
		FROM runs r JOIN run_headlines h ON h.run_id = r.id
		WHERE r.portfolio_id = ? AND r.as_of < ? AND (? = 0 OR r.id < ?)
		  AND NOT EXISTS (SELECT 1 FROM runs n WHERE n.supersedes = r.id AND (? = 0 OR n.id < ?))
		ORDER BY r.as_of, r.id, h.metric`, portfolio, asOf.Format(time.DateOnly), beforeID, beforeID, beforeID, beforeID)
	if err != nil {
		return nil, fmt.Errorf("store: prior headlines of %s: %w", portfolio, err)
	}
	defer rows.Close()
	var out []Headline
	for rows.Next() {
		var id int64
		var date, metric string
		var v float64
		if err := rows.Scan(&id, &date, &metric, &v); err != nil {
			return nil, fmt.Errorf("store: prior headlines of %s: %w", portfolio, err)
		}
		if n := len(out); n == 0 || out[n-1].RunID != id {
			d, err := time.Parse(time.DateOnly, date)
			if err != nil {
				return nil, fmt.Errorf("store: run %d: as-of %q: %w", id, date, err)
			}
			out = append(out, Headline{RunID: id, AsOf: d, Metrics: map[string]float64{}})
		}
		out[len(out)-1].Metrics[metric] = v
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("store: prior headlines of %s: %w", portfolio, err)
	}
	return out, nil
}

// LedgerMark is the highest ingest ledger id: the inputs visible now
// (on a view from At, no higher than its mark). A run records it, and
// db.At(mark) reads those inputs again later.
func (db *DB) LedgerMark(ctx context.Context) (int64, error) {
	var n sql.NullInt64
	if err := db.sql.QueryRowContext(ctx, `SELECT max(id) FROM ingest_files WHERE id <= ?`, db.visibleTo()).Scan(&n); err != nil {
		return 0, fmt.Errorf("store: ledger mark: %w", err)
	}
	return n.Int64, nil
}

// sha256Hex is the lower-case hex sha256 of b, the form every checksum is
// stored in.
func sha256Hex(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

func sortedKeys(m map[string]float64) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
