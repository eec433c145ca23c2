package store

import (
	"context"
	"crypto/sha256"
	"database/sql/driver"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"

	sqlite3 "github.com/mattn/go-sqlite3"
)

// IngestOptions tune Ingest. The zero value works.
type IngestOptions struct {
	// BaseCurrency is the ISO 4217 code every amount is in ("" = "USD").
	// A security in another currency is refused: FX is not supported yet.
	BaseCurrency string
	// MaxErrors caps the errors reported per file (0 = 50). Checking a
	// file stops at the cap.
	MaxErrors int
	// Progress, when set, is called as each file starts, every 65,536
	// rows, and when it is done.
	Progress func(Progress)

	// failAfterRows makes a file fail after that many data rows, to test
	// that a failure half-way leaves nothing behind.
	failAfterRows int
	// dryRun validates and stores inside the transaction but always rolls
	// back and writes no ledger row (fuzzing).
	dryRun bool
}

// Progress reports how far the ingestion of one file has got.
type Progress struct {
	Path string
	Name string
	Kind Kind
	Rows int  // data rows read so far
	Done bool // the file is finished (its result is final)
}

const (
	defaultBaseCurrency = "USD"
	defaultMaxErrors    = 50
	progressEvery       = 1 << 16
)

func (o IngestOptions) withDefaults() IngestOptions {
	if o.BaseCurrency == "" {
		o.BaseCurrency = defaultBaseCurrency
	}
	if o.MaxErrors <= 0 {
		o.MaxErrors = defaultMaxErrors
	}
	return o
}

// Ingest loads input files into the database. A path is a CSV file or a
// folder, whose *.csv files are taken in name order. Files are loaded in
// the order of their kinds (portfolios, securities, assumptions, prices,
// yields, premiums, holdings, flows), so a file may refer to what another
// file of the same call defines; results come in that order.
//
// Each file is all-or-nothing, in one transaction. A file with any invalid
// row is rejected and recorded in the ledger with its errors; a file whose
// content (SHA-256) was accepted before is a no-op reported as Duplicate.
// Re-ingesting data: a row identical to a stored one is a no-op (counted
// in Unchanged); a row whose key is stored with a different value is an
// error naming both values. Holdings are the exception: a snapshot that
// differs from the stored one for its portfolio and date becomes a new
// revision and the old one stays, marked superseded.
//
// A file with a header and no rows is accepted with 0 rows (an empty
// delivery is not an error); an empty file, without even a header, is
// rejected. Files are UTF-8 CSV (RFC 4180 quoting, LF or CRLF, an
// optional byte-order mark); lines over 64 KiB and records over 64 fields
// are refused, so memory stays bounded whatever the input.
//
// The returned error is for failures other than invalid input (a file
// that cannot be read, a database error, ctx cancelled); the results of
// the files finished before it are returned with it.
func (db *DB) Ingest(ctx context.Context, paths []string, opt IngestOptions) ([]FileResult, error) {
	if db.readOnly {
		return nil, errors.New("ingest: the database is open read-only")
	}
	opt = opt.withDefaults()
	files, err := expandPaths(paths)
	if err != nil {
		return nil, fmt.Errorf("ingest: %w", err)
	}
	type job struct {
		path string
		rank int
	}
	jobs := make([]job, len(files))
	for i, p := range files {
		k, err := sniffKind(p)
		if err != nil {
			return nil, fmt.Errorf("ingest %s: %w", p, err)
		}
		jobs[i] = job{p, kindOrder(k)}
	}
	sort.SliceStable(jobs, func(i, j int) bool { return jobs[i].rank < jobs[j].rank })

	conn, err := db.sql.Conn(ctx)
	if err != nil {
		return nil, fmt.Errorf("ingest: %w", err)
	}
	defer conn.Close()
	var results []FileResult
	err = conn.Raw(func(dc any) error {
		c, err := newRawConn(dc)
		if err != nil {
			return err
		}
		defer c.close()
		for _, j := range jobs {
			if err := ctx.Err(); err != nil {
				return err
			}
			res, err := c.ingestFile(ctx, j.path, opt)
			if err != nil {
				return fmt.Errorf("ingest %s: %w", j.path, err)
			}
			results = append(results, res)
		}
		return nil
	})
	return results, err
}

// expandPaths replaces each folder by its *.csv files, sorted by name.
func expandPaths(paths []string) ([]string, error) {
	var out []string
	for _, p := range paths {
		fi, err := os.Stat(p)
		if err != nil {
			return nil, err
		}
		if !fi.IsDir() {
			out = append(out, p)
			continue
		}
		entries, err := os.ReadDir(p)
		if err != nil {
			return nil, err
		}
		for _, e := range entries {
			if !strings.EqualFold(filepath.Ext(e.Name()), ".csv") {
				continue
			}
			full := filepath.Join(p, e.Name())
			if fi, err := os.Stat(full); err != nil || !fi.Mode().IsRegular() {
				continue
			}
			out = append(out, full)
		}
	}
	return out, nil
}

// sniffKind reads just the header of a file; "" when it is not one.
func sniffKind(path string) (Kind, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	hdr, _, err := newCSVReader(f).next()
	var ce *csvError
	switch {
	case err == io.EOF || errors.As(err, &ce):
		return "", nil
	case err != nil:
		return "", err
	}
	if k := matchHeader(hdr); k != nil {
		return k.kind, nil
	}
	return "", nil
}

func hashFile(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// ingestFile ingests one file and records it in the ledger.
func (c *rawConn) ingestFile(ctx context.Context, path string, opt IngestOptions) (FileResult, error) {
	res := FileResult{Path: path, Name: filepath.Base(path)}
	sum, err := hashFile(path)
	if err != nil {
		return res, err
	}
	res.SHA256 = sum
	progress := func(done bool) {
		if opt.Progress != nil {
			opt.Progress(Progress{Path: path, Name: res.Name, Kind: res.Kind, Rows: res.Rows, Done: done})
		}
	}

	if dup, err := c.duplicate(&res); dup || err != nil {
		progress(true)
		return res, err
	}

	f, err := os.Open(path)
	if err != nil {
		return res, err
	}
	defer f.Close()
	h := sha256.New()
	err = c.load(ctx, io.TeeReader(f, h), h, opt, &res, progress)
	if errors.Is(err, errLateDuplicate) {
		// Another process accepted the same content meanwhile.
		res = FileResult{Path: path, Name: res.Name, SHA256: sum}
		_, err = c.duplicate(&res)
		progress(true)
		return res, err
	}
	if err != nil {
		return res, err
	}
	if res.Outcome == Rejected {
		text := res.Err().Error()
		var kind any
		if res.Kind != "" {
			kind = string(res.Kind)
		}
		if _, err := c.exec(`INSERT INTO ingest_files (name, path, sha256, kind, rows, outcome, error) VALUES (?, ?, ?, ?, ?, 'rejected', ?)`,
			res.Name, path, sum, kind, res.Rows, text); err != nil {
			return res, err
		}
	}
	progress(true)
	return res, nil
}

// errLateDuplicate: the file's content was accepted by another
// connection after the duplicate check.
var errLateDuplicate = errors.New("accepted meanwhile by another ingest")

// duplicate reports whether res's content was accepted before; if so it
// fills res as a duplicate and records the attempt in the ledger.
func (c *rawConn) duplicate(res *FileResult) (bool, error) {
	dest := make([]driver.Value, 3)
	found, err := c.queryRow(`SELECT name, kind, rows FROM ingest_files WHERE sha256 = ? AND outcome = 'accepted'`,
		[]any{res.SHA256}, dest)
	if err != nil || !found {
		return false, err
	}
	res.Outcome = Duplicate
	res.DuplicateOf = asString(dest[0])
	res.Kind = Kind(asString(dest[1]))
	res.Rows = int(asInt(dest[2]))
	_, err = c.exec(`INSERT INTO ingest_files (name, path, sha256, kind, rows, outcome) VALUES (?, ?, ?, ?, ?, 'duplicate')`,
		res.Name, res.Path, res.SHA256, string(res.Kind), res.Rows)
	return true, err
}

// load reads, validates and stores one file in a transaction, setting
// res.Outcome to Accepted or Rejected. h, when not nil, hashes what r
// has read; the file must still match res.SHA256 when it is accepted.
func (c *rawConn) load(ctx context.Context, r io.Reader, h hash.Hash, opt IngestOptions, res *FileResult, progress func(bool)) (err error) {
	errs := &errList{file: res.Name, max: opt.MaxErrors}
	reject := func() error {
		res.Outcome = Rejected
		res.Errors = errs.errs
		res.ErrorsTruncated = errs.truncated
		return nil
	}
	rd := newPipedReader(r)
	defer rd.close()
	hdr, line, err := rd.next()
	var ce *csvError
	switch {
	case err == io.EOF:
		errs.add(0, "", "", "the file is empty; the first line must be a header")
		return reject()
	case errors.As(err, &ce) && ce.fields > maxFields:
		errs.add(ce.Line, "header", "", fmt.Sprintf("has %d columns; it is not the header of any input kind", ce.fields))
		return reject()
	case errors.As(err, &ce):
		errs.add(ce.Line, "header", "", ce.Msg)
		return reject()
	case err != nil:
		return err
	}
	spec := matchHeader(hdr)
	if spec == nil {
		text := make([]string, len(hdr))
		for i, f := range hdr {
			text[i] = string(f)
		}
		errs.add(line, "header", clip([]byte(strings.Join(text, ","))), headerHint(hdr))
		return reject()
	}
	res.Kind = spec.kind
	progress(false)

	if err := c.execScript("BEGIN IMMEDIATE"); err != nil {
		return err
	}
	committed := false
	defer func() {
		if !committed {
			if rbErr := c.execScript("ROLLBACK"); rbErr != nil && err == nil {
				err = rbErr
			}
		}
	}()
	out, err := c.exec(`INSERT INTO ingest_files (name, path, sha256, kind, outcome) VALUES (?, ?, ?, ?, 'accepted')`,
		res.Name, res.Path, res.SHA256, string(spec.kind))
	if isConstraint(err, sqlite3.ErrConstraintUnique) {
		return errLateDuplicate
	}
	if err != nil {
		return err
	}
	lc := &loadCtx{c: c, file: res.Name, errs: errs, opt: opt, strs: map[string]any{}}
	if lc.fileID, err = out.LastInsertId(); err != nil {
		return err
	}
	ld := spec.loader()
	rw := row{cols: spec.cols, errs: errs}
	eof := false
	for !errs.full() {
		fields, line, err := rd.next()
		if err == io.EOF {
			eof = true
			break
		}
		if errors.As(err, &ce) {
			res.Rows++
			errs.add(ce.Line, "", "", ce.Msg)
			continue
		}
		if err != nil {
			return err
		}
		res.Rows++
		if len(fields) != len(spec.cols) {
			errs.add(line, "", "", fmt.Sprintf("has %d fields; the header has %d", len(fields), len(spec.cols)))
		} else {
			rw.f, rw.line, rw.ok = fields, line, true
			if err := ld.row(lc, &rw); err != nil {
				return fmt.Errorf("line %d: %w", line, err)
			}
		}
		if opt.failAfterRows > 0 && res.Rows >= opt.failAfterRows {
			errs.add(line, "", "", fmt.Sprintf("injected failure after %d rows", res.Rows))
			break
		}
		if res.Rows%progressEvery == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
			progress(false)
		}
	}
	if errs.full() && !eof {
		errs.truncated = true
	}
	if err := ld.finish(lc); err != nil {
		return err
	}
	res.Unchanged = lc.unchanged
	res.Snapshots = lc.snapshots
	if len(errs.errs) == 0 && h != nil && hex.EncodeToString(h.Sum(nil)) != res.SHA256 {
		errs.add(0, "", "", "the file changed while it was being read; try again once it is complete")
	}
	if len(errs.errs) > 0 {
		res.Snapshots = nil
		return reject()
	}
	res.Outcome = Accepted
	if opt.dryRun {
		return nil
	}
	if _, err := c.exec(`UPDATE ingest_files SET rows = ? WHERE id = ?`, res.Rows, lc.fileID); err != nil {
		return err
	}
	if err := c.execScript("COMMIT"); err != nil {
		return err
	}
	committed = true
	return nil
}
