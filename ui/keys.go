package ui

import (
	"fmt"
	"math"
	"strings"

	"fifthline/target"
)

// action changes the tuning for a key press and says what it did; start is
// the tuning the meter began with.
type action func(cur, start target.Tuning) (target.Tuning, string)

// binding is one key of the meter: the keys that trigger it (tcell key
// names such as "Right", or single characters), how the help shows them,
// and what it does.
type binding struct {
	Keys  []string
	Label string
	What  string
	Act   action
}

// bindings are the meter's tuning keys, in the order the help lists them.
// Help, quit and the sound keys are the meter's own (?, h, Esc, q; d, s,
// space: see Sound).
var bindings = []binding{
	{[]string{"Right", "l"}, "→", "tonic one fifth up the line (C → G)", func(t, _ target.Tuning) (target.Tuning, string) { return moveTonic(t, 1) }},
	{[]string{"Left", "j"}, "←", "tonic one fifth down the line (C → F)", func(t, _ target.Tuning) (target.Tuning, string) { return moveTonic(t, -1) }},
	{[]string{"m"}, "m M", "next / previous mode", func(t, _ target.Tuning) (target.Tuning, string) { return cycleMode(t, 1) }},
	{[]string{"M"}, "", "", func(t, _ target.Tuning) (target.Tuning, string) { return cycleMode(t, -1) }},
	{[]string{"t"}, "t T", "next / previous temperament", func(t, _ target.Tuning) (target.Tuning, string) { return cycleTemperament(t, 1) }},
	{[]string{"T"}, "", "", func(t, _ target.Tuning) (target.Tuning, string) { return cycleTemperament(t, -1) }},
	{[]string{"Up", "+"}, "↑ ↓", "A4 up / down 1 Hz", func(t, _ target.Tuning) (target.Tuning, string) { return nudgeA4(t, 1) }},
	{[]string{"Down", "-"}, "", "", func(t, _ target.Tuning) (target.Tuning, string) { return nudgeA4(t, -1) }},
	{[]string{"]"}, "] [", "A4 up / down 0.1 Hz", func(t, _ target.Tuning) (target.Tuning, string) { return nudgeA4(t, 0.1) }},
	{[]string{"["}, "", "", func(t, _ target.Tuning) (target.Tuning, string) { return nudgeA4(t, -0.1) }},
	{[]string{"r"}, "r", "back to the tuning the meter started with", func(_, s target.Tuning) (target.Tuning, string) { return s, "back to " + tuningWords(s) }},
}

// maxSignature is where key signatures stop (seven sharps or flats).
const maxSignature = 7

// moveTonic moves the key's tonic steps places along the line of fifths,
// keeping the mode. It refuses to go past seven sharps or flats and says so.
func moveTonic(tu target.Tuning, steps int) (target.Tuning, string) {
	k := tu.Key
	k.Tonic = k.Tonic.Transpose(target.Interval{Fifths: steps})
	k.Tonic.Octave = 4
	if sig := k.Signature(); sig > maxSignature || sig < -maxSignature {
		return tu, fmt.Sprintf("%s would need %s; the keys stop at seven", k.Pretty(), signatureWords(sig))
	}
	tu.Key = k
	return tu, "key " + k.Pretty() + " (" + signatureWords(k.Signature()) + ")"
}

func signatureWords(sig int) string {
	switch {
	case sig == 0:
		return "no sharps or flats"
	case sig == 1:
		return "1 sharp"
	case sig == -1:
		return "1 flat"
	case sig > 0:
		return fmt.Sprintf("%d sharps", sig)
	}
	return fmt.Sprintf("%d flats", -sig)
}

// cycleMode steps through target.Modes on the same tonic. A mode whose
// signature would pass seven sharps or flats is skipped.
func cycleMode(tu target.Tuning, step int) (target.Tuning, string) {
	i := 0
	for j, m := range target.Modes {
		if m == tu.Key.Mode {
			i = j
		}
	}
	n := len(target.Modes)
	for range n {
		i = ((i+step)%n + n) % n
		k := target.Key{Tonic: tu.Key.Tonic, Mode: target.Modes[i]}
		if s := k.Signature(); s <= maxSignature && s >= -maxSignature {
			tu.Key = k
			return tu, "key " + k.Pretty()
		}
	}
	return tu, "no other mode on " + tu.Key.Tonic.PrettyName()
}

// cycleTemperament steps through target.Builtin. From a temperament not in
// the list (a custom file, fifth:CENTS) it starts at the list's first.
func cycleTemperament(tu target.Tuning, step int) (target.Tuning, string) {
	i := -1
	for j, s := range target.Builtin {
		if tu.Temperament != nil && strings.EqualFold(s, tu.Temperament.Spec()) {
			i = j
		}
	}
	n := len(target.Builtin)
	if i < 0 {
		i = map[bool]int{true: -1, false: 0}[step > 0]
	}
	i = ((i+step)%n + n) % n
	tm, err := target.ParseTemperament(target.Builtin[i])
	if err != nil { // a built-in spec always parses; keep the old one if not
		return tu, "temperament " + target.Builtin[i] + ": " + err.Error()
	}
	tu.Temperament = tm
	return tu, "temperament " + tm.Name()
}

// nudgeA4 moves the reference by delta hertz, kept to a tenth of a hertz and
// within target.MinA4 … target.MaxA4.
func nudgeA4(tu target.Tuning, delta float64) (target.Tuning, string) {
	a := math.Round((tu.A4+delta)*10) / 10
	a = math.Max(target.MinA4, math.Min(target.MaxA4, a))
	tu.A4 = a
	return tu, fmt.Sprintf("A4 = %.1f Hz", a)
}

// tuningWords is the tuning in the status line's words.
func tuningWords(tu target.Tuning) string { return strings.Join(tuningParts(tu), " · ") }

// tuningParts are tuningWords' parts, the ones a narrow screen can spare
// last: key, temperament, reference, then what more there is.
func tuningParts(tu target.Tuning) []string {
	a4 := fmt.Sprintf("A4 = %.1f Hz", tu.A4)
	if tu.Anchored() == target.AnchorTonic {
		a4 += " (tonic anchored)"
	}
	parts := []string{tu.Key.Pretty(), tu.Temperament.Name(), a4}
	if tu.SharesPitches() {
		parts = append(parts, "F♯ = G♭") // enharmonic spellings share one pitch: said once, not on every note
	}
	if tu.Chord != nil {
		parts = append(parts, "chord "+tu.Chord.String())
	}
	if tu.Transpose.IsConcert() {
		// "Concert pitch" beside "A4 = 415 Hz" reads as a claim about the
		// reference; sounding against written pitch is what it means here.
		return append(parts, "sounding pitch")
	}
	return append(parts, "written for an instrument in "+prettyAccidentals(tu.Transpose.Name))
}

// prettyAccidentals writes a user's note text ("Bb", "F#") with signs.
func prettyAccidentals(s string) string {
	if n, err := target.ParseName(s); err == nil {
		return n.PrettyName()
	}
	if n, err := target.ParseNote(s); err == nil {
		return n.Pretty()
	}
	return s
}
