package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"time"
)

// Job outcomes recorded in job_runs.
const (
	JobOK      = "ok"
	JobError   = "error"
	JobSkipped = "skipped"
)

// JobRecord is one execution of a daemon job.
type JobRecord struct {
	ID           int64     `json:"id"`
	Job          string    `json:"job"`
	ScheduledFor time.Time `json:"scheduled_for,omitzero"` // zero for interval jobs
	StartedAt    time.Time `json:"started_at"`
	EndedAt      time.Time `json:"ended_at,omitzero"` // zero while running
	Outcome      string    `json:"outcome"`           // "" while running
	Error        string    `json:"error,omitempty"`
	Holder       string    `json:"holder"`
}

// daemonStampLayout is the fixed-width UTC text form of the daemon
// tables' times: text order is time order.
const daemonStampLayout = "2006-01-02T15:04:05.000000Z"

func daemonStamp(t time.Time) string { return t.UTC().Format(daemonStampLayout) }

func parseDaemonStamp(s string) (time.Time, error) {
	t, err := time.Parse(daemonStampLayout, s)
	if err != nil {
		return time.Time{}, fmt.Errorf("store: bad time %q: %w", s, err)
	}
	return t, nil
}

func nullStamp(t time.Time) any {
	if t.IsZero() {
		return nil
	}
	return daemonStamp(t)
}

// StartJob records the start of a job execution and returns its id.
// scheduledFor is the schedule time it serves, or zero.
func (db *DB) StartJob(ctx context.Context, job string, scheduledFor time.Time, holder string, now time.Time) (int64, error) {
	res, err := db.sql.ExecContext(ctx,
		`INSERT INTO job_runs(job, scheduled_for, started_at, holder) VALUES (?, ?, ?, ?)`,
		job, nullStamp(scheduledFor), daemonStamp(now), holder)
	if err != nil {
		return 0, fmt.Errorf("store: start job %s: %w", job, err)
	}
	return res.LastInsertId()
}

// StartJobOnce records the start of a job execution for one schedule time
// unless that time is already served: by an execution that succeeded, or
// by one still running that started after staleBefore (an older open one
// belongs to a process that died). When served, it records a skipped
// execution instead and returns started = false with the serving record.
// The check and the insert are one statement, so two daemons on one
// database cannot both start the same schedule time.
func (db *DB) StartJobOnce(ctx context.Context, job string, scheduledFor time.Time, holder string, now, staleBefore time.Time) (id int64, started bool, by *JobRecord, err error) {
	sf := daemonStamp(scheduledFor)
	res, err := db.sql.ExecContext(ctx, `
		INSERT INTO job_runs(job, scheduled_for, started_at, holder)
		SELECT ?, ?, ?, ?
		WHERE NOT EXISTS (
			SELECT 1 FROM job_runs
			WHERE job = ? AND scheduled_for = ?
			  AND (outcome = 'ok' OR (outcome IS NULL AND started_at > ?)))`,
		job, sf, daemonStamp(now), holder, job, sf, daemonStamp(staleBefore))
	if err != nil {
		return 0, false, nil, fmt.Errorf("store: start job %s for %s: %w", job, sf, err)
	}
	if n, _ := res.RowsAffected(); n == 1 {
		id, err := res.LastInsertId()
		return id, true, nil, err
	}
	row := db.sql.QueryRowContext(ctx, `
		SELECT `+jobRecordCols+` FROM job_runs
		WHERE job = ? AND scheduled_for = ? AND (outcome = 'ok' OR outcome IS NULL)
		ORDER BY id DESC LIMIT 1`, job, sf)
	by, err = scanJobRecord(row)
	if err != nil {
		return 0, false, nil, fmt.Errorf("store: job %s for %s: %w", job, sf, err)
	}
	msg := fmt.Sprintf("schedule time already served by job record %d (%s)", by.ID, outcomeOrRunning(by.Outcome))
	res, err = db.sql.ExecContext(ctx, `
		INSERT INTO job_runs(job, scheduled_for, started_at, ended_at, outcome, error, holder)
		VALUES (?, ?, ?, ?, 'skipped', ?, ?)`,
		job, sf, daemonStamp(now), daemonStamp(now), msg, holder)
	if err != nil {
		return 0, false, nil, fmt.Errorf("store: record skipped job %s: %w", job, err)
	}
	id, err = res.LastInsertId()
	return id, false, by, err
}

func outcomeOrRunning(o string) string {
	if o == "" {
		return "running"
	}
	return o
}

// FinishJob records the end of a job execution.
func (db *DB) FinishJob(ctx context.Context, id int64, now time.Time, outcome, errText string) error {
	switch outcome {
	case JobOK, JobError, JobSkipped:
	default:
		return fmt.Errorf("store: finish job %d: unknown outcome %q", id, outcome)
	}
	res, err := db.sql.ExecContext(ctx,
		`UPDATE job_runs SET ended_at = ?, outcome = ?, error = ? WHERE id = ? AND outcome IS NULL`,
		daemonStamp(now), outcome, errText, id)
	if err != nil {
		return fmt.Errorf("store: finish job %d: %w", id, err)
	}
	if n, _ := res.RowsAffected(); n != 1 {
		return fmt.Errorf("store: finish job %d: %w", id, ErrNoJobRecord)
	}
	return nil
}

// ErrNoJobRecord is returned for a job record that does not exist or has
// already ended.
var ErrNoJobRecord = errors.New("no open job record")

const jobRecordCols = `id, job, scheduled_for, started_at, ended_at, outcome, error, holder`

type daemonRow interface{ Scan(...any) error }

func scanJobRecord(r daemonRow) (*JobRecord, error) {
	var (
		rec                   JobRecord
		sched, ended, outcome sql.NullString
		started               string
	)
	if err := r.Scan(&rec.ID, &rec.Job, &sched, &started, &ended, &outcome, &rec.Error, &rec.Holder); err != nil {
		return nil, err
	}
	var err error
	if rec.StartedAt, err = parseDaemonStamp(started); err != nil {
		return nil, err
	}
	if sched.Valid {
		if rec.ScheduledFor, err = parseDaemonStamp(sched.String); err != nil {
			return nil, err
		}
	}
	if ended.Valid {
		if rec.EndedAt, err = parseDaemonStamp(ended.String); err != nil {
			return nil, err
		}
	}
	rec.Outcome = outcome.String
	return &rec, nil
}

// JobRuns returns the latest executions of a job, newest first; job ""
// means every job.
func (db *DB) JobRuns(ctx context.Context, job string, limit int) ([]JobRecord, error) {
	rows, err := db.sql.QueryContext(ctx, `
		SELECT `+jobRecordCols+` FROM job_runs
		WHERE ? = '' OR job = ?
		ORDER BY started_at DESC, id DESC LIMIT ?`, job, job, limit)
	if err != nil {
		return nil, fmt.Errorf("store: job runs: %w", err)
	}
	defer rows.Close()
	var out []JobRecord
	for rows.Next() {
		rec, err := scanJobRecord(rows)
		if err != nil {
			return nil, fmt.Errorf("store: job runs: %w", err)
		}
		out = append(out, *rec)
	}
	return out, rows.Err()
}

// LastServed returns the latest schedule time for which job succeeded.
func (db *DB) LastServed(ctx context.Context, job string) (t time.Time, ok bool, err error) {
	var s sql.NullString
	err = db.sql.QueryRowContext(ctx,
		`SELECT MAX(scheduled_for) FROM job_runs WHERE job = ? AND outcome = 'ok'`, job).Scan(&s)
	if err != nil || !s.Valid {
		return time.Time{}, false, daemonErr("last served "+job, err)
	}
	t, err = parseDaemonStamp(s.String)
	return t, err == nil, err
}

// FirstJobStart returns the start of the earliest recorded execution of any
// job: when a daemon first ran on this database.
func (db *DB) FirstJobStart(ctx context.Context) (t time.Time, ok bool, err error) {
	var s sql.NullString
	err = db.sql.QueryRowContext(ctx, `SELECT MIN(started_at) FROM job_runs`).Scan(&s)
	if err != nil || !s.Valid {
		return time.Time{}, false, daemonErr("first job start", err)
	}
	t, err = parseDaemonStamp(s.String)
	return t, err == nil, err
}

func daemonErr(what string, err error) error {
	if err == nil {
		return nil
	}
	return fmt.Errorf("store: %s: %w", what, err)
}

// Fetch is one file downloaded by an HTTP source.
type Fetch struct {
	Source    string    `json:"source"`
	URL       string    `json:"url"`
	FetchedAt time.Time `json:"fetched_at"`
	File      string    `json:"file"` // saved name; "" when unchanged since the last fetch
	Bytes     int64     `json:"bytes"`
	SHA256    string    `json:"sha256"`
}

// RecordFetch logs a download with its checksum.
func (db *DB) RecordFetch(ctx context.Context, f Fetch) error {
	_, err := db.sql.ExecContext(ctx,
		`INSERT INTO fetches(source, url, fetched_at, file, bytes, sha256) VALUES (?, ?, ?, ?, ?, ?)`,
		f.Source, f.URL, daemonStamp(f.FetchedAt), f.File, f.Bytes, f.SHA256)
	return daemonErr("record fetch "+f.Source, err)
}

// LastFetch returns the latest download of a source, or nil.
func (db *DB) LastFetch(ctx context.Context, source string) (*Fetch, error) {
	var (
		f  Fetch
		at string
	)
	err := db.sql.QueryRowContext(ctx, `
		SELECT source, url, fetched_at, file, bytes, sha256 FROM fetches
		WHERE source = ? ORDER BY fetched_at DESC, id DESC LIMIT 1`, source).
		Scan(&f.Source, &f.URL, &at, &f.File, &f.Bytes, &f.SHA256)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, nil
	}
	if err != nil {
		return nil, daemonErr("last fetch "+source, err)
	}
	if f.FetchedAt, err = parseDaemonStamp(at); err != nil {
		return nil, err
	}
	return &f, nil
}

// PruneIdleJobRuns deletes the records of job's executions that had
// nothing to do (outcome skipped, no text) started before before, so a
// job running every minute does not grow the log without bound. Records
// of work done, failures and skips with a reason are kept.
func (db *DB) PruneIdleJobRuns(ctx context.Context, job string, before time.Time) (int64, error) {
	res, err := db.sql.ExecContext(ctx,
		`DELETE FROM job_runs WHERE job = ? AND outcome = 'skipped' AND error = '' AND started_at < ?`,
		job, daemonStamp(before))
	if err != nil {
		return 0, daemonErr("prune job runs", err)
	}
	return res.RowsAffected()
}
