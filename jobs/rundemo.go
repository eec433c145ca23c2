package jobs

import (
	"context"
	"fmt"
	"log/slog"
	"path/filepath"
	"time"

	"plumbline/jobs/config"
	"plumbline/jobs/demo"
	"plumbline/store"
)

// DemoOptions controls RunDemo.
type DemoOptions struct {
	Dir string
	// Weeks is how many weekly runs per portfolio are built (at least 26).
	Weeks    int
	Version  string
	Logger   *slog.Logger
	Progress func(step string)
	Now      func() time.Time
}

// DemoResult is what the demo produced.
type DemoResult struct {
	Dir      string                   `json:"dir"`
	Database string                   `json:"database"`
	Config   string                   `json:"config"`
	Summary  *demo.Summary            `json:"scenario"`
	Ingested []store.FileResult       `json:"ingested"`
	Runs     int                      `json:"runs"`
	Latest   []PackResult             `json:"latest"`
	Mail     []string                 `json:"mail"`
	Checks   map[string]*Verification `json:"verified"`
}

// DemoConfig is the configuration the demo writes and uses: the fictional
// firm, its portfolios' recipients, and mail written as .eml files.
func DemoConfig(dir, firm string, portfolios []string) *config.Config {
	cfg, err := config.Parse("demo limits", []byte(demoLimits))
	if err != nil {
		panic(err) // a constant below; covered by the demo test
	}
	cfg.Database = filepath.Join(dir, "plumbline.db")
	cfg.Report.Firm = firm
	cfg.Report.OutputDir = filepath.Join(dir, "packs")
	cfg.Mail.Delivery = "folder"
	cfg.Mail.Folder = filepath.Join(dir, "outbox")
	cfg.Mail.From = "risk@quillmere.example"
	for _, p := range portfolios {
		cfg.Portfolios = append(cfg.Portfolios, config.Portfolio{ID: p,
			Recipients: []string{"committee@quillmere.example", "risk@quillmere.example"}})
	}
	return cfg
}

// RunDemo generates the fictional scenario, ingests it through the same
// path as a user's files, builds weekly packs for every portfolio, renders
// and mails (to a folder) the latest, and verifies them.
func RunDemo(ctx context.Context, opt DemoOptions) (*DemoResult, error) {
	say := func(format string, a ...any) {
		if opt.Progress != nil {
			opt.Progress(fmt.Sprintf(format, a...))
		}
	}
	if opt.Weeks < 26 {
		opt.Weeks = 26
	}
	dir := opt.Dir
	inputs := filepath.Join(dir, "inputs")
	say("generating the fictional scenario in %s", inputs)
	sum, err := demo.Generate(inputs, demo.Options{})
	if err != nil {
		return nil, err
	}
	var ids []string
	for _, p := range sum.Portfolios {
		ids = append(ids, p.ID)
	}
	cfg := DemoConfig(dir, sum.Firm, ids)
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	res := &DemoResult{Dir: dir, Database: cfg.Database, Summary: sum, Checks: map[string]*Verification{}}
	db, err := store.Open(ctx, cfg.Database)
	if err != nil {
		return nil, err
	}
	defer db.Close()
	say("ingesting %d files", len(sum.Files))
	res.Ingested, err = Ingest(ctx, db, []string{inputs, filepath.Join(inputs, "holdings")}, IngestOptions{IngestOptions: store.IngestOptions{BaseCurrency: cfg.BaseCurrency}})
	if err != nil {
		return nil, err
	}
	for _, f := range res.Ingested {
		if f.Outcome == store.Rejected {
			return nil, fmt.Errorf("demo file %s was rejected: %v", f.Name, f.Errors)
		}
	}
	latest, err := LatestCompleteDate(ctx, db)
	if err != nil {
		return nil, err
	}
	now := opt.Now
	if now == nil {
		now = time.Now
	}
	for w := opt.Weeks - 1; w >= 0; w-- {
		asOf := latest.AddDate(0, 0, -7*w)
		last := w == 0
		say("packing week of %s (%d of %d)", asOf.Format(time.DateOnly), opt.Weeks-w, opt.Weeks)
		out, err := BuildPacks(ctx, db, cfg, PackOptions{AsOf: asOf, Render: last, Queue: last,
			OutDir: cfg.Report.OutputDir, Version: opt.Version, Logger: opt.Logger, Now: now,
			Reason: "demo re-run"})
		if err != nil {
			return nil, err
		}
		res.Runs += len(out)
		if last {
			res.Latest = out
		}
	}
	say("delivering the latest packs to %s", cfg.Mail.Folder)
	res.Mail, err = DeliverNow(ctx, db, cfg, opt.Logger)
	if err != nil {
		return nil, err
	}
	for _, p := range res.Latest {
		v, err := Verify(ctx, db, p.RunID)
		if err != nil {
			return nil, err
		}
		res.Checks[p.Portfolio] = v
	}
	return res, nil
}

// demoLimits are the fictional committee's limits.
const demoLimits = `
[[limit]]
name = "duration range"
metric = "duration_modified"
breach_min = 10
warn_min = 12
warn_max = 35
breach_max = 40

[[limit]]
name = "volatility (63 days)"
metric = "volatility_ann_63d"
warn_max = 0.20
breach_max = 0.25

[[limit]]
name = "one-day VaR 99%"
metric = "var_99_1d"
warn_max = 0.025
breach_max = 0.03

[[limit]]
name = "single name"
metric = "max_single_name_weight"
warn_max = 0.08
breach_max = 0.10

[[limit]]
name = "sector"
metric = "max_sector_weight"
warn_max = 0.25
breach_max = 0.30

[[limit]]
name = "rates +100bp loss"
metric = "scenario_loss"
scenario = "rates +100bp"
warn_max = 0.25
breach_max = 0.30

[[limit]]
name = "market -20% loss"
metric = "scenario_loss"
scenario = "market -20%"
warn_max = 0.22
breach_max = 0.26
`
