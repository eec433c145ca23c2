package main

import (
	"regexp"
	"strings"
	"testing"
)

// Every registered command answers --help with its usage line, a
// paragraph of plain English and its flags, exit 0; `plumbline help CMD`
// prints the same text.
func TestEveryCommandHelp(t *testing.T) {
	if len(commands) == 0 {
		t.Fatal("no commands registered")
	}
	// Commands that take no flag at all; any other must list its flags.
	noFlags := map[string]bool{"init": true}
	flagLine := regexp.MustCompile(`(?m)^  --[a-z][a-z0-9-]*( [A-Z]+)?\n      \S`)
	for name := range commands {
		t.Run(name, func(t *testing.T) {
			stdout, stderr, code := runCmd(t, name, "--help")
			if code != exitOK || stderr != "" {
				t.Fatalf("exit %d, stderr %q", code, stderr)
			}
			head, flags, ok := strings.Cut(stdout, "\nFlags:\n")
			if noFlags[name] {
				if ok {
					t.Errorf("listed as taking no flags, but has a flags section:\n%s", stdout)
				}
			} else if !ok || !flagLine.MatchString(flags) {
				t.Errorf("no flags section:\n%s", stdout)
			}
			parts := strings.SplitN(head, "\n\n", 2)
			if !strings.HasPrefix(parts[0], "Usage: plumbline "+name) {
				t.Errorf("first line %q", parts[0])
			}
			if len(parts) < 2 || len(strings.Fields(parts[1])) < 12 || !strings.HasSuffix(strings.TrimSpace(parts[1]), ".") {
				t.Errorf("no paragraph of explanation:\n%s", stdout)
			}
			if again, _, code := runCmd(t, "help", name); code != exitOK || again != stdout {
				t.Errorf("help %s: exit %d, differs from --help", name, code)
			}
		})
	}
}
