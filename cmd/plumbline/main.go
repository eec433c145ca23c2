// Command plumbline builds, stores, renders and delivers weekly equity risk
// packs. main only dispatches to one subcommand per file.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"os"
	"os/signal"
	"reflect"
	"sort"
	"strings"
	"syscall"
	"text/tabwriter"
)

// Exit codes, documented in the README.
const (
	exitOK       = 0 // success
	exitFailure  = 1 // any failure not listed below
	exitUsage    = 2 // bad command line
	exitRejected = 3 // ingest: some files rejected; verify: results differ
)

// command is one subcommand. Usage returns a paragraph of plain English
// followed by the flags; Run receives the arguments after the command name.
type command interface {
	Name() string
	Synopsis() string
	Usage() string
	Run(ctx context.Context, env *Env, args []string) error
}

// Env is what a subcommand may touch of the outside world, so tests can
// capture output and run commands in-process.
type Env struct {
	Stdout io.Writer
	Stderr io.Writer
	Getenv func(string) string
	Logger *slog.Logger
}

// exitError carries a specific exit code up to main.
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string {
	if e.err == nil {
		return fmt.Sprintf("exit status %d", e.code)
	}
	return e.err.Error()
}
func (e *exitError) Unwrap() error { return e.err }

// usageError marks a bad command line (exit code 2).
func usageError(format string, a ...any) error {
	return &exitError{code: exitUsage, err: fmt.Errorf(format, a...)}
}

var commands = map[string]command{}

func register(c command) { commands[c.Name()] = c }

// lookup returns a fresh zero value of the named command, so flag values
// never carry from one run to the next (tests run many in one process).
func lookup(name string) (command, bool) {
	c, ok := commands[name]
	if !ok {
		return nil, false
	}
	return reflect.New(reflect.TypeOf(c).Elem()).Interface().(command), true
}

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	env := &Env{Stdout: os.Stdout, Stderr: os.Stderr, Getenv: os.Getenv}
	env.Logger = slog.New(slog.NewTextHandler(os.Stderr, &slog.HandlerOptions{Level: logLevel(os.Getenv("PLUMBLINE_LOG"))}))
	code := run(ctx, env, os.Args[1:])
	stop()
	os.Exit(code)
}

// run dispatches args to a subcommand and maps its error to an exit code.
func run(ctx context.Context, env *Env, args []string) int {
	if env.Logger == nil {
		env.Logger = slog.New(slog.NewTextHandler(env.Stderr, nil))
	}
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		if len(args) > 1 {
			if c, ok := lookup(args[1]); ok {
				fmt.Fprint(env.Stdout, c.Usage())
				return exitOK
			}
		}
		printTopUsage(env.Stdout)
		if len(args) == 0 {
			return exitUsage
		}
		return exitOK
	}
	if args[0] == "version" || args[0] == "--version" {
		fmt.Fprintf(env.Stdout, "plumbline %s\n", version())
		return exitOK
	}
	c, ok := lookup(args[0])
	if !ok {
		fmt.Fprintf(env.Stderr, "plumbline: unknown command %q; run 'plumbline --help' for the list\n", args[0])
		return exitUsage
	}
	err := c.Run(ctx, env, args[1:])
	if err == nil {
		return exitOK
	}
	var ee *exitError
	if errors.As(err, &ee) {
		if ee.err != nil {
			fmt.Fprintf(env.Stderr, "plumbline %s: %v\n", c.Name(), ee.err)
		}
		return ee.code
	}
	fmt.Fprintf(env.Stderr, "plumbline %s: %v\n", c.Name(), err)
	return exitFailure
}

func printTopUsage(w io.Writer) {
	fmt.Fprint(w, `Plumbline builds the weekly equity risk pack for each portfolio: it loads
end-of-day files into SQLite, measures rate and growth sensitivities, returns,
volatility, VaR and stress losses, renders a PDF, mails it, and keeps an
append-only history for audits.

Usage: plumbline <command> [flags] [arguments]

Commands:
`)
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	for _, n := range names {
		fmt.Fprintf(tw, "  %s\t%s\n", n, commands[n].Synopsis())
	}
	tw.Flush()
	fmt.Fprint(w, `
Run 'plumbline help <command>' or 'plumbline <command> --help' for details.
Exit codes: 0 success; 1 failure; 2 bad command line; 3 some input rejected
(ingest) or a recomputation differs (verify).
Logs go to standard error; set PLUMBLINE_LOG=debug|info|warn|error.
`)
}

func logLevel(s string) slog.Level {
	switch strings.ToLower(s) {
	case "debug":
		return slog.LevelDebug
	case "warn":
		return slog.LevelWarn
	case "error":
		return slog.LevelError
	}
	return slog.LevelInfo
}
