package store

import (
	"fmt"
	"strings"
	"time"
)

// Kind is the kind of an input file, recognised from its header.
type Kind string

// The input kinds, listed in the order Ingest loads them so that a file
// may refer to rows defined by a file of an earlier kind in the same call.
const (
	KindPortfolios  Kind = "portfolios"
	KindSecurities  Kind = "securities"
	KindAssumptions Kind = "assumptions"
	KindPrices      Kind = "prices"
	KindYields      Kind = "yields"
	KindPremiums    Kind = "premiums"
	KindHoldings    Kind = "holdings"
	KindFlows       Kind = "flows"
)

// Outcome is what became of one ingested file.
type Outcome string

const (
	// Accepted: every row was valid and the file was stored.
	Accepted Outcome = "accepted"
	// Rejected: nothing from the file was stored; Errors say why.
	Rejected Outcome = "rejected"
	// Duplicate: a file with the same SHA-256 was accepted before; a no-op.
	Duplicate Outcome = "duplicate"
)

// RowError is one validation failure, at a line of a file (Line 0: the
// file as a whole). Its text reads
//
//	holdings-2026-03-06.csv:14: quantity: "12,5" is not a number
type RowError struct {
	File   string `json:"file"`
	Line   int    `json:"line"`
	Column string `json:"column,omitempty"`
	Value  string `json:"value,omitempty"`
	Rule   string `json:"rule"`
}

func (e *RowError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Column != "" {
		b.WriteString(e.Column)
		b.WriteString(": ")
		if e.Value != "" {
			fmt.Fprintf(&b, "%q ", e.Value)
		}
	}
	b.WriteString(e.Rule)
	return b.String()
}

// SnapshotRevision reports one holdings snapshot of an accepted file.
type SnapshotRevision struct {
	Portfolio string    `json:"portfolio"`
	AsOf      time.Time `json:"as_of"`
	// Revision is the snapshot's revision (1 for the first of its
	// portfolio and date); with Unchanged, the current revision.
	Revision int `json:"revision"`
	// Supersedes is the revision this one replaced, 0 if none.
	Supersedes int `json:"supersedes,omitempty"`
	// Unchanged: identical to the current revision, so nothing was written.
	Unchanged bool `json:"unchanged,omitempty"`
}

// FileResult is the outcome of ingesting one file.
type FileResult struct {
	Path    string  `json:"path"`
	Name    string  `json:"name"`
	Kind    Kind    `json:"kind,omitempty"` // empty when the header is not recognised
	Rows    int     `json:"rows"`           // data rows read
	Outcome Outcome `json:"outcome"`
	SHA256  string  `json:"sha256"`
	// Unchanged counts rows identical to rows already stored (no-ops).
	Unchanged int `json:"unchanged,omitempty"`
	// Errors are the validation failures of a rejected file, in line
	// order, at most IngestOptions.MaxErrors of them.
	Errors []RowError `json:"errors,omitempty"`
	// ErrorsTruncated: more errors were found than reported.
	ErrorsTruncated bool `json:"errors_truncated,omitempty"`
	// Snapshots lists the holdings snapshots of a holdings file.
	Snapshots []SnapshotRevision `json:"snapshots,omitempty"`
	// DuplicateOf names the accepted file with the same content.
	DuplicateOf string `json:"duplicate_of,omitempty"`
	// Quarantined is where a rejected file was moved, if a caller moved it.
	Quarantined string `json:"quarantined,omitempty"`
}

// Err returns the file's errors joined, or nil when it has none.
func (r *FileResult) Err() error {
	if len(r.Errors) == 0 {
		return nil
	}
	return &FileError{Result: r}
}

// FileError is the error of a rejected file; its text lists every
// reported row error, one a line.
type FileError struct{ Result *FileResult }

func (e *FileError) Error() string {
	s := make([]string, len(e.Result.Errors))
	for i := range e.Result.Errors {
		s[i] = e.Result.Errors[i].Error()
	}
	if e.Result.ErrorsTruncated {
		s = append(s, fmt.Sprintf("%s: more errors not shown", e.Result.Name))
	}
	return strings.Join(s, "\n")
}
