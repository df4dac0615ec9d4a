package ui

import (
	"strings"
	"testing"

	"fifthline/target"
)

func key(t *testing.T, s string) target.Key {
	t.Helper()
	k, err := target.ParseKey(s)
	if err != nil {
		t.Fatal(err)
	}
	return k
}

func TestKeysMoveTheTonicAlongTheLineOfFifths(t *testing.T) {
	for _, c := range []struct {
		from  string
		steps int
		want  string // "" when the move is refused
	}{
		{"C major", 1, "G major"},
		{"C major", -1, "F major"},
		{"B major", 1, "F♯ major"},
		{"F major", -1, "B♭ major"},
		{"D minor", 1, "A minor"},
		{"C# major", 1, ""}, // seven sharps is the last key signature (common practice)
		{"Cb major", -1, ""},
	} {
		tu := target.Default()
		tu.Key = key(t, c.from)
		got, msg := moveTonic(tu, c.steps)
		if c.want == "" {
			if got.Key != tu.Key || !strings.Contains(msg, "stop at seven") {
				t.Errorf("%s %+d: moved to %s (%q), want refused", c.from, c.steps, got.Key.Pretty(), msg)
			}
			continue
		}
		if got.Key.Pretty() != c.want || !strings.Contains(msg, c.want) {
			t.Errorf("%s %+d = %s (%q), want %s", c.from, c.steps, got.Key.Pretty(), msg, c.want)
		}
	}
}

func TestKeysCycleModesTemperamentsAndNudgeA4(t *testing.T) {
	tu := target.Default()
	if got, _ := cycleMode(tu, 1); got.Key.Pretty() != "C minor" {
		t.Errorf("next mode from C major: %s", got.Key.Pretty())
	}
	if got, _ := cycleMode(tu, -1); got.Key.Pretty() != "C locrian" {
		t.Errorf("previous mode from C major: %s", got.Key.Pretty())
	}
	next, msg := cycleTemperament(tu, 1)
	if next.Temperament.Spec() != target.Builtin[1] || !strings.Contains(msg, next.Temperament.Name()) {
		t.Errorf("next temperament after equal: %s (%q)", next.Temperament.Spec(), msg)
	}
	if prev, _ := cycleTemperament(tu, -1); prev.Temperament.Spec() != target.Builtin[len(target.Builtin)-1] {
		t.Errorf("previous temperament wraps to %s", prev.Temperament.Spec())
	}
	for _, c := range []struct{ from, by, want float64 }{
		{440, 1, 441}, {440, -0.1, 439.9}, {415, 0.1, 415.1}, {479.5, 1, target.MaxA4}, {380.05, -1, target.MinA4},
	} {
		tu.A4 = c.from
		if got, _ := nudgeA4(tu, c.by); got.A4 != c.want {
			t.Errorf("A4 %g %+g = %g, want %g", c.from, c.by, got.A4, c.want)
		}
	}
}

func TestEveryBindingIsInTheHelp(t *testing.T) {
	help := ""
	for _, l := range helpLines() {
		help += l.Text() + "\n"
	}
	for _, b := range bindings {
		if b.Label != "" && !strings.Contains(help, b.What) {
			t.Errorf("help lacks %q", b.What)
		}
	}
}

// A tuning line too wide for the screen loses whole parts from its end,
// never half a word ("soundi"): E♭ major in just intonation at A4 = 442 Hz,
// the tonic anchored (the contract's just), in 80 columns.
func TestATooWideTuningLineLosesWholeParts(t *testing.T) {
	just, err := target.ParseTemperament("just")
	if err != nil {
		t.Fatal(err)
	}
	choir := keyOf(t, "Eb major")
	choir.Temperament, choir.A4 = just, 442
	if got, want := tuningLine(newModel(choir, "x"), 80).Text(), "E♭ major · 5-limit just from the tonic · A4 = 442.0 Hz (tonic anchored)"; got != want {
		t.Errorf("in 80 columns: got %q, want %q", got, want)
	}
}
