package report

import (
	"errors"
	"slices"
	"testing"
	"testing/fstest"

	"plumbline/templates"
)

// The shipped sections.txt prints every section the renderer knows, in
// the order SectionNames documents.
func TestShippedSections(t *testing.T) {
	got, err := readSections(templates.Report())
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(got, SectionNames()) {
		t.Errorf("sections.txt = %q, want %q", got, SectionNames())
	}
}

func TestCheckSections(t *testing.T) {
	tests := []struct {
		list []string
		ok   bool
	}{
		{[]string{"summary"}, true},
		{SectionNames(), true},
		{[]string{"summary", "appendix", "cover"}, true},
		{nil, false},
		{[]string{"summary", "Summary"}, false},
		{[]string{"summary", "summary"}, false},
	}
	for _, tt := range tests {
		err := CheckSections(tt.list)
		if (err == nil) != tt.ok || (err != nil && !errors.Is(err, ErrSection)) {
			t.Errorf("CheckSections(%q) = %v", tt.list, err)
		}
	}
}

func TestReadSectionsLine(t *testing.T) {
	fsys := fstest.MapFS{"sections.txt": {Data: []byte("# comment\n\nsummary\ngraphs\n")}}
	_, err := readSections(fsys)
	if !errors.Is(err, ErrSection) || err.Error() != `report: sections.txt: line 4: unknown section "graphs": invalid section` {
		t.Errorf("err = %v", err)
	}
}
