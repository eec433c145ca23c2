package store

import (
	"context"
	"crypto/sha256"
	"database/sql"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"time"
)

// The outbox holds the e-mails announcing packs. A message is written in
// the transaction that saves its run, so a run is never without its mail
// nor a mail without its run, and a row is never deleted.
//
// Delivery is at least once. A daemon claims a due row with a lease
// (ClaimOutbox), sends it, then records sent_at (MarkSent). If the process
// dies after the server accepted the message but before MarkSent, the
// lease expires and some daemon sends it again. The Message-ID header is
// fixed in the row at the first claim and reused on every attempt, so the
// recipients' mail systems can recognise the duplicate. While a lease is
// valid no other daemon on the same database can claim the row: the claim
// is a single UPDATE guarded by the lease, and SQLite serialises writers.

// OutboxMessage is a mail to enqueue.
type OutboxMessage struct {
	RunID      int64
	Recipients []string
	Subject    string
	TextBody   string
	HTMLBody   string
	// AttachmentName is the PDF's file name, "" for no attachment; then
	// AttachmentSHA256 is the hex sha256 of run_pdfs.pdf of RunID, checked
	// again when the mail is sent.
	AttachmentName   string
	AttachmentSHA256 string
	// CreatedAt is when the message was enqueued; zero means now. It is
	// also its first due time.
	CreatedAt time.Time
}

// OutboxItem is an outbox row.
type OutboxItem struct {
	OutboxMessage
	ID            int64
	MessageID     string // "<...@domain>", "" before the first claim
	Attempts      int    // claims so far, this one included
	NextAttemptAt time.Time
	LastError     string
	SMTPReply     string
	SentAt        time.Time // zero until sent
	ClaimedBy     string
	ClaimedUntil  time.Time
}

// ErrBadOutboxMessage reports a message that cannot be enqueued.
var ErrBadOutboxMessage = errors.New("bad outbox message")

// ErrLeaseLost is returned by MarkFailed when the row is no longer claimed
// by the caller (its lease expired and another daemon took it).
var ErrLeaseLost = errors.New("outbox lease lost")

func (m OutboxMessage) check() error {
	bad := func(format string, a ...any) error {
		return fmt.Errorf("%w: %s", ErrBadOutboxMessage, fmt.Sprintf(format, a...))
	}
	if len(m.Recipients) == 0 {
		return bad("no recipients")
	}
	for _, r := range m.Recipients {
		if strings.TrimSpace(r) == "" || strings.ContainsAny(r, "\r\n") {
			return bad("recipient %q", r)
		}
	}
	if strings.TrimSpace(m.Subject) == "" || strings.ContainsAny(m.Subject, "\r\n") {
		return bad("subject %q", m.Subject)
	}
	if (m.AttachmentName == "") != (m.AttachmentSHA256 == "") {
		return bad("attachment name and sha256 go together")
	}
	if m.AttachmentSHA256 != "" {
		if b, err := hex.DecodeString(m.AttachmentSHA256); err != nil || len(b) != sha256.Size {
			return bad("attachment sha256 %q is not 64 hex digits", m.AttachmentSHA256)
		}
	}
	return nil
}

// Enqueue adds m to the outbox in a transaction of its own.
func (db *DB) Enqueue(ctx context.Context, m OutboxMessage) (int64, error) {
	tx, err := db.sql.BeginTx(ctx, nil)
	if err != nil {
		return 0, daemonErr("enqueue", err)
	}
	defer tx.Rollback()
	id, err := enqueue(ctx, tx, m)
	if err != nil {
		return 0, err
	}
	return id, daemonErr("enqueue", tx.Commit())
}

func enqueue(ctx context.Context, tx *sql.Tx, m OutboxMessage) (int64, error) {
	if err := m.check(); err != nil {
		return 0, fmt.Errorf("store: enqueue for run %d: %w", m.RunID, err)
	}
	if m.CreatedAt.IsZero() {
		m.CreatedAt = time.Now()
	}
	rcpt, err := json.Marshal(m.Recipients)
	if err != nil {
		return 0, err
	}
	var name, sum any
	if m.AttachmentName != "" {
		name, sum = m.AttachmentName, strings.ToLower(m.AttachmentSHA256)
	}
	at := daemonStamp(m.CreatedAt)
	res, err := tx.ExecContext(ctx, `
		INSERT INTO outbox(run_id, recipients, subject, text_body, html_body,
		                   attachment_name, attachment_sha256, created_at, next_attempt_at)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
		m.RunID, string(rcpt), m.Subject, m.TextBody, m.HTMLBody, name, sum, at, at)
	if err != nil {
		return 0, fmt.Errorf("store: enqueue for run %d: %w", m.RunID, err)
	}
	return res.LastInsertId()
}

// ClaimOutbox takes the next due, unsent, unclaimed message for holder
// until now+lease, counts the attempt, fixes its Message-ID to
// newMessageID unless it already has one, and returns it; nil when none
// is due.
func (db *DB) ClaimOutbox(ctx context.Context, holder string, now time.Time, lease time.Duration, newMessageID string) (*OutboxItem, error) {
	n := daemonStamp(now)
	var id int64
	err := db.sql.QueryRowContext(ctx, `
		UPDATE outbox
		SET claimed_by = ?, claimed_until = ?, attempts = attempts + 1,
		    message_id = COALESCE(message_id, ?)
		WHERE id = (
			SELECT id FROM outbox
			WHERE sent_at IS NULL AND next_attempt_at <= ?
			  AND (claimed_until IS NULL OR claimed_until < ?)
			ORDER BY next_attempt_at, id LIMIT 1)
		  AND sent_at IS NULL AND (claimed_until IS NULL OR claimed_until < ?)
		RETURNING id`,
		holder, daemonStamp(now.Add(lease)), newMessageID, n, n, n).Scan(&id)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, nil
	}
	if err != nil {
		return nil, daemonErr("claim outbox", err)
	}
	return db.OutboxItem(ctx, id)
}

// OutboxItem reads one outbox row.
func (db *DB) OutboxItem(ctx context.Context, id int64) (*OutboxItem, error) {
	var (
		it                                        OutboxItem
		rcpt, created, next                       string
		name, sum, mid, sent, claimedBy, claimedU sql.NullString
	)
	err := db.sql.QueryRowContext(ctx, `
		SELECT id, run_id, recipients, subject, text_body, html_body, attachment_name,
		       attachment_sha256, created_at, message_id, attempts, next_attempt_at,
		       last_error, smtp_reply, sent_at, claimed_by, claimed_until
		FROM outbox WHERE id = ?`, id).Scan(
		&it.ID, &it.RunID, &rcpt, &it.Subject, &it.TextBody, &it.HTMLBody, &name,
		&sum, &created, &mid, &it.Attempts, &next,
		&it.LastError, &it.SMTPReply, &sent, &claimedBy, &claimedU)
	if err != nil {
		return nil, fmt.Errorf("store: outbox %d: %w", id, err)
	}
	if err := json.Unmarshal([]byte(rcpt), &it.Recipients); err != nil {
		return nil, fmt.Errorf("store: outbox %d: recipients: %w", id, err)
	}
	it.AttachmentName, it.AttachmentSHA256, it.MessageID, it.ClaimedBy = name.String, sum.String, mid.String, claimedBy.String
	for _, f := range []struct {
		s   sql.NullString
		dst *time.Time
	}{
		{sql.NullString{String: created, Valid: true}, &it.CreatedAt},
		{sql.NullString{String: next, Valid: true}, &it.NextAttemptAt},
		{sent, &it.SentAt},
		{claimedU, &it.ClaimedUntil},
	} {
		if !f.s.Valid {
			continue
		}
		t, err := parseDaemonStamp(f.s.String)
		if err != nil {
			return nil, fmt.Errorf("store: outbox %d: %w", id, err)
		}
		*f.dst = t
	}
	return &it, nil
}

// ErrPDFMismatch reports a stored PDF whose bytes do not match a checksum.
var ErrPDFMismatch = errors.New("pdf checksum mismatch")

// RunPDF returns the PDF of a run after checking its bytes against the
// checksum stored with it and against want (hex sha256; "" skips that).
func (db *DB) RunPDF(ctx context.Context, runID int64, want string) ([]byte, error) {
	var (
		stored string
		pdf    []byte
	)
	err := db.sql.QueryRowContext(ctx, `SELECT sha256, pdf FROM run_pdfs WHERE run_id = ?`, runID).Scan(&stored, &pdf)
	if err != nil {
		return nil, fmt.Errorf("store: pdf of run %d: %w", runID, err)
	}
	got := sha256Hex(pdf)
	if !strings.EqualFold(got, stored) {
		return nil, fmt.Errorf("store: pdf of run %d: bytes hash to %s, stored %s: %w", runID, got, stored, ErrPDFMismatch)
	}
	if want != "" && !strings.EqualFold(got, want) {
		return nil, fmt.Errorf("store: pdf of run %d: bytes hash to %s, outbox expects %s: %w", runID, got, want, ErrPDFMismatch)
	}
	return pdf, nil
}

// MarkSent records that message id was accepted by the server (or written
// to the folder). It applies even if the lease has expired meanwhile: the
// message did go out, and recording it spares a further copy.
func (db *DB) MarkSent(ctx context.Context, id int64, now time.Time, reply string) (already bool, err error) {
	res, err := db.sql.ExecContext(ctx, `
		UPDATE outbox SET sent_at = ?, smtp_reply = ?, last_error = '', claimed_until = NULL
		WHERE id = ? AND sent_at IS NULL`, daemonStamp(now), reply, id)
	if err != nil {
		return false, fmt.Errorf("store: mark outbox %d sent: %w", id, err)
	}
	n, _ := res.RowsAffected()
	return n == 0, nil
}

// MarkFailed records a failed attempt by holder, releases the lease and
// sets when the message is due again.
func (db *DB) MarkFailed(ctx context.Context, id int64, holder string, next time.Time, errText string) error {
	res, err := db.sql.ExecContext(ctx, `
		UPDATE outbox SET last_error = ?, next_attempt_at = ?, claimed_by = NULL, claimed_until = NULL
		WHERE id = ? AND claimed_by = ? AND sent_at IS NULL`,
		errText, daemonStamp(next), id, holder)
	if err != nil {
		return fmt.Errorf("store: mark outbox %d failed: %w", id, err)
	}
	if n, _ := res.RowsAffected(); n == 0 {
		return fmt.Errorf("store: mark outbox %d failed: %w", id, ErrLeaseLost)
	}
	return nil
}
