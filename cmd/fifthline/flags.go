package main

// Flags as the commands share them: parsed wherever they stand among the
// arguments, errors as usage errors, and -h written the way the README
// documents flags (--name, with the old names beside the new).

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"runtime/debug"
	"slices"
	"strings"
	"time"

	"fifthline/internal/typo"
	"fifthline/target"
	"fifthline/tuningfile"
)

// version is set at build time (make install passes git describe); a
// binary built otherwise asks Go's build information.
var version = ""

func programVersion() string {
	if version != "" {
		return version
	}
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" && bi.Main.Version != "(devel)" {
		return bi.Main.Version
	}
	return "(built from source)"
}

// newFlags makes a flag set that reports errors as usage errors instead of
// printing to stderr itself.
func newFlags(name string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	return fs
}

// doubleDash spells flag names in the flag package's messages the way this
// program documents them, with two dashes.
var doubleDash = strings.NewReplacer("flag -", "flag --", "argument: -", "argument: --", "defined: -", "defined: --", "\" for -", "\" for --")

// parseFlags parses flags that may come before, between or after positional
// arguments, and returns the positional ones. -h prints the command's flags.
func parseFlags(e *env, fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				printUsage(e.stdout, fs)
				return nil, errHelp
			}
			return nil, usagef("%s: %s", fs.Name(), doubleDash.Replace(withHint(fs, err.Error())))
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

// printUsage is a command's -h: its usage line with the arguments it takes,
// then each flag with two dashes, its old names beside it.
func printUsage(w io.Writer, fs *flag.FlagSet) {
	c, _ := lookupCommand(fs.Name())
	fmt.Fprintln(w, strings.TrimSpace(fmt.Sprintf("usage: fifthline %s [flags] %s", fs.Name(), c.args)))
	if c.summary != "" {
		fmt.Fprintf(w, "%s\n", c.summary)
	}
	fmt.Fprintln(w, "\nflags:")
	oldNames := map[string][]string{}
	fs.VisitAll(func(f *flag.Flag) {
		if now, ok := strings.CutPrefix(f.Usage, oldNamePrefix); ok {
			oldNames[now] = append(oldNames[now], "--"+f.Name)
		}
	})
	fs.VisitAll(func(f *flag.Flag) {
		if strings.HasPrefix(f.Usage, oldNamePrefix) {
			return
		}
		line := "  --" + f.Name
		usage := f.Usage
		if kind := valueName(fs.Name(), f); kind != "" {
			line += " " + kind
		}
		if old := oldNames[f.Name]; len(old) > 0 {
			line += "   (also " + strings.Join(old, ", ") + ")"
		}
		if f.DefValue != "" && f.DefValue != "false" && f.DefValue != "0" && f.DefValue != "0s" {
			usage += fmt.Sprintf(" (default %s)", f.DefValue)
		}
		fmt.Fprintf(w, "%s\n      %s\n", line, usage)
	})
	// Commands with the usual defaults read the tuning files (the demo
	// keeps its score's tuning instead).
	if k := fs.Lookup("key"); k != nil && k.DefValue == target.Default().Key.String() {
		fmt.Fprintf(w, "\nAbsent musical flags come from ./%s (this folder's tuning), else from\n%s, else the defaults;\n'fifthline tuning' shows which, 'fifthline tuning --save' keeps flags for this folder.\n",
			tuningfile.Name, showPath(userTuningPath()))
	}
}

// valueNames name what a flag takes, as the README writes it.
var valueNames = map[string]string{
	"key": `"TONIC MODE"`, "temperament": "SPEC", "a4": "HZ", "anchor": "a4|tonic", "chord": `"ROOT QUALITY"`,
	"transpose": "NOTE", "level": "DBFS", "log": "FILE", "player": "NAME", "device": "ID", "output": "ID",
	"notes": "NOTE,NOTE", "plot": "FILE.png|FILE.svg", "since": "DATE", "channel": "N", "tolerance": "CENTS",
	"octave": "N", "duration": "D", "players": "NAMES", "voices": "N|auto", "seventh": "7/4|9/5|16/9", "recorded": "DATE|TIME",
	"mts": "notes|bulk|octave", "by": "rehearsal",
}

// commandValueNames are valueNames for one command's flag of a name that
// takes something else elsewhere (keyboard's --output is a file, the
// others' a device).
var commandValueNames = map[string]string{"keyboard output": "FILE.syx|FILE.mid"}

// valueName is what the command's flag takes: a choice's words, a name
// from valueNames, or the kind of value; "" for a switch.
func valueName(command string, f *flag.Flag) string {
	if c, ok := f.Value.(*choice); ok {
		return strings.Join(c.words(), "|")
	}
	if n, ok := commandValueNames[command+" "+f.Name]; ok {
		return n
	}
	if n, ok := valueNames[f.Name]; ok {
		return n
	}
	kind, _ := flag.UnquoteUsage(f)
	return map[string]string{"string": "TEXT", "float": "NUMBER", "int": "N", "duration": "D", "value": "VALUE"}[kind]
}

// oldNamePrefix marks a flag kept for an old name; -h lists it beside the
// new one.
const oldNamePrefix = "old name of --"

// oldName keeps an old flag name working for the flag now called name.
func oldName(fs *flag.FlagSet, old, name string) {
	fs.Var(fs.Lookup(name).Value, old, oldNamePrefix+name)
}

// choice is a flag whose value is one of a few words; -h lists them and a
// wrong one is refused with the list.
type choice struct {
	value   string
	options []string
}

func (c *choice) String() string { return c.value }

func (c *choice) Set(s string) error {
	for _, o := range c.options {
		if strings.EqualFold(s, o) {
			c.value = o
			return nil
		}
	}
	return fmt.Errorf("use %s", orList(c.words()))
}

// words are the options a player can type: an empty first option is "not
// given", no word.
func (c *choice) words() []string {
	return slices.DeleteFunc(slices.Clone(c.options), func(o string) bool { return o == "" })
}

// choiceFlag defines a choice flag; the first option is the default.
func choiceFlag(fs *flag.FlagSet, name, usage string, options ...string) *string {
	c := &choice{value: options[0], options: options}
	fs.Var(c, name, usage)
	return &c.value
}

// orList writes "table, csv or json".
func orList(words []string) string {
	if len(words) < 2 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " or " + words[len(words)-1]
}

// channelOrPlayers refuses --channel beside --players: the contract's listen
// takes one of --channel N, --players NAMES and --voices N|auto, and
// --players already says each player's channel (3=vla,1=vc), so a --channel
// beside it would be silently ignored.
func channelOrPlayers(fs *flag.FlagSet) error {
	if wasSet(fs, "channel") && wasSet(fs, "players") {
		return usagef("--channel and --players cannot go together: --players says each player's channel (3=vla,1=vc)")
	}
	return nil
}

// withHint replaces the flag package's bare "parse error" with what the flag
// takes: "--duration 5" is refused with "give a duration like 12s or 2m".
func withHint(fs *flag.FlagSet, msg string) string {
	if name, ok := strings.CutPrefix(msg, "flag provided but not defined: -"); ok {
		return unknownFlag(fs, name)
	}
	rest, ok := strings.CutSuffix(msg, ": parse error")
	if !ok {
		return msg
	}
	_, name, ok := strings.Cut(rest, " for flag -")
	if !ok { // a boolean's: invalid boolean value "maybe" for -plain
		_, name, _ = strings.Cut(rest, " for -")
	}
	f := fs.Lookup(name)
	if f == nil {
		return msg
	}
	g, ok := f.Value.(flag.Getter)
	if !ok {
		return msg
	}
	switch g.Get().(type) {
	case time.Duration:
		return rest + ": give a duration like 12s or 2m"
	case float64:
		return rest + ": give a number"
	case int, int64, uint, uint64:
		return rest + ": give a whole number"
	case bool:
		return rest + ": give true or false"
	}
	return msg
}

// unknownCommand names the command nearest a slip (anlyze), as unknownFlag
// does for flags, else lists them all.
func unknownCommand(name string) string {
	if near, ok := typo.Nearest(name, commandNames()); ok {
		return fmt.Sprintf("unknown command %q (did you mean %s?)", name, near)
	}
	return fmt.Sprintf("unknown command %q (try: %s)", name, strings.Join(commandNames(), ", "))
}

// unknownFlag says a flag the command lacks in a player's words, with the
// flag it nearest spells (a slip: --temperment) or where the flags are listed.
func unknownFlag(fs *flag.FlagSet, name string) string {
	name = strings.TrimLeft(name, "-")
	var names []string
	fs.VisitAll(func(f *flag.Flag) { names = append(names, f.Name) })
	if near, ok := typo.Nearest(name, names); ok {
		return fmt.Sprintf("--%s is not one of its flags (did you mean --%s?)", name, near)
	}
	return fmt.Sprintf("--%s is not one of its flags ('fifthline help %s' lists them)", name, fs.Name())
}
