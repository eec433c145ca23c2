package main

import (
	"bufio"
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"syscall"
	"testing"
	"time"

	"plumbline/store"
)

func TestServeUsage(t *testing.T) {
	var out, errOut bytes.Buffer
	env := &Env{Stdout: &out, Stderr: &errOut, Getenv: func(string) string { return "" }}
	if code := run(context.Background(), env, []string{"serve", "--help"}); code != exitOK {
		t.Fatalf("serve --help: exit %d", code)
	}
	for _, want := range []string{"Usage: plumbline serve", "SIGTERM", "shutdown_grace", "--config FILE"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("usage lacks %q:\n%s", want, out.String())
		}
	}
	out.Reset()
	if code := run(context.Background(), env, []string{"serve", "extra"}); code != exitUsage {
		t.Fatalf("serve with an argument: exit %d, want %d", code, exitUsage)
	}
}

// TestServeStopsOnSIGTERM builds the binary, starts `plumbline serve`, and
// sends it SIGTERM: it stops within the grace period with exit code 0,
// after recording the job it ran at start.
func TestServeStopsOnSIGTERM(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "plumbline")
	build := exec.Command("go", "build", "-o", bin, ".")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	cfgPath := filepath.Join(dir, "plumbline.toml")
	cfg := `database = "` + filepath.Join(dir, "p.db") + `"
[sources]
drop_dir = "` + filepath.Join(dir, "drop") + `"
[schedule]
time_zone = "Europe/Paris"
shutdown_grace = "5s"
[mail]
delivery = "folder"
folder = "` + filepath.Join(dir, "mail") + `"
[status]
listen = "127.0.0.1:0"
`
	if err := os.WriteFile(cfgPath, []byte(cfg), 0o600); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(bin, "serve", "--config", cfgPath)
	cmd.Env = append(os.Environ(), "PLUMBLINE_LOG=debug")
	stderr, err := cmd.StderrPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer cmd.Process.Kill()
	lines := make(chan string, 100)
	var all strings.Builder
	go func() {
		sc := bufio.NewScanner(stderr)
		for sc.Scan() {
			lines <- sc.Text()
		}
		close(lines)
	}()
	waitLine := func(re *regexp.Regexp) {
		if re.MatchString(all.String()) {
			return
		}
		deadline := time.After(30 * time.Second)
		for {
			select {
			case l, ok := <-lines:
				if !ok {
					t.Fatalf("serve exited before logging %v:\n%s", re, all.String())
				}
				all.WriteString(l + "\n")
				if re.MatchString(l) {
					return
				}
			case <-deadline:
				t.Fatalf("no log line %v within 30s:\n%s", re, all.String())
			}
		}
	}
	waitLine(regexp.MustCompile(`msg="daemon started"`))
	waitLine(regexp.MustCompile(`msg="job had nothing to do".*job=outbox`))
	if err := cmd.Process.Signal(syscall.SIGTERM); err != nil {
		t.Fatal(err)
	}
	waitLine(regexp.MustCompile(`msg="daemon stopped"`))
	for l := range lines {
		all.WriteString(l + "\n")
	}
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	select {
	case err := <-done:
		if err != nil {
			t.Fatalf("serve exited with %v:\n%s", err, all.String())
		}
	case <-time.After(10 * time.Second):
		t.Fatal("serve did not exit after SIGTERM")
	}
	db, err := store.Open(context.Background(), filepath.Join(dir, "p.db"))
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	recs, err := db.JobRuns(context.Background(), "outbox", 10)
	if err != nil || len(recs) == 0 || recs[0].Outcome != store.JobSkipped || recs[0].EndedAt.IsZero() {
		t.Fatalf("outbox job records %+v, %v", recs, err)
	}
}
