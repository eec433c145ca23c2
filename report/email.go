package report

import (
	"fmt"
	"io/fs"
	"strings"

	"plumbline/risk/pack"
)

// EmailBodies renders the subject and the plain-text and HTML bodies of
// the e-mail that goes out with a pack: headline figures, limit breaches
// and warnings, flagged changes, data-quality findings and the cautions.
// texts overrides the embedded email_*.tmpl files (nil for the defaults).
func EmailBodies(doc *pack.Document, meta Meta, texts fs.FS) (subject, text, html string, err error) {
	if doc == nil {
		return "", "", "", fmt.Errorf("report: e-mail: nil document: %w", ErrDocument)
	}
	fsys := textsFS(texts)
	data, err := textData(doc, meta, fsys)
	if err != nil {
		return "", "", "", err
	}
	tx := newTexts(fsys, data)
	if subject, err = tx.get(fileEmailSubj, ""); err != nil {
		return "", "", "", err
	}
	// A subject is one line whatever the template's layout.
	subject = strings.Join(strings.Fields(subject), " ")
	if text, err = tx.get(fileEmailText, ""); err != nil {
		return "", "", "", err
	}
	text += "\n"
	if html, err = tx.html(fileEmailHTML); err != nil {
		return "", "", "", err
	}
	return subject, text, html, nil
}

// wrap breaks s into lines of at most width characters at spaces,
// keeping blank lines between paragraphs.
func wrap(width int, s string) string {
	var out []string
	for _, para := range splitParagraphs(s) {
		var lines []string
		line := ""
		for _, w := range strings.Fields(para) {
			if line != "" && len(line)+1+len(w) > width {
				lines = append(lines, line)
				line = ""
			}
			if line != "" {
				line += " "
			}
			line += w
		}
		if line != "" {
			lines = append(lines, line)
		}
		out = append(out, strings.Join(lines, "\n"))
	}
	return strings.Join(out, "\n\n")
}
