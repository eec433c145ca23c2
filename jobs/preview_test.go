package jobs

import (
	"bytes"
	"context"
	"encoding/json"
	"path/filepath"
	"testing"
	"time"

	"plumbline/jobs/demo"
	"plumbline/store"
)

// Preview's promise: the figures a pack of the date would store, and
// nothing stored. The reference is BuildPacks on the same database and
// configuration; the results documents must be byte-identical as JSON.
func TestPreviewIsThePackWithoutTheRun(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	inputs := filepath.Join(dir, "inputs")
	sum, err := demo.Generate(inputs, demo.Options{Years: 3})
	if err != nil {
		t.Fatal(err)
	}
	var ids []string
	for _, p := range sum.Portfolios {
		ids = append(ids, p.ID)
	}
	cfg := DemoConfig(dir, sum.Firm, ids)
	db := openDB(t, cfg.Database)
	if _, err := Ingest(ctx, db, []string{inputs, filepath.Join(inputs, "holdings")}, IngestOptions{}); err != nil {
		t.Fatal(err)
	}
	asOf := time.Date(2026, 11, 27, 0, 0, 0, 0, time.UTC) // demo.DefaultEnd

	docs, err := Previews(ctx, db, cfg, nil, asOf)
	if err != nil {
		t.Fatal(err)
	}
	if len(docs) != len(ids) {
		t.Fatalf("%d documents for %d portfolios", len(docs), len(ids))
	}
	runs, err := db.Runs(ctx, store.RunFilter{})
	if err != nil {
		t.Fatal(err)
	}
	if len(runs) != 0 {
		t.Fatalf("Previews stored %d runs", len(runs))
	}

	packs, err := BuildPacks(ctx, db, cfg, PackOptions{AsOf: asOf, Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range packs {
		want, _ := json.Marshal(p.Document)
		got, _ := json.Marshal(docs[i])
		if !bytes.Equal(got, want) {
			t.Errorf("%s: the preview differs from the stored pack", p.Portfolio)
		}
	}

	one, err := Preview(ctx, db, cfg, ids[1], asOf)
	if err != nil {
		t.Fatal(err)
	}
	if one.Portfolio.ID != ids[1] {
		t.Errorf("Preview(%s) returned %s", ids[1], one.Portfolio.ID)
	}
	if _, err := Preview(ctx, db, cfg, "NOPE", asOf); err == nil {
		t.Error("Preview of a portfolio that is not loaded: no error")
	}
}
