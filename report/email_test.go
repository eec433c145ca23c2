package report

import (
	"errors"
	"strings"
	"testing"
	"testing/fstest"
)

func TestEmailBodies(t *testing.T) {
	doc, meta := fixtureDoc(20), fixtureMeta()
	meta.Firm = "Quillfeather & Wren"
	subj, text, html, err := EmailBodies(doc, meta, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The fixture has one breach, one warning and one flagged metric.
	if want := "Meridian Income risk pack as of 2025-06-13: 1 limit breach, 1 warning, 1 flagged change"; subj != want {
		t.Errorf("subject %q, want %q", subj, want)
	}
	s := doc.Summary
	for _, want := range []string{
		"Quillfeather & Wren",
		Money(s.Value, "USD"),
		Pct(*s.Returns.Week),
		Years(*s.ModifiedDuration),
		"BREACH   Daily VaR budget",
		"Warning  Sector cap",
		"Modified duration: " + Years(*s.ModifiedDuration),
		"not investment advice",
		"licensed professionals",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("text body lacks %q", want)
		}
	}
	// Lines of the cautions are wrapped at 72 characters.
	cautions := text[strings.Index(text, "CAUTIONS"):]
	for _, l := range strings.Split(cautions, "\n") {
		if len(l) > 72 {
			t.Errorf("line longer than 72: %q", l)
		}
	}
	// html/template escapes text for HTML: "&" becomes the character
	// reference "&amp;" (Go documentation of html/template; HTML standard).
	if !strings.Contains(html, "Quillfeather &amp; Wren") || strings.Contains(html, "Quillfeather & Wren") {
		t.Error("firm name not escaped in the HTML body")
	}
	if !strings.Contains(html, "Daily VaR budget") || !strings.Contains(html, "licensed professionals") {
		t.Error("HTML body lacks the breach or the cautions")
	}
}

func TestEmailNoBreaches(t *testing.T) {
	doc := fixtureDoc(20)
	doc.Limits = nil
	doc.Drift = nil
	subj, text, _, err := EmailBodies(doc, fixtureMeta(), nil)
	if err != nil {
		t.Fatal(err)
	}
	if subj != "Meridian Income risk pack as of 2025-06-13: no limit breaches" {
		t.Errorf("subject %q", subj)
	}
	if !strings.Contains(text, "No limits are configured.") || !strings.Contains(text, "No headline figure moved") {
		t.Errorf("text body: %s", text)
	}
}

func TestEmailOverride(t *testing.T) {
	over := fstest.MapFS{"email_subject.tmpl": {Data: []byte("Pack {{.Doc.AsOf}}\n  run {{.Meta.RunID}}")}}
	subj, _, _, err := EmailBodies(fixtureDoc(20), fixtureMeta(), over)
	if err != nil {
		t.Fatal(err)
	}
	if subj != "Pack 2025-06-13 run 42" {
		t.Errorf("subject %q", subj)
	}
	bad := fstest.MapFS{"email_text.tmpl": {Data: []byte("{{.Missing}}")}}
	if _, _, _, err := EmailBodies(fixtureDoc(20), fixtureMeta(), bad); !errors.Is(err, ErrTemplate) {
		t.Errorf("err = %v, want ErrTemplate", err)
	}
}

func TestWrap(t *testing.T) {
	got := wrap(10, "aaa bbb ccc ddd\n\neee")
	if want := "aaa bbb\nccc ddd\n\neee"; got != want {
		t.Errorf("wrap = %q, want %q", got, want)
	}
}
