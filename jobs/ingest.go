package jobs

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"

	"plumbline/store"
)

// IngestOptions are store.IngestOptions plus what to do with rejected files.
type IngestOptions struct {
	store.IngestOptions
	// QuarantineDir, when set, receives every rejected file (created if
	// needed). A name already taken there gets a numeric suffix.
	QuarantineDir string
}

// Ingest loads paths (files or folders) into db with store's rules and
// moves each rejected file to opt.QuarantineDir, recording where in its
// result. A failed move is returned as an error after all files are
// handled; the ingestion results stand.
func Ingest(ctx context.Context, db *store.DB, paths []string, opt IngestOptions) ([]store.FileResult, error) {
	results, err := db.Ingest(ctx, paths, opt.IngestOptions)
	if opt.QuarantineDir == "" {
		return results, err
	}
	var moveErrs []error
	for i := range results {
		r := &results[i]
		if r.Outcome != store.Rejected {
			continue
		}
		to, merr := quarantine(r.Path, opt.QuarantineDir)
		if merr != nil {
			moveErrs = append(moveErrs, fmt.Errorf("quarantine %s: %w", r.Path, merr))
			continue
		}
		r.Quarantined = to
	}
	return results, errors.Join(append([]error{err}, moveErrs...)...)
}

// quarantine moves path into dir without overwriting anything there.
func quarantine(path, dir string) (string, error) {
	if err := os.MkdirAll(dir, 0o750); err != nil {
		return "", err
	}
	base := filepath.Base(path)
	ext := filepath.Ext(base)
	stem := strings.TrimSuffix(base, ext)
	for n := 0; n < 1000; n++ {
		name := base
		if n > 0 {
			name = stem + "." + strconv.Itoa(n) + ext
		}
		to := filepath.Join(dir, name)
		if _, err := os.Lstat(to); err == nil {
			continue
		} else if !errors.Is(err, os.ErrNotExist) {
			return "", err
		}
		return to, move(path, to)
	}
	return "", fmt.Errorf("no free name for %s in %s", base, dir)
}

// move renames from to to, copying when they are on different file
// systems.
func move(from, to string) error {
	err := os.Rename(from, to)
	if err == nil {
		return nil
	}
	// Only a rename across file systems (EXDEV) falls back to a copy;
	// any other failure (permissions, a missing folder) is the answer.
	if !errors.Is(err, syscall.EXDEV) {
		return err
	}
	in, oerr := os.Open(from)
	if oerr != nil {
		return oerr
	}
	defer in.Close()
	out, cerr := os.OpenFile(to, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o640)
	if cerr != nil {
		return cerr
	}
	if _, cerr = io.Copy(out, in); cerr != nil {
		out.Close()
		os.Remove(to)
		return cerr
	}
	if cerr = out.Close(); cerr != nil {
		os.Remove(to)
		return cerr
	}
	return os.Remove(from)
}
