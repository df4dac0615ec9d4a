// Command fifthline hears held notes and names them as spelled notes in a
// declared key, temperament and reference pitch; README.md is for its users
// and docs/interface.md is the command-line contract.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/pprof"
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

// command is one of fifthline's commands; args is what follows the flags
// on its usage line.
type command struct {
	name, args, summary string
	run                 func(e *env, args []string) error
}

// commandTable is every command, in the order help lists them: what a
// musician does first comes first.
func commandTable() []command {
	return []command{
		{"targets", "", "the key's twelve spelled notes and where each should sound", runTargets},
		{"listen", "", "the live meter on an input device (--plain: one CSV line per held note)", runListen},
		{"demo", "", "the live meter fed by an embedded performance, no microphone needed", runDemo},
		{"drone", "", "sound the tonic and fifth, or --notes, at their targets (quietly; Ctrl-C stops)", runDrone},
		{"analyze", "FILE...", "read recordings and list their held notes (or the frame track)", runAnalyze},
		{"report", "JOURNAL...", "how each spelled note sat over rehearsals, from journals written with --log", runReport},
		{"tuning", "", "the tuning in force and where it comes from; --save keeps it for this folder", runTuning},
		{"keyboard", "", "the key's temperament for a 12-key keyboard as MIDI Tuning Standard (.syx or .mid)", runKeyboard},
		{"devices", "", "the audio devices PortAudio sees, defaults marked", runDevices},
	}
}

// lookupCommand finds a command by name.
func lookupCommand(name string) (command, bool) {
	for _, c := range commandTable() {
		if c.name == name {
			return c, true
		}
	}
	return command{}, false
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
	switch {
	case len(args) == 0:
		// A usage error like any other: one line (the contract), saying
		// where the overview is.
		fmt.Fprintf(e.stderr, "fifthline: say what to do: %s ('fifthline help' says what each does)\n", strings.Join(commandNames(), ", "))
		return 2
	case args[0] == "-h" || args[0] == "--help" || args[0] == "-help":
		printHelp(e.stdout)
		return 0
	case args[0] == "--version" || args[0] == "-version" || args[0] == "version":
		fmt.Fprintln(e.stdout, "fifthline", programVersion())
		return 0
	case args[0] == "help" && len(args) > 1:
		// "fifthline help analyze" is "fifthline analyze -h".
		args = []string{args[1], "-h"}
	case args[0] == "help":
		printHelp(e.stdout)
		return 0
	}
	cmd, ok := lookupCommand(args[0])
	if !ok {
		fmt.Fprintln(e.stderr, "fifthline: "+unknownCommand(args[0]))
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

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

func commandNames() []string {
	var names []string
	for _, c := range commandTable() {
		names = append(names, c.name)
	}
	return names
}

func printHelp(w io.Writer) {
	fmt.Fprintln(w, "fifthline — hear a held note as the spelled note your key and temperament mean")
	fmt.Fprintln(w, "\nusage: fifthline COMMAND [flags] [FILE or JOURNAL...]\n\ncommands:")
	for _, c := range commandTable() {
		fmt.Fprintf(w, "  %-9s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w, "\nmusical flags: --key \"G major\" --temperament equal|meantone:1/4|edo:31|… --a4 440")
	fmt.Fprintln(w, "               --anchor a4|tonic --chord \"D major\" --seventh 16/9 --transpose Bb")
	fmt.Fprintln(w, "               (absent ones come from ./fifthline.toml, see 'fifthline help tuning')")
	fmt.Fprintln(w, "'fifthline help COMMAND' lists a command's flags; 'fifthline --version' says which fifthline this is.")
}
