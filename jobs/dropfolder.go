package jobs

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"

	"plumbline/store"
)

// The drop folder convention. A producer writing into the drop folder
// either writes under a name the scan ignores and renames the file when
// complete (names starting with "." or ending in ".part" are never
// picked up; the HTTP sources do this), or simply writes the file: the
// scan runs twice, stable_for apart, and picks up only files whose size
// and modification time did not change in between. Sub-folders are not
// scanned. After ingestion a file moves to processed/ (accepted, or
// identical to a file accepted before) or rejected/ (with the reasons in
// the ingest ledger and the job log).

// ignoredName reports names the scan never picks up.
func ignoredName(name string) bool {
	return strings.HasPrefix(name, ".") || strings.HasSuffix(name, ".part")
}

type fileState struct {
	size  int64
	mtime time.Time
}

// scanDrop lists the regular files of dir that are not ignored.
func scanDrop(dir string) (map[string]fileState, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	out := map[string]fileState{}
	for _, e := range entries {
		if ignoredName(e.Name()) || !e.Type().IsRegular() {
			continue
		}
		info, err := e.Info()
		if errors.Is(err, fs.ErrNotExist) {
			continue // moved away since ReadDir
		}
		if err != nil {
			return nil, err
		}
		out[e.Name()] = fileState{info.Size(), info.ModTime()}
	}
	return out, nil
}

// stableFiles scans dir, waits stableFor (on the daemon's clock) and
// scans again; it returns, sorted, the files seen unchanged both times.
// With stableFor 0 a single scan decides.
func (d *Daemon) stableFiles(ctx context.Context, dir string, stableFor time.Duration) ([]string, error) {
	first, err := scanDrop(dir)
	if err != nil || len(first) == 0 {
		return nil, err
	}
	second := first
	if stableFor > 0 {
		select {
		case <-ctx.Done():
			return nil, ctx.Err()
		case <-d.clock.After(stableFor):
		}
		if second, err = scanDrop(dir); err != nil {
			return nil, err
		}
	}
	var out []string
	for name, st := range second {
		if prev, ok := first[name]; ok && prev.size == st.size && prev.mtime.Equal(st.mtime) {
			out = append(out, name)
		} else {
			d.log.Info("drop folder: file still changing, left for the next run", "file", name)
		}
	}
	sort.Strings(out)
	return out, nil
}

func (d *Daemon) processedDir() string {
	if p := d.cfg.Sources.ProcessedDir; p != "" {
		return p
	}
	return filepath.Join(d.cfg.Sources.DropDir, "processed")
}

func (d *Daemon) rejectedDir() string {
	if p := d.cfg.Sources.RejectedDir; p != "" {
		return p
	}
	return filepath.Join(d.cfg.Sources.DropDir, "rejected")
}

// RunIngest is the ingest job: it fetches the HTTP sources into the drop
// folder, then ingests the folder's complete files.
func (d *Daemon) RunIngest(ctx context.Context) (string, error) {
	return d.execute(ctx, JobIngest, time.Time{}, d.ingestOnce)
}

func (d *Daemon) ingestOnce(ctx context.Context) (skip bool, err error) {
	dir := d.cfg.Sources.DropDir
	for _, p := range []string{dir, d.processedDir(), d.rejectedDir()} {
		if err := os.MkdirAll(p, 0o750); err != nil {
			return false, err
		}
	}
	var errs []error
	day := d.clock.Now().In(d.loc)
	for _, src := range d.cfg.Sources.HTTP {
		if _, err := d.Fetch(ctx, src, day); err != nil {
			d.log.Error("fetch failed", "source", src.Name, "err", err)
			errs = append(errs, err)
		}
	}
	names, err := d.stableFiles(ctx, dir, d.cfg.Sources.StableFor.D())
	if err != nil {
		return false, errors.Join(append(errs, fmt.Errorf("drop folder %s: %w", dir, err))...)
	}
	if len(names) == 0 {
		return len(errs) == 0, errors.Join(errs...)
	}
	paths := make([]string, len(names))
	for i, n := range names {
		paths[i] = filepath.Join(dir, n)
	}
	results, err := d.ingestFiles(ctx, paths)
	if err != nil {
		return false, errors.Join(append(errs, err)...)
	}
	var rejected []string
	for _, r := range results {
		to := d.processedDir()
		if r.Outcome == store.Rejected {
			to = d.rejectedDir()
			rejected = append(rejected, filepath.Base(r.Path))
		}
		if err := moveAside(r.Path, to, d.clock.Now()); err != nil {
			errs = append(errs, err)
		}
		d.log.Info("ingested", "file", filepath.Base(r.Path), "outcome", string(r.Outcome), "kind", string(r.Kind), "rows", r.Rows)
	}
	if len(rejected) > 0 {
		errs = append(errs, fmt.Errorf("%d file(s) rejected: %s", len(rejected), strings.Join(rejected, ", ")))
	}
	return false, errors.Join(errs...)
}

// moveAside moves path into dir, keeping its name unless taken; then it
// inserts the UTC time before the extension. A file already moved (by
// the ingest's own quarantine) is left alone.
func moveAside(path, dir string, now time.Time) error {
	if _, err := os.Stat(path); errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	base := filepath.Base(path)
	dest := filepath.Join(dir, base)
	if _, err := os.Lstat(dest); err == nil {
		ext := filepath.Ext(base)
		dest = filepath.Join(dir, strings.TrimSuffix(base, ext)+"."+now.UTC().Format("20060102T150405.000000000Z")+ext)
	}
	if err := os.Rename(path, dest); err != nil {
		return fmt.Errorf("move %s to %s: %w", base, dir, err)
	}
	return nil
}
