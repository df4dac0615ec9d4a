package main

import (
	"math"
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

// --level takes a level as a mixer writes it, the unit after the number and
// the minus sign typeset or not; what is no number is refused.
func TestALevelMayCarryItsUnit(t *testing.T) {
	for in, want := range map[string]float64{"-20": -20, "-20dB": -20, "-20 dBFS": -20, "−12 dbfs": -12, " -18.5DB ": -18.5} {
		var d dbfs
		if err := d.Set(in); err != nil || float64(d) != want {
			t.Errorf("--level %q: %v, %v; want %g", in, float64(d), err, want)
		}
	}
	for _, in := range []string{"loud", "dB", "", "NaN", "-20 dB FS"} {
		var d dbfs
		if err := d.Set(in); err == nil {
			t.Errorf("--level %q accepted as %g", in, float64(d))
		}
	}
}

// A level that parses is a number, whatever was typed around it.
func FuzzLevelFlag(f *testing.F) {
	for _, s := range []string{"-18", "-20dB", "−6 dBFS", "dB", "1e309"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var d dbfs
		if err := d.Set(s); err == nil && math.IsNaN(float64(d)) {
			t.Fatalf("%q → NaN", s)
		}
	})
}
