package report

import (
	"bytes"
	"fmt"

	"github.com/ledongthuc/pdf"
)

func newPDFReader(b []byte) (*pdf.Reader, error) {
	r, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		return nil, fmt.Errorf("report: read pdf: %w", err)
	}
	return r, nil
}
