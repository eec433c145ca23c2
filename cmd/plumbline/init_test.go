package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"plumbline/jobs/config"
	"plumbline/templates"
)

// `plumbline init` with no PATH writes ./plumbline.toml; its output is
// testdata/init/default/want.txt.
func TestInitGolden(t *testing.T) {
	golden, err := filepath.Abs(filepath.Join("testdata", "init", "default", "want.txt"))
	if err != nil {
		t.Fatal(err)
	}
	t.Chdir(t.TempDir())
	stdout, stderr, code := runCmd(t, "init")
	if code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	checkGolden(t, golden, stdout)
	got, err := os.ReadFile("plumbline.toml")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, templates.DefaultConfig()) {
		t.Fatal("the written file is not templates.DefaultConfig")
	}
}

// The written file loads with config.Load, with the permissions promised
// (0640: owner read/write, group read; common practice for a service's
// configuration that names where a secret is kept), and a path with a
// space is quoted in the next steps so they can be pasted into a POSIX
// shell (POSIX.1-2017 XCU 2.2.2, single quotes).
func TestInitWritesLoadableFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "risk desk", "plumbline.toml")
	if err := os.Mkdir(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	stdout, stderr, code := runCmd(t, "init", path)
	if code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	if !strings.Contains(stdout, "plumbline pack --config '"+path+"'\n") {
		t.Errorf("next steps do not quote the path:\n%s", stdout)
	}
	fi, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if fi.Mode().Perm() != 0o640 {
		t.Errorf("mode %v, want -rw-r-----", fi.Mode().Perm())
	}
	cfg, err := config.Load(path)
	if err != nil {
		t.Fatalf("config.Load: %v", err)
	}
	if cfg.Path() != path || len(cfg.Limits) == 0 {
		t.Errorf("loaded %q with %d limits", cfg.Path(), len(cfg.Limits))
	}
}

// An existing file is left untouched and the command fails with exit 1.
func TestInitRefusesToOverwrite(t *testing.T) {
	path := filepath.Join(t.TempDir(), "plumbline.toml")
	const mine = "base_currency = \"EUR\"\n"
	if err := os.WriteFile(path, []byte(mine), 0o600); err != nil {
		t.Fatal(err)
	}
	stdout, stderr, code := runCmd(t, "init", path)
	if code != exitFailure {
		t.Fatalf("exit %d, want %d", code, exitFailure)
	}
	if stdout != "" || !strings.Contains(stderr, path+" already exists") {
		t.Errorf("stdout %q, stderr %q", stdout, stderr)
	}
	if b, _ := os.ReadFile(path); string(b) != mine {
		t.Errorf("the file was changed: %q", b)
	}
	if _, _, code := runCmd(t, "init", "a.toml", "b.toml"); code != exitUsage {
		t.Errorf("two paths: exit %d, want %d", code, exitUsage)
	}
}
