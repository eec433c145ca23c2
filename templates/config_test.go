package templates_test

import (
	"bytes"
	"encoding"
	"reflect"
	"regexp"
	"slices"
	"strings"
	"testing"

	toml "github.com/pelletier/go-toml/v2"

	"plumbline/jobs/config"
	"plumbline/templates"
)

// The reference for every value in plumbline.toml is config.Default, the
// one place defaults are defined; the reference for the file's syntax is
// the TOML v1.0.0 specification (toml.io/en/v1.0.0), read through
// go-toml v2.

// TestDefaultConfigIsDefaults: the file read by config.Parse gives exactly
// config.Default, plus the file's starting limits (Default has none).
func TestDefaultConfigIsDefaults(t *testing.T) {
	got, err := config.Parse("plumbline.toml", templates.DefaultConfig())
	if err != nil {
		t.Fatalf("the default configuration does not load:\n%v", err)
	}
	if len(got.Limits) == 0 {
		t.Fatal("the default configuration has no [[limit]] tables")
	}
	want := config.Default()
	want.Limits = slices.Clone(got.Limits)
	gj, err := got.Canonical()
	if err != nil {
		t.Fatal(err)
	}
	wj, err := want.Canonical()
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(gj, wj) {
		t.Fatalf("plumbline.toml differs from config.Default:\nfile:    %s\ndefault: %s", gj, wj)
	}
}

// switchedOff matches an example line switched off: "#" straight before a
// key or a table header (explanations start with "# ").
var switchedOff = regexp.MustCompile(`^#([a-z_\[])`)

// examplesOn returns the file with every example switched on.
func examplesOn(b []byte) []byte {
	lines := strings.Split(string(b), "\n")
	for i, l := range lines {
		lines[i] = switchedOff.ReplaceAllString(l, "$1")
	}
	return []byte(strings.Join(lines, "\n"))
}

// TestDefaultConfigExamplesLoad: the examples switched off in the file are
// valid when switched on.
func TestDefaultConfigExamplesLoad(t *testing.T) {
	on := examplesOn(templates.DefaultConfig())
	if bytes.Equal(on, templates.DefaultConfig()) {
		t.Fatal("no example is switched off in plumbline.toml")
	}
	c, err := config.Parse("plumbline.toml (examples on)", on)
	if err != nil {
		t.Fatalf("an example does not load:\n%v", err)
	}
	if len(c.Scenarios) != 1 || len(c.Stress.Replays) != 1 || len(c.Sources.HTTP) != 1 || len(c.Portfolios) != 1 || c.Report.Sections == nil {
		t.Fatalf("examples read: %d scenarios, %d replays, %d HTTP sources, %d portfolios, sections %v",
			len(c.Scenarios), len(c.Stress.Replays), len(c.Sources.HTTP), len(c.Portfolios), c.Report.Sections)
	}
	// The examples' own values of the HTTP source are the defaults that
	// apply when the keys are left out.
	h := c.Sources.HTTP[0]
	if h.Timeout.D() != config.DefaultHTTPTimeout || h.Retries != config.DefaultHTTPRetries ||
		h.Backoff.D() != config.DefaultHTTPBackoff || h.MaxBytes != config.DefaultHTTPMaxBytes {
		t.Errorf("[[sources.http]] example %+v does not show the defaults", h)
	}
}

// TestDefaultConfigNamesEveryKey walks the toml tags of config.Config and
// wants every key, in its table, in the file with its examples switched on.
func TestDefaultConfigNamesEveryKey(t *testing.T) {
	var doc map[string]any
	if err := toml.Unmarshal(examplesOn(templates.DefaultConfig()), &doc); err != nil {
		t.Fatal(err)
	}
	var missing []string
	walkKeys(reflect.TypeFor[config.Config](), "", func(path string) {
		if !hasKey(doc, strings.Split(path, ".")) {
			missing = append(missing, path)
		}
	})
	if len(missing) > 0 {
		t.Fatalf("keys missing from plumbline.toml: %s", strings.Join(missing, ", "))
	}
	// The walk itself must see the whole tree: a sample of keys from the
	// top, a table, an array of tables inside a table, and a leaf that is
	// a struct decoded from text.
	var all []string
	walkKeys(reflect.TypeFor[config.Config](), "", func(p string) { all = append(all, p) })
	for _, k := range []string{"database", "risk.ewma_lambda", "stress.replay.from", "sources.http.max_bytes", "schedule.job_timeout", "limit.breach_min"} {
		if !slices.Contains(all, k) {
			t.Errorf("the walk did not reach %s", k)
		}
	}
}

var textUnmarshaler = reflect.TypeFor[encoding.TextUnmarshaler]()

// walkKeys calls key with the dotted path of every leaf key under struct
// type t. A struct that decodes itself from text is a leaf.
func walkKeys(t reflect.Type, prefix string, key func(string)) {
	for f := range t.Fields() {
		name, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if !f.IsExported() || name == "" || name == "-" {
			continue
		}
		path := prefix + name
		ft := f.Type
		if ft.Kind() == reflect.Slice && ft.Elem().Kind() == reflect.Struct {
			ft = ft.Elem()
		}
		if ft.Kind() == reflect.Struct && !reflect.PointerTo(ft).Implements(textUnmarshaler) {
			walkKeys(ft, path+".", key)
			continue
		}
		key(path)
	}
}

// hasKey reports whether the decoded document has the key at path; for an
// array of tables, in at least one of its tables.
func hasKey(v any, path []string) bool {
	if len(path) == 0 {
		return true
	}
	switch x := v.(type) {
	case map[string]any:
		next, ok := x[path[0]]
		return ok && hasKey(next, path[1:])
	case []any:
		for _, e := range x {
			if hasKey(e, path) {
				return true
			}
		}
	}
	return false
}
