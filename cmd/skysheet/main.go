// Command skysheet turns measured optical spectra into checked figures of
// merit and publishes them as a static site of material datasheets.
//
// Usage:
//
//	skysheet VERB [flags] ARGS
//
// Run "skysheet help" for the verbs and "skysheet VERB -h" for each one.
package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"sort"
)

// command is one verb of the CLI. Each verb lives in its own file and
// registers itself in init.
type command struct {
	name    string
	args    string // synopsis after the flags, e.g. "FILE..."
	summary string
	run     func(e *env, args []string) error
}

var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

// env is what a command may touch: its arguments come separately.
type env struct {
	stdout, stderr io.Writer
	stdin          io.Reader
	isTerminal     bool // stderr is a terminal (for progress bars)
}

// usageError marks bad usage: exit status 2.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, a ...any) error { return &usageError{fmt.Sprintf(format, a...)} }

// dataError marks findings that should fail a run without being an error of
// the program, such as a failed check: exit status 1, message already shown.
var errSilentFailure = errors.New("failed")

func main() {
	e := &env{stdout: os.Stdout, stderr: os.Stderr, stdin: os.Stdin, isTerminal: isTerminal(os.Stderr)}
	os.Exit(run(e, os.Args[1:]))
}

// run executes one command line and returns the exit status: 0 success,
// 1 bad data or failed checks, 2 bad usage, 130 stopped by a signal.
func run(e *env, args []string) int {
	// Text for a person is escaped on its way out (see escapeWriter).
	out, errs := escaping(e.stdout), escaping(e.stderr)
	e = &env{stdout: out, stderr: errs, stdin: e.stdin, isTerminal: e.isTerminal}
	defer flushAll(out, errs)
	if len(args) == 0 || args[0] == "help" || args[0] == "-h" || args[0] == "--help" {
		if len(args) > 1 {
			if c, ok := commands[args[1]]; ok {
				return run(e, []string{c.name, "-h"})
			}
		}
		help(e.stdout)
		if len(args) == 0 {
			return 2
		}
		return 0
	}
	if args[0] == "version" || args[0] == "--version" {
		fmt.Fprintln(e.stdout, "skysheet", version())
		return 0
	}
	c, ok := commands[args[0]]
	if !ok {
		fmt.Fprintf(e.stderr, "skysheet: unknown verb %q; run \"skysheet help\"\n", args[0])
		return 2
	}
	err := c.run(e, args[1:])
	var ue *usageError
	var fe *flagError
	switch {
	case err == nil:
		return 0
	case errors.Is(err, flag.ErrHelp):
		return 0
	case errors.As(err, &fe):
		fmt.Fprintf(e.stderr, "skysheet %s: %v (see skysheet %s -h)\n", c.name, fe.err, c.name)
		return 2
	case errors.As(err, &ue):
		fmt.Fprintf(e.stderr, "skysheet %s: %v\nusage: skysheet %s [flags] %s (see -h)\n", c.name, err, c.name, c.args)
		return 2
	case errors.Is(err, errSilentFailure):
		return 1
	case errors.Is(err, errInterrupted):
		fmt.Fprintf(e.stderr, "skysheet %s: %v\n", c.name, err)
		return 130 // the shells' status for a command stopped by Ctrl-C
	default:
		fmt.Fprintf(e.stderr, "skysheet %s: %v\n", c.name, err)
		return 1
	}
}

func help(w io.Writer) {
	fmt.Fprintln(w, "skysheet turns measured optical spectra into checked figures of merit and a static datasheet site.")
	fmt.Fprintln(w, "\nUsage: skysheet VERB [flags] ARGS\n\nVerbs:")
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-9s %s\n", n, commands[n].summary)
	}
	fmt.Fprintln(w, "  version   print the version")
	fmt.Fprintln(w, "\nRun \"skysheet VERB -h\" for a verb's flags.")
}

// newFlags returns a flag set for command c whose -h prints the verb's usage
// to stdout and whose errors are usage errors.
func newFlags(e *env, c *command) *flag.FlagSet {
	fs := flag.NewFlagSet(c.name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {
		fmt.Fprintf(e.stdout, "usage: skysheet %s [flags] %s\n\n%s\n\nFlags:\n", c.name, c.args, c.summary)
		fs.SetOutput(e.stdout)
		fs.PrintDefaults()
		fs.SetOutput(io.Discard)
	}
	return fs
}

// flagError is a bad flag: exit status 2, reported on one line that names
// the flag and points to the verb's -h.
type flagError struct{ err error }

func (e *flagError) Error() string { return e.err.Error() }

// parseFlags parses args, turning flag errors into [flagError]s. Flags may
// come before or after the positional arguments. -h prints the verb's usage
// once and returns [flag.ErrHelp].
func parseFlags(fs *flag.FlagSet, args []string) ([]string, error) {
	// The flag package calls Usage itself on every error; the usage is
	// printed here instead, for -h only.
	usage := fs.Usage
	fs.Usage = func() {}
	defer func() { fs.Usage = usage }()
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				usage()
				return nil, err
			}
			return nil, &flagError{err}
		}
		args = fs.Args()
		if len(args) == 0 {
			return pos, nil
		}
		pos = append(pos, args[0])
		args = args[1:]
	}
}
