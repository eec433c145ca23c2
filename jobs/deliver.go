package jobs

import (
	"context"
	"log/slog"
	"os"
	"path/filepath"
	"sort"
	"time"

	"plumbline/jobs/config"
	"plumbline/store"
)

// DeliverNow sends every due outbox message once, as the daemon's outbox
// job does, and returns the files in the mail folder when delivery is
// "folder".
func DeliverNow(ctx context.Context, db *store.DB, cfg *config.Config, log *slog.Logger) ([]string, error) {
	d, err := NewDaemon(DaemonOptions{Config: cfg, DB: db, Logger: log,
		Pack: func(context.Context, time.Time) error { return nil }})
	if err != nil {
		return nil, err
	}
	if _, err := d.RunOutbox(ctx); err != nil {
		return nil, err
	}
	if cfg.Mail.Delivery != "folder" {
		return nil, nil
	}
	ents, err := os.ReadDir(cfg.Mail.Folder)
	if err != nil {
		return nil, err
	}
	var out []string
	for _, e := range ents {
		if !e.IsDir() && filepath.Ext(e.Name()) == ".eml" {
			out = append(out, filepath.Join(cfg.Mail.Folder, e.Name()))
		}
	}
	sort.Strings(out)
	return out, nil
}
