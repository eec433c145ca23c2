package report

import "errors"

// Errors returned (wrapped) by this package; test with errors.Is.
var (
	// ErrSection: an unknown or repeated section name.
	ErrSection = errors.New("invalid section")
	// ErrTemplate: a text template that does not parse or execute.
	ErrTemplate = errors.New("invalid text template")
	// ErrPaper: a paper size other than "A4" or "Letter".
	ErrPaper = errors.New("unsupported paper size")
	// ErrDocument: a document that cannot be rendered (nil, or of an
	// unknown schema).
	ErrDocument = errors.New("document cannot be rendered")
)
