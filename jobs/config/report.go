package config

import (
	"os"
	"strings"

	"plumbline/report"
)

// Report configures the PDF pack: the [report] table.
type Report struct {
	// Firm is the name printed on the cover and in every page's footer.
	Firm string `toml:"firm" json:"firm"`
	// Paper is "A4" or "Letter".
	Paper string `toml:"paper" json:"paper"`
	// TemplateDir is a folder of text files that replace the shipped ones
	// of templates/report file by file (same names: sections.txt,
	// <section>.tmpl, footer.tmpl, email_*.tmpl); a file it lacks falls
	// back to the shipped one. Empty means the shipped texts only.
	TemplateDir string `toml:"template_dir" json:"template_dir"`
	// Sections lists the sections of the pack in print order; empty means
	// the order of sections.txt.
	Sections []string `toml:"sections" json:"sections"`
	// OutputDir is the folder the packs are written to.
	OutputDir string `toml:"output_dir" json:"output_dir"`
}

// defaultReport is the [report] table when the file does not set it.
func defaultReport() Report {
	return Report{
		Firm:      "Example Asset Management",
		Paper:     report.PaperA4,
		OutputDir: "packs",
	}
}

// validateReport checks the [report] table.
func (c *Config) validateReport() Errors {
	var es Errors
	r := c.Report
	if strings.TrimSpace(r.Firm) == "" {
		es = append(es, c.errAt("report.firm", "must not be empty"))
	}
	if r.Paper != report.PaperA4 && r.Paper != report.PaperLetter {
		es = append(es, c.errAt("report.paper", "%q: want %q or %q", r.Paper, report.PaperA4, report.PaperLetter))
	}
	if r.TemplateDir != "" {
		// A mistyped folder would otherwise fall back to the shipped texts
		// without a word.
		if fi, err := os.Stat(r.TemplateDir); err != nil {
			es = append(es, c.errAt("report.template_dir", "%v", err))
		} else if !fi.IsDir() {
			es = append(es, c.errAt("report.template_dir", "%q is not a folder", r.TemplateDir))
		} else if err := report.CheckTexts(os.DirFS(r.TemplateDir)); err != nil {
			es = append(es, c.errAt("report.template_dir", "%v", err))
		}
	}
	if r.Sections != nil && len(r.Sections) == 0 {
		es = append(es, c.errAt("report.sections", "at least one section is needed (or leave the key out)"))
	}
	seen := map[string]bool{}
	for _, s := range r.Sections {
		switch {
		case !report.ValidSection(s):
			es = append(es, c.errAt("report.sections", "unknown section %q (known: %s)", s, strings.Join(report.SectionNames(), ", ")))
		case seen[s]:
			es = append(es, c.errAt("report.sections", "section %q is listed twice", s))
		}
		seen[s] = true
	}
	if strings.TrimSpace(r.OutputDir) == "" {
		es = append(es, c.errAt("report.output_dir", "must not be empty"))
	}
	return es
}
