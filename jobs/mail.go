package jobs

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"time"

	"plumbline/jobs/config"
	"plumbline/report"
	"plumbline/risk/pack"
	"plumbline/store"
)

// decodedRun is a stored run read back for rendering and mailing: its
// results document and the report settings of its stored configuration,
// never the current one.
type decodedRun struct {
	run  *store.Run
	doc  *pack.Document
	meta report.Meta
	opt  report.Options
}

// decodeRun reads a run's stored results and configuration.
func decodeRun(r *store.Run) (*decodedRun, error) {
	var doc pack.Document
	if err := json.Unmarshal(r.ResultsJSON, &doc); err != nil {
		return nil, fmt.Errorf("run %d: results: %w", r.ID, err)
	}
	if doc.Schema != pack.SchemaVersion {
		return nil, fmt.Errorf("run %d: results schema %q, this program reads %q", r.ID, doc.Schema, pack.SchemaVersion)
	}
	stored, err := config.FromCanonical(r.ConfigJSON)
	if err != nil {
		return nil, fmt.Errorf("run %d: %w", r.ID, err)
	}
	meta := report.Meta{RunID: r.ID, Revision: r.Revision, CreatedAt: r.CreatedAt,
		ProgramVersion: r.ProgramVersion, ConfigHash: r.ConfigHash, InputHash: r.InputHash,
		Firm: stored.Report.Firm}
	if r.Supersedes != 0 {
		s := r.Supersedes
		meta.Supersedes = &s
	}
	opt := report.Options{Paper: stored.Report.Paper, Sections: stored.Report.Sections}
	if dir := stored.Report.TemplateDir; dir != "" {
		opt.Texts = os.DirFS(dir)
	}
	return &decodedRun{run: r, doc: &doc, meta: meta, opt: opt}, nil
}

// render draws the run's PDF and counts its pages.
func (d *decodedRun) render() ([]byte, int, error) {
	var buf bytes.Buffer
	if err := report.Render(&buf, d.doc, d.meta, d.opt); err != nil {
		return nil, 0, fmt.Errorf("run %d: render: %w", d.run.ID, err)
	}
	pages, err := report.PageCount(buf.Bytes())
	if err != nil {
		return nil, 0, fmt.Errorf("run %d: %w", d.run.ID, err)
	}
	return buf.Bytes(), pages, nil
}

// mail builds the run's outbox message to recipients: subject and bodies
// from the templates, the run's PDF attached.
func (d *decodedRun) mail(to []string) (store.OutboxMessage, error) {
	r := d.run
	subject, text, html, err := report.EmailBodies(d.doc, d.meta, d.opt.Texts)
	if err != nil {
		return store.OutboxMessage{}, fmt.Errorf("run %d: mail: %w", r.ID, err)
	}
	return store.OutboxMessage{
		RunID: r.ID, Recipients: to, Subject: subject, TextBody: text, HTMLBody: html,
		AttachmentName: fmt.Sprintf("%s-%s-run%d.pdf", r.PortfolioID, r.AsOf.Format(time.DateOnly), r.ID),
		CreatedAt:      r.CreatedAt,
	}, nil
}
