// Command plumbline-bench measures Plumbline against reference tools:
//
//	plumbline-bench <name> [flags]
//
// Each benchmark lives in its own file and registers itself in init().
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"syscall"
)

// benchFunc runs one benchmark with its arguments and prints its report.
type benchFunc func(ctx context.Context, args []string, stdout io.Writer) error

// benches maps a benchmark name to its function; files add to it in init.
var benches = map[string]benchFunc{}

// register adds a benchmark (for init functions).
func register(name string, fn benchFunc) { benches[name] = fn }

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		usage(stderr)
		return 2
	}
	fn, ok := benches[args[0]]
	if !ok {
		fmt.Fprintf(stderr, "plumbline-bench: unknown benchmark %q\n", args[0])
		usage(stderr)
		return 2
	}
	if err := fn(ctx, args[1:], stdout); err != nil {
		fmt.Fprintf(stderr, "plumbline-bench %s: %v\n", args[0], err)
		return 1
	}
	return 0
}

func usage(w io.Writer) {
	names := make([]string, 0, len(benches))
	for n := range benches {
		names = append(names, n)
	}
	sort.Strings(names)
	fmt.Fprintln(w, "Usage: plumbline-bench <benchmark> [flags]   (plumbline-bench <benchmark> -h for its flags)")
	fmt.Fprintln(w, "Benchmarks:")
	for _, n := range names {
		fmt.Fprintln(w, "  "+n)
	}
}
