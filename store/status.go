package store

import (
	"context"
	"database/sql"
	"fmt"
	"time"
)

// OutboxStats summarises the mail not yet delivered.
type OutboxStats struct {
	Pending int `json:"pending"` // unsent messages
	Due     int `json:"due"`     // unsent and due now
	Failing int `json:"failing"` // unsent after at least one failed attempt
	// OldestPending is when the oldest unsent message was enqueued; zero
	// when none is pending.
	OldestPending time.Time `json:"oldest_pending,omitzero"`
	LastError     string    `json:"last_error,omitempty"`
}

// OutboxStats counts unsent messages at now.
func (db *DB) OutboxStats(ctx context.Context, now time.Time) (OutboxStats, error) {
	var (
		st     OutboxStats
		oldest sql.NullString
	)
	n := daemonStamp(now)
	err := db.sql.QueryRowContext(ctx, `
		SELECT COUNT(*),
		       COALESCE(SUM(next_attempt_at <= ?), 0),
		       COALESCE(SUM(last_error <> ''), 0),
		       MIN(created_at)
		FROM outbox WHERE sent_at IS NULL`, n).Scan(&st.Pending, &st.Due, &st.Failing, &oldest)
	if err != nil {
		return st, daemonErr("outbox stats", err)
	}
	if oldest.Valid {
		if st.OldestPending, err = parseDaemonStamp(oldest.String); err != nil {
			return st, err
		}
	}
	err = db.sql.QueryRowContext(ctx, `
		SELECT last_error FROM outbox WHERE sent_at IS NULL AND last_error <> ''
		ORDER BY id DESC LIMIT 1`).Scan(&st.LastError)
	if err != nil && err != sql.ErrNoRows {
		return st, daemonErr("outbox stats", err)
	}
	return st, nil
}

// PortfolioRun is the latest run of one portfolio.
type PortfolioRun struct {
	PortfolioID string `json:"portfolio_id"`
	RunID       int64  `json:"run_id"`
	AsOf        string `json:"as_of"`
	CreatedAt   string `json:"created_at"`
	Revision    int    `json:"revision"`
	Current     bool   `json:"current"` // not superseded
}

// LatestRuns returns, per portfolio, the run with the latest as-of date
// (its highest id on that date), ordered by portfolio id.
func (db *DB) LatestRuns(ctx context.Context) ([]PortfolioRun, error) {
	rows, err := db.sql.QueryContext(ctx, `
		SELECT r.portfolio_id, r.id, r.as_of, r.created_at, r.revision,
		       NOT EXISTS (SELECT 1 FROM runs n WHERE n.supersedes = r.id)
		FROM runs r
		WHERE r.id = (SELECT r2.id FROM runs r2 WHERE r2.portfolio_id = r.portfolio_id
		              ORDER BY r2.as_of DESC, r2.id DESC LIMIT 1)
		ORDER BY r.portfolio_id`)
	if err != nil {
		return nil, fmt.Errorf("store: latest runs: %w", err)
	}
	defer rows.Close()
	var out []PortfolioRun
	for rows.Next() {
		var r PortfolioRun
		if err := rows.Scan(&r.PortfolioID, &r.RunID, &r.AsOf, &r.CreatedAt, &r.Revision, &r.Current); err != nil {
			return nil, fmt.Errorf("store: latest runs: %w", err)
		}
		out = append(out, r)
	}
	return out, rows.Err()
}
