package main

import (
	"strings"
	"testing"
)

// A flag value that does not parse is a one-line usage error (interface
// contract) that says what the flag takes, not only "parse error": listen's
// --duration takes a Go duration (`12s`, `2m`, the contract's words).
func TestBadFlagValuesSayWhatTheFlagTakes(t *testing.T) {
	for _, c := range []struct {
		args []string
		says string
	}{
		{[]string{"listen", "--duration", "5"}, `invalid value "5" for flag --duration: give a duration like 12s or 2m`},
		{[]string{"drone", "--level", "loud"}, `for flag --level: give a number`},
		{[]string{"analyze", "--channel", "left", "x.wav"}, `for flag --channel: give a whole number`},
		{[]string{"listen", "--plain=maybe"}, `invalid boolean value "maybe" for --plain: give true or false`},
	} {
		code, out, stderr := runCLI(t, c.args...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, c.says) || out != "" {
			t.Errorf("%v: %q, want it to say %q", c.args, stderr, c.says)
		}
	}
}

// A command's name mistyped is a usage error (exit 2, interface contract)
// that names the command meant, as a mistyped flag does; a word near none
// lists the commands.
func TestAMistypedCommandNamesTheOneMeant(t *testing.T) {
	for _, c := range []struct{ name, says string }{
		{"anlyze", `unknown command "anlyze" (did you mean analyze?)`},
		{"lisen", `unknown command "lisen" (did you mean listen?)`},
		{"tune", `unknown command "tune" (`},
		{"xyzzy", `unknown command "xyzzy" (try: targets, listen,`},
	} {
		code, out, stderr := runCLI(t, c.name)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, c.says) || out != "" {
			t.Errorf("%s: %q, want it to say %q", c.name, stderr, c.says)
		}
	}
}
