// Command fifthline hears held notes and names them as spelled notes in a
// declared key, temperament and reference pitch; see README.md and
// ../../../shared/interface.md for the command-line contract.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/pprof"
	"sort"
	"strings"
	"syscall"
)

// env is what a command may touch: its streams and a context cancelled by
// Ctrl-C or SIGTERM, so that commands stop cleanly and keep what they wrote.
type env struct {
	ctx    context.Context
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
}

type command struct {
	run     func(e *env, args []string) error
	summary string
}

var commands = map[string]command{}

// register adds a command; each command's file registers itself in init.
func register(name, summary string, run func(e *env, args []string) error) {
	commands[name] = command{run: run, summary: summary}
}

// usageError is a mistake in how the program was called: exit status 2.
type usageError struct{ msg string }

func (u usageError) Error() string { return u.msg }

func usagef(format string, args ...any) error { return usageError{fmt.Sprintf(format, args...)} }

// errHelp: help was asked for and printed; exit 0.
var errHelp = errors.New("help")

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	// The first signal asks for a clean stop; a second one, if the stop
	// hangs (a device that will not close), ends the process at once.
	context.AfterFunc(ctx, stop)
	stopProfile := startProfile(os.Getenv("FIFTHLINE_CPUPROFILE"))
	code := run(&env{ctx: ctx, stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr}, os.Args[1:])
	stopProfile()
	stop()
	os.Exit(code)
}

// startProfile writes a CPU profile to path (for contributors measuring the
// live path: FIFTHLINE_CPUPROFILE=cpu.out fifthline demo); "" does nothing.
func startProfile(path string) (stop func()) {
	if path == "" {
		return func() {}
	}
	f, err := os.Create(path)
	if err == nil {
		err = pprof.StartCPUProfile(f)
	}
	if err != nil {
		fmt.Fprintf(os.Stderr, "fifthline: warning: no CPU profile: %v\n", err)
		return func() {}
	}
	return func() { pprof.StopCPUProfile(); f.Close() }
}

// run dispatches and turns errors into the contract's exit codes: 0 success,
// 2 usage, 1 anything else, each error one line starting "fifthline: ".
func run(e *env, args []string) (code int) {
	defer func() {
		// A bug must still end in one line, not a stack trace.
		if r := recover(); r != nil {
			fmt.Fprintf(e.stderr, "fifthline: internal error: %v\n", oneLine(fmt.Sprint(r)))
			code = 1
		}
	}()
	if len(args) == 0 || args[0] == "help" || args[0] == "-h" || args[0] == "--help" {
		printHelp(e.stderr)
		if len(args) == 0 {
			return 2
		}
		return 0
	}
	cmd, ok := commands[args[0]]
	if !ok {
		fmt.Fprintf(e.stderr, "fifthline: unknown command %q (try: %s)\n", args[0], strings.Join(commandNames(), ", "))
		return 2
	}
	err := cmd.run(e, args[1:])
	var u usageError
	switch {
	case err == nil, errors.Is(err, errHelp):
		return 0
	case errors.As(err, &u):
		fmt.Fprintf(e.stderr, "fifthline: %s\n", oneLine(u.msg))
		return 2
	default:
		fmt.Fprintf(e.stderr, "fifthline: %s\n", oneLine(err.Error()))
		return 1
	}
}

// doubleDash spells flag names in the flag package's messages the way this
// program documents them, with two dashes.
var doubleDash = strings.NewReplacer("flag -", "flag --", "argument: -", "argument: --", "defined: -", "defined: --")

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

func commandNames() []string {
	var names []string
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

func printHelp(w io.Writer) {
	fmt.Fprintln(w, "fifthline — hear a held note as the spelled note your key and temperament mean")
	fmt.Fprintln(w, "\nusage: fifthline COMMAND [flags]\n\ncommands:")
	for _, n := range commandNames() {
		fmt.Fprintf(w, "  %-9s %s\n", n, commands[n].summary)
	}
	fmt.Fprintln(w, "\nmusical flags: --key \"G major\" --temperament equal|meantone:1/4|edo:31|… --a4 440")
	fmt.Fprintln(w, "               --anchor a4|tonic --chord \"D major\" --transpose Bb")
	fmt.Fprintln(w, "'fifthline COMMAND -h' lists a command's flags.")
}

// newFlags makes a flag set that reports errors as usage errors instead of
// printing to stderr itself.
func newFlags(name string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	return fs
}

// parseFlags parses flags that may come before, between or after positional
// arguments, and returns the positional ones. -h prints the command's flags.
func parseFlags(e *env, fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				fs.SetOutput(e.stderr)
				fmt.Fprintf(e.stderr, "usage: fifthline %s [flags]\n", fs.Name())
				fs.PrintDefaults()
				return nil, errHelp
			}
			return nil, usagef("%s: %s", fs.Name(), doubleDash.Replace(err.Error()))
		}
		args = fs.Args()
		if len(args) == 0 {
			return pos, nil
		}
		if args[0] == "--" {
			return append(pos, args[1:]...), nil
		}
		pos = append(pos, args[0])
		args = args[1:]
	}
}
