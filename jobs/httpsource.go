package jobs

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"time"

	"plumbline/jobs/config"
	"plumbline/store"
)

// ErrTooLarge reports a download larger than the source's max_bytes.
var ErrTooLarge = errors.New("file larger than max_bytes")

// HTTPStatusError is a non-200 answer.
type HTTPStatusError struct {
	URL  string
	Code int
}

func (e *HTTPStatusError) Error() string {
	return fmt.Sprintf("GET %s: %d %s", e.URL, e.Code, http.StatusText(e.Code))
}

// retryable: server errors, 408 and 429 are worth another try; other
// client errors will not change by asking again.
func (e *HTTPStatusError) retryable() bool {
	return e.Code >= 500 || e.Code == http.StatusRequestTimeout || e.Code == http.StatusTooManyRequests
}

// FetchResult is one successful download.
type FetchResult struct {
	Source    string
	URL       string
	Path      string // file saved in the drop folder; "" when unchanged
	Bytes     int64
	SHA256    string
	Unchanged bool // same bytes as the source's previous download: not saved again
}

// Fetch downloads src for the local date day into the drop folder and
// records its sha256 in the fetch log. Each attempt is bounded by the
// source's timeout; failures other than a definite client error or an
// oversize file are retried with exponential backoff. The body is written
// to a hidden temporary file (ignored by the folder scan) and renamed to
// NAME-YYYY-MM-DD.csv once complete, so the ingest never sees half a file.
// A download identical to the previous one of the source is not saved.
func (d *Daemon) Fetch(ctx context.Context, src config.HTTPSource, day time.Time) (*FetchResult, error) {
	date := day.Format(time.DateOnly)
	url := strings.ReplaceAll(src.URL, "{date}", date)
	dest := filepath.Join(d.cfg.Sources.DropDir, src.Name+"-"+date+".csv")
	log := d.log.With("source", src.Name, "url", url)
	wait := src.Backoff.D()
	var lastErr error
	for attempt := 0; attempt <= src.Retries; attempt++ {
		if attempt > 0 {
			log.Warn("fetch failed; retrying", "attempt", attempt, "wait", wait.String(), "err", lastErr)
			select {
			case <-ctx.Done():
				return nil, fmt.Errorf("fetch %s: %w (last error: %v)", src.Name, ctx.Err(), lastErr)
			case <-d.clock.After(wait):
			}
			wait *= 2
		}
		tmp, n, sum, err := d.download(ctx, src, url)
		if err == nil {
			return d.keep(ctx, src, url, tmp, dest, n, sum)
		}
		lastErr = err
		var se *HTTPStatusError
		if errors.Is(err, ErrTooLarge) || (errors.As(err, &se) && !se.retryable()) || ctx.Err() != nil {
			break
		}
	}
	return nil, fmt.Errorf("fetch %s: %w", src.Name, lastErr)
}

// download makes one attempt and leaves the body in a hidden temporary
// file of the drop folder.
func (d *Daemon) download(ctx context.Context, src config.HTTPSource, url string) (tmp string, n int64, sum string, err error) {
	actx, cancel := context.WithTimeout(ctx, src.Timeout.D())
	defer cancel()
	req, err := http.NewRequestWithContext(actx, http.MethodGet, url, nil)
	if err != nil {
		return "", 0, "", err
	}
	resp, err := d.http.Do(req)
	if err != nil {
		return "", 0, "", err
	}
	defer resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		io.Copy(io.Discard, io.LimitReader(resp.Body, 64<<10))
		return "", 0, "", &HTTPStatusError{URL: url, Code: resp.StatusCode}
	}
	if resp.ContentLength > src.MaxBytes {
		return "", 0, "", fmt.Errorf("GET %s: Content-Length %d: %w (%d)", url, resp.ContentLength, ErrTooLarge, src.MaxBytes)
	}
	f, err := os.CreateTemp(d.cfg.Sources.DropDir, "."+src.Name+".part-*")
	if err != nil {
		return "", 0, "", err
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	h := sha256.New()
	// Reading one byte past the cap tells an oversize body from one of
	// exactly max_bytes. A body shorter than its Content-Length fails
	// here with io.ErrUnexpectedEOF.
	n, err = io.Copy(io.MultiWriter(f, h), io.LimitReader(resp.Body, src.MaxBytes+1))
	if err != nil {
		return "", 0, "", fmt.Errorf("GET %s: body after %d bytes: %w", url, n, err)
	}
	if n > src.MaxBytes {
		return "", 0, "", fmt.Errorf("GET %s: %w (%d)", url, ErrTooLarge, src.MaxBytes)
	}
	if err = f.Sync(); err != nil {
		return "", 0, "", err
	}
	if err = f.Close(); err != nil {
		return "", 0, "", err
	}
	return f.Name(), n, hexSum(h), nil
}

func hexSum(h hash.Hash) string { return hex.EncodeToString(h.Sum(nil)) }

// keep renames a complete download into place, unless it repeats the
// previous download of the source, and records it.
func (d *Daemon) keep(ctx context.Context, src config.HTTPSource, url, tmp, dest string, n int64, sum string) (*FetchResult, error) {
	res := &FetchResult{Source: src.Name, URL: url, Bytes: n, SHA256: sum}
	prev, err := d.db.LastFetch(ctx, src.Name)
	if err != nil {
		os.Remove(tmp)
		return nil, err
	}
	if prev != nil && prev.SHA256 == sum {
		os.Remove(tmp)
		res.Unchanged = true
	} else {
		if err := os.Chmod(tmp, 0o640); err != nil {
			os.Remove(tmp)
			return nil, err
		}
		if err := os.Rename(tmp, dest); err != nil {
			os.Remove(tmp)
			return nil, fmt.Errorf("fetch %s: %w", src.Name, err)
		}
		res.Path = dest
	}
	file := ""
	if res.Path != "" {
		file = filepath.Base(res.Path)
	}
	err = d.db.RecordFetch(ctx, store.Fetch{
		Source: src.Name, URL: url, FetchedAt: d.clock.Now(), File: file, Bytes: n, SHA256: sum,
	})
	if err != nil {
		return nil, err
	}
	d.log.Info("fetched", "source", src.Name, "bytes", n, "sha256", sum, "unchanged", res.Unchanged, "file", res.Path)
	return res, nil
}
