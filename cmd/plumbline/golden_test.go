package main

import (
	"bytes"
	"context"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

// update rewrites golden files: go test ./cmd/plumbline -run NAME -update
var update = flag.Bool("update", false, "rewrite the golden files under testdata")

func updateGolden() bool { return *update }

// runCmd runs a command line in-process and returns stdout, stderr and the
// exit code.
func runCmd(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	var out, errOut bytes.Buffer
	env := &Env{Stdout: &out, Stderr: &errOut, Getenv: func(string) string { return "" }}
	code := run(context.Background(), env, args)
	return out.String(), errOut.String(), code
}

// checkGolden compares got with the file at path byte for byte, after
// rewriting the file when -update is set.
func checkGolden(t *testing.T, path, got string) {
	t.Helper()
	if updateGolden() {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("output differs from %s:\n--- got\n%s--- want\n%s", path, got, want)
	}
}
