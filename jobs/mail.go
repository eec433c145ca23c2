package jobs

import (
	"encoding/json"
	"fmt"
	"os"
	"time"

	"plumbline/jobs/config"
	"plumbline/report"
	"plumbline/risk/pack"
	"plumbline/store"
)

// mailFor builds the outbox message of a run from its stored results:
// subject and bodies from the templates, the PDF attached. ok is false
// when the portfolio has no recipients.
func mailFor(r *store.Run, cfg *config.Config, pdf []byte) (store.OutboxMessage, bool, error) {
	to := cfg.Recipients(r.PortfolioID)
	if len(to) == 0 {
		return store.OutboxMessage{}, false, nil
	}
	var doc pack.Document
	if err := json.Unmarshal(r.ResultsJSON, &doc); err != nil {
		return store.OutboxMessage{}, false, fmt.Errorf("run %d: results: %w", r.ID, err)
	}
	stored, err := config.FromCanonical(r.ConfigJSON)
	if err != nil {
		return store.OutboxMessage{}, false, err
	}
	meta := report.Meta{RunID: r.ID, Revision: r.Revision, CreatedAt: r.CreatedAt,
		ProgramVersion: r.ProgramVersion, ConfigHash: r.ConfigHash, InputHash: r.InputHash,
		Firm: stored.Report.Firm}
	var texts = report.Options{}.Texts
	if dir := stored.Report.TemplateDir; dir != "" {
		texts = os.DirFS(dir)
	}
	subject, text, html, err := report.EmailBodies(&doc, meta, texts)
	if err != nil {
		return store.OutboxMessage{}, false, err
	}
	return store.OutboxMessage{
		RunID: r.ID, Recipients: to, Subject: subject, TextBody: text, HTMLBody: html,
		AttachmentName: fmt.Sprintf("%s-%s-run%d.pdf", r.PortfolioID, r.AsOf.Format(time.DateOnly), r.ID),
		CreatedAt:      r.CreatedAt,
	}, true, nil
}
