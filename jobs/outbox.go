package jobs

import (
	"bytes"
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"net/mail"
	"strconv"
	"strings"
	"time"

	gomail "github.com/wneessen/go-mail"

	"plumbline/store"
)

// maxPerOutboxRun bounds the messages one outbox execution sends, so a
// large backlog does not hold the job (and a shutdown) for long.
const maxPerOutboxRun = 200

// idleRecordsKept is how long the records of outbox executions that found
// nothing to send are kept.
const idleRecordsKept = 7 * 24 * time.Hour

// RunOutbox delivers the due messages of the outbox: the outbox job.
// After an idle execution it prunes idle records older than a week.
func (d *Daemon) RunOutbox(ctx context.Context) (string, error) {
	outcome, err := d.execute(ctx, JobOutbox, time.Time{}, func(ctx context.Context) (bool, error) {
		sent, failed, err := d.deliverDue(ctx)
		if err != nil {
			return false, err
		}
		if failed > 0 {
			return false, fmt.Errorf("%d message(s) not delivered, %d delivered; they will be retried", failed, sent)
		}
		return sent == 0, nil
	})
	if outcome == store.JobSkipped {
		if n, err := d.db.PruneIdleJobRuns(context.WithoutCancel(ctx), JobOutbox, d.clock.Now().Add(-idleRecordsKept)); err != nil {
			d.log.Warn("cannot prune idle outbox records", "err", err)
		} else if n > 0 {
			d.log.Debug("pruned idle outbox records", "count", n)
		}
	}
	return outcome, err
}

// deliverDue claims and sends due messages one at a time until none is
// due, ctx is done or maxPerOutboxRun is reached.
func (d *Daemon) deliverDue(ctx context.Context) (sent, failed int, err error) {
	lease := d.cfg.Mail.Lease.D()
	for range maxPerOutboxRun {
		if ctx.Err() != nil {
			return sent, failed, nil
		}
		it, err := d.db.ClaimOutbox(ctx, d.holder, d.clock.Now(), lease, d.newMessageID())
		if err != nil {
			return sent, failed, err
		}
		if it == nil {
			return sent, failed, nil
		}
		if err := d.deliver(ctx, it); err != nil {
			failed++
			continue
		}
		sent++
	}
	return sent, failed, nil
}

// deliver sends one claimed message and records the result. Whatever
// happens the row stays: sent, or due again after a backoff.
func (d *Daemon) deliver(ctx context.Context, it *store.OutboxItem) error {
	log := d.log.With("outbox_id", it.ID, "run_id", it.RunID, "message_id", it.MessageID, "attempt", it.Attempts)
	rec := context.WithoutCancel(ctx)
	reply, sendErr := d.send(ctx, it)
	now := d.clock.Now()
	if sendErr == nil {
		already, err := d.db.MarkSent(rec, it.ID, now, reply)
		if err != nil {
			// The server has the message but the database does not know:
			// the lease will expire and the message go out again with the
			// same Message-ID (at least once).
			log.Error("message sent but not recorded; it will be sent again", "err", err)
			return err
		}
		if already {
			log.Warn("message was also sent by another daemon after this one's lease expired")
		}
		log.Info("message delivered", "recipients", len(it.Recipients), "reply", reply)
		return nil
	}
	next := now.Add(backoff(it.Attempts, d.cfg.Mail.RetryBase.D(), d.cfg.Mail.RetryMax.D()))
	if err := d.db.MarkFailed(rec, it.ID, d.holder, next, sendErr.Error()); err != nil {
		log.Error("cannot record failed delivery", "err", err)
	}
	log.Warn("delivery failed; will retry", "err", sendErr, "next_attempt", next.Format(time.RFC3339))
	return sendErr
}

// backoff is the wait after the attempt-th failed attempt:
// base * 2^(attempt-1), capped at max.
func backoff(attempt int, base, max time.Duration) time.Duration {
	w := base
	for i := 1; i < attempt; i++ {
		if w >= max/2 {
			return max
		}
		w *= 2
	}
	if w > max {
		return max
	}
	return w
}

// send builds the message of it, with the run's PDF checked against the
// checksum stored in the outbox, and hands it to the sender.
func (d *Daemon) send(ctx context.Context, it *store.OutboxItem) (string, error) {
	m, err := d.buildMessage(ctx, it)
	if err != nil {
		return "", err
	}
	return d.sender.Send(ctx, m)
}

func (d *Daemon) buildMessage(ctx context.Context, it *store.OutboxItem) (*gomail.Msg, error) {
	m := gomail.NewMsg(gomail.WithNoDefaultUserAgent())
	if err := m.From(d.cfg.Mail.From); err != nil {
		return nil, fmt.Errorf("from %q: %w", d.cfg.Mail.From, err)
	}
	if err := m.To(it.Recipients...); err != nil {
		return nil, fmt.Errorf("recipients: %w", err)
	}
	m.Subject(it.Subject)
	m.SetMessageIDWithValue(strings.Trim(it.MessageID, "<>"))
	m.SetDateWithValue(d.clock.Now())
	m.SetGenHeader(gomail.Header("X-Plumbline-Run"), strconv.FormatInt(it.RunID, 10))
	m.SetBodyString(gomail.TypeTextPlain, it.TextBody)
	if it.HTMLBody != "" {
		m.AddAlternativeString(gomail.TypeTextHTML, it.HTMLBody)
	}
	if it.AttachmentName != "" {
		pdf, err := d.db.RunPDF(ctx, it.RunID, it.AttachmentSHA256)
		if err != nil {
			return nil, err
		}
		if err := m.AttachReader(it.AttachmentName, bytes.NewReader(pdf),
			gomail.WithFileContentType(gomail.ContentType("application/pdf"))); err != nil {
			return nil, fmt.Errorf("attach %s: %w", it.AttachmentName, err)
		}
	}
	return m, nil
}

// newMessageID returns a fresh "<random@domain>" Message-ID, the domain
// being the From address's. The outbox keeps the first one it is given
// for a row and reuses it on every attempt.
func (d *Daemon) newMessageID() string {
	b := make([]byte, 16)
	rand.Read(b)
	domain := "localhost"
	if a, err := mail.ParseAddress(d.cfg.Mail.From); err == nil {
		if _, dom, ok := strings.Cut(a.Address, "@"); ok && dom != "" {
			domain = dom
		}
	}
	return "<" + hex.EncodeToString(b) + ".plumbline@" + domain + ">"
}
