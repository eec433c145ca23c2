package report

import (
	"errors"
	"io/fs"
	"testing"
	"testing/fstest"
)

func TestCheckTexts(t *testing.T) {
	if err := CheckTexts(nil); err != nil {
		t.Errorf("shipped texts: %v", err)
	}
	good := fstest.MapFS{"cover.tmpl": {Data: []byte(`{{define "title"}}Risk figures{{end}}`)}}
	if err := CheckTexts(good); err != nil {
		t.Errorf("good override: %v", err)
	}
	for name, over := range map[string]fstest.MapFS{
		"unclosed action":  {"summary.tmpl": {Data: []byte(`{{define "title"}}{{.Doc{{end}}`)}},
		"unknown function": {"extra.tmpl": {Data: []byte(`{{frobnicate 1}}`)}},
		"bad html":         {"email_html.tmpl": {Data: []byte(`<p>{{end}}</p>`)}},
	} {
		if err := CheckTexts(over); !errors.Is(err, ErrTemplate) {
			t.Errorf("%s: err = %v, want ErrTemplate", name, err)
		}
	}
	if err := CheckTexts(fstest.MapFS{"sections.txt": {Data: []byte("cover\nnope\n")}}); !errors.Is(err, ErrSection) {
		t.Errorf("bad sections.txt: err = %v", err)
	}
}

// The overlay serves the override's file when it has one, else the
// shipped one.
func TestOverlay(t *testing.T) {
	o := textsFS(fstest.MapFS{"cautions.tmpl": {Data: []byte("ours")}})
	b, err := fs.ReadFile(o, "cautions.tmpl")
	if err != nil || string(b) != "ours" {
		t.Errorf("override: %q, %v", b, err)
	}
	b, err = fs.ReadFile(o, "summary.tmpl")
	if err != nil || len(b) == 0 || string(b) == "ours" {
		t.Errorf("fallback: %q, %v", b, err)
	}
	if _, err := fs.ReadFile(o, "absent.tmpl"); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("absent file: %v", err)
	}
}
