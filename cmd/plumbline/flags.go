package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"plumbline/jobs/config"
	"plumbline/store"
)

// errHelp is returned by parseArgs after printing the usage for --help.
var errHelp = &exitError{code: exitOK}

// newFlags returns a silent flag set for c: parseArgs reports its errors
// and prints c's usage for --help.
func newFlags(c command) *flag.FlagSet {
	fs := flag.NewFlagSet(c.Name(), flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	return fs
}

// parseArgs parses flags that may come before, between or after the
// positional arguments and returns the positional ones.
func parseArgs(c command, env *Env, fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				fmt.Fprint(env.Stdout, c.Usage())
				return nil, errHelp
			}
			return nil, usageError("%v (see 'plumbline %s --help')", err, c.Name())
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, nil
		}
		if rest[0] == "--" {
			return append(pos, rest[1:]...), nil
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

// flagHelp renders the flags of fs for a Usage text.
func flagHelp(fs *flag.FlagSet) string {
	var b strings.Builder
	fs.VisitAll(func(f *flag.Flag) {
		name, usage := flag.UnquoteUsage(f)
		fmt.Fprintf(&b, "  --%s", f.Name)
		if name != "" {
			fmt.Fprintf(&b, " %s", name)
		}
		fmt.Fprintf(&b, "\n      %s", usage)
		if f.DefValue != "" && f.DefValue != "false" {
			fmt.Fprintf(&b, " (default %s)", f.DefValue)
		}
		b.WriteString("\n")
	})
	return b.String()
}

// usageText joins a synopsis line, a paragraph and the flags.
func usageText(line, paragraph string, fs *flag.FlagSet) string {
	s := "Usage: plumbline " + line + "\n\n" + strings.TrimSpace(paragraph) + "\n"
	if fs != nil {
		if h := flagHelp(fs); h != "" {
			s += "\nFlags:\n" + h
		}
	}
	return s
}

// common holds the flags every data command takes.
type common struct {
	configPath string
	dbPath     string
}

func (cm *common) register(fs *flag.FlagSet) {
	fs.StringVar(&cm.configPath, "config", "", "TOML configuration `FILE` (default: built-in defaults)")
	fs.StringVar(&cm.dbPath, "db", "", "SQLite database `PATH` (default: the config's database, else ./plumbline.db)")
}

// load reads the configuration and applies --db.
func (cm *common) load() (*config.Config, error) {
	cfg, err := config.Load(cm.configPath)
	if err != nil {
		return nil, err
	}
	if cm.dbPath != "" {
		cfg.Database = cm.dbPath
	}
	return cfg, nil
}

// writeJSON prints v as indented JSON, the stable form for scripts.
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// open loads the configuration, applies --db and opens the database
// (creating and migrating it). The caller closes the database.
func (cm *common) open(ctx context.Context) (*config.Config, *store.DB, error) {
	cfg, err := cm.load()
	if err != nil {
		return nil, nil, err
	}
	db, err := store.Open(ctx, cfg.Database)
	if err != nil {
		return nil, nil, err
	}
	return cfg, db, nil
}

// parseDate reads an ISO 8601 calendar date flag.
func parseDate(name, s string) (time.Time, error) {
	if s == "" {
		return time.Time{}, nil
	}
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		return time.Time{}, usageError("--%s: %q is not a YYYY-MM-DD date", name, s)
	}
	return t, nil
}

// oneRunID reads the single run id argument of show, verify and render.
func oneRunID(pos []string) (int64, error) {
	if len(pos) != 1 {
		return 0, usageError("want one run id")
	}
	return parseRunID(pos[0])
}

// parseRunID reads a run id argument.
func parseRunID(s string) (int64, error) {
	id, err := strconv.ParseInt(s, 10, 64)
	if err != nil || id <= 0 {
		return 0, usageError("%q is not a run id (a positive integer)", s)
	}
	return id, nil
}

// listFlag collects a repeatable string flag.
type listFlag []string

func (l *listFlag) String() string     { return strings.Join(*l, ",") }
func (l *listFlag) Set(s string) error { *l = append(*l, s); return nil }
