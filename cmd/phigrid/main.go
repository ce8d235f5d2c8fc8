// Command phigrid solves electrostatic field problems described in model
// files and writes reports, result files and pictures.
//
// Usage:
//
//	phigrid check MODEL            validate a model and estimate its cost
//	phigrid solve MODEL [-o DIR]   solve, print the report, write outputs
//	phigrid plot RESULT [-o DIR]   redraw pictures from a saved result
//	phigrid export-matrix MODEL    write the assembled system (Matrix Market)
//	phigrid bench                  run the solver benchmark ladder
//	phigrid help [COMMAND]         show help
//	phigrid version                print the version
//
// Exit status: 0 on success, 1 when a solve fails, 2 on bad usage or bad
// input. Errors go to stderr; results go to stdout or to files.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"strings"
)

// version is the program version; release builds set it with
// -ldflags "-X main.version=…".
var version = "0.1.0-dev"

// Exit statuses.
const (
	exitOK    = 0
	exitSolve = 1
	exitUsage = 2
)

// env is what a command runs with: its output streams and whether stderr
// is a terminal (for the progress bar).
type env struct {
	stdout, stderr io.Writer
	tty            bool
}

// command is one subcommand.
type command struct {
	name    string
	args    string // argument synopsis
	summary string
	help    string // paragraph(s) after the flags
	flags   func(fs *flag.FlagSet) any
	run     func(ctx context.Context, e *env, fs *flag.FlagSet, opts any) error
}

var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

// usageError is bad usage: exit status 2 with a hint.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

// inputError is bad input (a model or result file): exit status 2.
type inputError struct{ err error }

func (e *inputError) Error() string { return e.err.Error() }
func (e *inputError) Unwrap() error { return e.err }

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	tty := false
	if fi, err := os.Stderr.Stat(); err == nil && fi.Mode()&os.ModeCharDevice != 0 {
		tty = true
	}
	os.Exit(run(ctx, os.Args[1:], &env{stdout: os.Stdout, stderr: os.Stderr, tty: tty}))
}

// run executes the command line args and returns the exit status.
func run(ctx context.Context, args []string, e *env) int {
	if len(args) == 0 {
		writeOverview(e.stderr)
		return exitUsage
	}
	name := args[0]
	switch name {
	case "-h", "-help", "--help":
		name = "help"
	case "-version", "--version":
		name = "version"
	}
	c, ok := commands[name]
	if !ok {
		fmt.Fprintf(e.stderr, "phigrid: unknown command %q; run 'phigrid help' for the list\n", name)
		return exitUsage
	}
	fs := flag.NewFlagSet("phigrid "+c.name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	var opts any
	if c.flags != nil {
		opts = c.flags(fs)
	}
	if err := fs.Parse(interleave(fs, args[1:])); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			writeCommandHelp(e.stdout, c)
			return exitOK
		}
		fmt.Fprintf(e.stderr, "phigrid %s: %v\nusage: phigrid %s %s (see 'phigrid help %s')\n", c.name, err, c.name, c.args, c.name)
		return exitUsage
	}
	err := c.run(ctx, e, fs, opts)
	if err == nil {
		return exitOK
	}
	var ue *usageError
	var ie *inputError
	switch {
	case errors.As(err, &ue):
		fmt.Fprintf(e.stderr, "phigrid %s: %v\nusage: phigrid %s %s (see 'phigrid help %s')\n", c.name, err, c.name, c.args, c.name)
		return exitUsage
	case errors.As(err, &ie):
		fmt.Fprintf(e.stderr, "phigrid %s: %v\n", c.name, err)
		return exitUsage
	case errors.Is(err, context.Canceled):
		fmt.Fprintf(e.stderr, "phigrid %s: cancelled; no output was written\n", c.name)
		return exitSolve
	default:
		fmt.Fprintf(e.stderr, "phigrid %s: %v\n", c.name, err)
		return exitSolve
	}
}

// interleave moves flags after positional arguments to the front, so that
// "phigrid solve model.toml -o out" works as well as the flag-first order.
func interleave(fs *flag.FlagSet, args []string) []string {
	var flags, pos []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			pos = append(pos, args[i+1:]...)
			break
		}
		if strings.HasPrefix(a, "-") && len(a) > 1 {
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if strings.Contains(name, "=") {
				continue
			}
			if f := fs.Lookup(name); f != nil {
				if bf, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && bf.IsBoolFlag() {
					continue
				}
				if i+1 < len(args) {
					flags = append(flags, args[i+1])
					i++
				}
			}
			continue
		}
		pos = append(pos, a)
	}
	return append(flags, pos...)
}

func writeOverview(w io.Writer) {
	fmt.Fprintln(w, "phigrid computes electrostatic fields of planar and axisymmetric geometries.")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "usage: phigrid COMMAND [ARGUMENTS]")
	fmt.Fprintln(w)
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Slice(names, func(i, j int) bool { return order(names[i]) < order(names[j]) })
	for _, n := range names {
		c := commands[n]
		fmt.Fprintf(w, "  %-14s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Run 'phigrid help COMMAND' for a command's arguments and flags.")
}

func order(name string) int {
	for i, n := range []string{"check", "solve", "plot", "export-matrix", "bench", "help", "version"} {
		if n == name {
			return i
		}
	}
	return 100
}

func writeCommandHelp(w io.Writer, c *command) {
	fmt.Fprintf(w, "usage: phigrid %s %s\n\n%s\n", c.name, c.args, c.summary)
	if c.flags != nil {
		fs := flag.NewFlagSet(c.name, flag.ContinueOnError)
		c.flags(fs)
		n := 0
		fs.VisitAll(func(*flag.Flag) { n++ })
		if n > 0 {
			fmt.Fprintln(w, "\nflags:")
			fs.SetOutput(w)
			fs.PrintDefaults()
		}
	}
	if c.help != "" {
		fmt.Fprintf(w, "\n%s\n", strings.TrimSpace(c.help))
	}
}

func init() {
	register(&command{
		name:    "help",
		args:    "[COMMAND]",
		summary: "show help for phigrid or one command",
		run: func(ctx context.Context, e *env, fs *flag.FlagSet, _ any) error {
			switch fs.NArg() {
			case 0:
				writeOverview(e.stdout)
				return nil
			case 1:
				c, ok := commands[fs.Arg(0)]
				if !ok {
					return &usageError{fmt.Sprintf("unknown command %q", fs.Arg(0))}
				}
				writeCommandHelp(e.stdout, c)
				return nil
			}
			return &usageError{"help takes at most one command name"}
		},
	})
	register(&command{
		name:    "version",
		summary: "print the version",
		run: func(ctx context.Context, e *env, fs *flag.FlagSet, _ any) error {
			if fs.NArg() != 0 {
				return &usageError{"version takes no arguments"}
			}
			fmt.Fprintln(e.stdout, "phigrid", version)
			return nil
		},
	})
}
