package config

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReportDefaults: the defaults of [report] validate (A4 is the ISO 216
// size used outside North America, hence the default; common practice).
func TestReportDefaults(t *testing.T) {
	r := defaultReport()
	if r.Firm != "Example Asset Management" || r.Paper != "A4" || r.OutputDir != "packs" || r.Sections != nil || r.TemplateDir != "" {
		t.Errorf("defaultReport() = %+v", r)
	}
	c := Default()
	c.Report = r
	if es := c.validateReport(); len(es) > 0 {
		t.Errorf("defaults do not validate: %v", es)
	}
}

// reportErrors parses doc and returns the problems of its [report] table,
// whether Parse already reports them or validateReport does.
func reportErrors(t *testing.T, doc string) Errors {
	t.Helper()
	c, err := Parse("plumbline.toml", []byte(doc))
	if err != nil {
		var es Errors
		if errors.As(err, &es) {
			return es
		}
		var e *Error
		if errors.As(err, &e) {
			return Errors{e}
		}
		t.Fatal(err)
	}
	return c.validateReport()
}

func TestReportValidation(t *testing.T) {
	good := t.TempDir()
	if err := os.WriteFile(filepath.Join(good, "cautions.tmpl"), []byte(`{{define "title"}}Read first{{end}}`), 0o644); err != nil {
		t.Fatal(err)
	}
	broken := t.TempDir()
	if err := os.WriteFile(filepath.Join(broken, "summary.tmpl"), []byte(`{{define "title"}}{{.Doc{{end}}`), 0o644); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(good, "cautions.tmpl")
	table := func(lines ...string) string {
		base := map[string]string{"firm": `"Quillfeather Asset Partners"`, "paper": `"A4"`, "output_dir": `"packs"`}
		var b strings.Builder
		b.WriteString("[report]\n")
		for _, l := range lines {
			k, _, _ := strings.Cut(l, " =")
			delete(base, k)
			b.WriteString(l + "\n")
		}
		for _, k := range []string{"firm", "paper", "output_dir"} {
			if v, ok := base[k]; ok {
				b.WriteString(k + " = " + v + "\n")
			}
		}
		return b.String()
	}
	tests := []struct {
		name string
		doc  string
		key  string // "" when valid
		line int
	}{
		{"letter", table(`paper = "Letter"`), "", 0},
		{"sections", table(`sections = ["cover", "summary", "appendix"]`), "", 0},
		{"template dir", table(`template_dir = "` + good + `"`), "", 0},
		{"paper", table(`paper = "A3"`), "report.paper", 2},
		{"paper case", table(`paper = "letter"`), "report.paper", 2},
		{"empty firm", table(`firm = " "`), "report.firm", 2},
		{"empty output dir", table(`output_dir = ""`), "report.output_dir", 2},
		{"unknown section", table(`sections = ["summary", "charts"]`), "report.sections", 2},
		{"repeated section", table(`sections = ["summary", "summary"]`), "report.sections", 2},
		{"no sections", table(`sections = []`), "report.sections", 2},
		{"missing template dir", table(`template_dir = "` + filepath.Join(good, "nope") + `"`), "report.template_dir", 2},
		{"template dir is a file", table(`template_dir = "` + file + `"`), "report.template_dir", 2},
		{"broken template", table(`template_dir = "` + broken + `"`), "report.template_dir", 2},
	}
	for _, tt := range tests {
		es := reportErrors(t, tt.doc)
		if tt.key == "" {
			if len(es) > 0 {
				t.Errorf("%s: unexpected errors %v", tt.name, es)
			}
			continue
		}
		if len(es) != 1 || es[0].Key != tt.key || es[0].Line != tt.line {
			t.Errorf("%s: errors %v, want one for %s at line %d", tt.name, es, tt.key, tt.line)
		}
	}
}
