package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io/fs"
	"os"
	"strings"

	"plumbline/templates"
)

func init() { register(&initCmd{}) }

type initCmd struct {
	fs *flag.FlagSet
}

func (c *initCmd) Name() string     { return "init" }
func (c *initCmd) Synopsis() string { return "write a commented default configuration file" }

func (c *initCmd) flags() *flag.FlagSet {
	if c.fs == nil {
		c.fs = newFlags(c)
	}
	return c.fs
}

func (c *initCmd) Usage() string {
	return usageText("init [PATH]", `
Writes a configuration file to PATH (default ./plumbline.toml) to start from:
every setting with the value used when it is left out and a line saying what
it means and in which unit, a starting set of risk limits, and examples of the
optional tables (your own scenarios, replay periods, downloads, recipients)
switched off. The file is created readable by its owner and group only. An
existing file is never overwritten.`, c.flags())
}

// configFileMode keeps the file from other users: it names the mail
// account and where its password is kept.
const configFileMode fs.FileMode = 0o640

func (c *initCmd) Run(ctx context.Context, env *Env, args []string) error {
	pos, err := parseArgs(c, env, c.flags(), args)
	if err != nil {
		return err
	}
	if len(pos) > 1 {
		return usageError("want at most one PATH, got %d", len(pos))
	}
	path := "plumbline.toml"
	if len(pos) == 1 {
		path = pos[0]
	}
	if err := writeNewFile(path, templates.DefaultConfig(), configFileMode); err != nil {
		return err
	}
	p := shellWord(path)
	fmt.Fprintf(env.Stdout, `Wrote %s

Next steps:
  1. Edit it: base_currency, [report] firm, the [[limit]] levels, and for the
     daemon [schedule], [[portfolio]] recipients and [mail].
  2. Load the end-of-day files:   plumbline ingest --config %s FILE-OR-FOLDER...
  3. Build this week's packs:     plumbline pack --config %s
  4. Or let the daemon do both:   plumbline serve --config %s
`, path, p, p, p)
	return nil
}

// writeNewFile creates path with data and mode, failing when it exists.
func writeNewFile(path string, data []byte, mode fs.FileMode) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, mode)
	if errors.Is(err, fs.ErrExist) {
		return fmt.Errorf("%s already exists; it was left as it is (remove it or give another PATH)", path)
	}
	if err != nil {
		return err
	}
	// The umask may have taken bits away; the mode is part of the promise.
	err = f.Chmod(mode)
	if err == nil {
		_, err = f.Write(data)
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(path)
		return fmt.Errorf("write %s: %w", path, err)
	}
	return nil
}

// shellWord quotes s when a POSIX shell would split or expand it.
func shellWord(s string) string {
	if s != "" && !strings.ContainsAny(s, " \t\n'\"\\$`*?[]#~&;|<>(){}!") {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
