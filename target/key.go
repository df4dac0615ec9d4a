package target

import (
	"fmt"
	"regexp"
	"strings"
)

// Mode is a diatonic mode. Its value is how many fifths the tonic sits above
// the lowest note (in fifths order) of the mode's diatonic set: Lydian's tonic
// is the lowest, Locrian's the highest.
type Mode int

// The seven diatonic modes; Major is Ionian and Minor is Aeolian.
const (
	Lydian     Mode = 0
	Major      Mode = 1
	Mixolydian Mode = 2
	Dorian     Mode = 3
	Minor      Mode = 4
	Phrygian   Mode = 5
	Locrian    Mode = 6
)

var modeNames = map[string]Mode{
	"major": Major, "ionian": Major, "maj": Major,
	"minor": Minor, "aeolian": Minor, "min": Minor,
	"dorian": Dorian, "phrygian": Phrygian, "lydian": Lydian,
	"mixolydian": Mixolydian, "locrian": Locrian,
}

// String is the mode's usual name.
func (m Mode) String() string {
	return [...]string{"lydian", "major", "mixolydian", "dorian", "minor", "phrygian", "locrian"}[m]
}

// Modes lists the modes in the order a screen cycles through them.
var Modes = []Mode{Major, Minor, Dorian, Phrygian, Lydian, Mixolydian, Locrian}

// Key is a tonic (a spelled note name; its octave is ignored) and a mode.
type Key struct {
	Tonic Note
	Mode  Mode
}

// ParseKey reads a key such as "G major", "f# minor", "Bb", "E♭ dorian". The
// mode may be left out (major) after a capital letter; a small letter alone
// ("g") is refused with a hint, since it means minor in many hands.
// Otherwise everything is case-insensitive.
func ParseKey(s string) (Key, error) {
	if english, ok := germanKey(s); ok {
		return Key{}, fmt.Errorf("key %q: key names here are English: say %q", s, english)
	}
	fields := strings.Fields(signAccidental(s))
	if len(fields) == 0 || len(fields) > 2 {
		return Key{}, fmt.Errorf("key %q: write a tonic and a mode, like \"G major\"", s)
	}
	tonic, err := ParseName(fields[0])
	if err != nil {
		// Chord-symbol shorthand ("F#m", "Bbm") is a common way to write a
		// minor key; point to the words rather than guess at the mode.
		if head, ok := strings.CutSuffix(fields[0], "m"); ok && len(fields) == 1 {
			if n, err := ParseName(head); err == nil {
				return Key{}, fmt.Errorf("key %q: write the mode as a word: %q", s, n.Name()+" minor")
			}
		}
		return Key{}, fmt.Errorf("key %q: %v", s, err)
	}
	if tonic.Accidental < -1 || tonic.Accidental > 1 {
		return Key{}, fmt.Errorf("key %q: a tonic takes at most one sharp or flat", s)
	}
	k := Key{Tonic: tonic, Mode: Major}
	if len(fields) == 1 && 'a' <= fields[0][0] && fields[0][0] <= 'g' {
		// Many musicians write a minor key in small letters and a major
		// one in capitals; others write every key small. Either reading
		// of "g" alone could be wrong, so ask.
		p := tonic.Name()
		return Key{}, fmt.Errorf("key %q: say %q or %q", s, p+" major", p+" minor")
	}
	if len(fields) == 2 {
		m, ok := modeNames[strings.ToLower(fields[1])]
		if !ok {
			return Key{}, fmt.Errorf("key %q: unknown mode %q (major, minor, dorian, phrygian, lydian, mixolydian, locrian)", s, fields[1])
		}
		k.Mode = m
	}
	if sig := k.Signature(); sig > 7 || sig < -7 {
		return Key{}, fmt.Errorf("key %q would need %d %s; key signatures stop at seven (try its enharmonic)", s, abs(sig), map[bool]string{true: "sharps", false: "flats"}[sig > 0])
	}
	return k, nil
}

// wordAccidental is a tonic's accidental said in words, as English speakers
// name keys ("E flat major", "F-sharp minor").
var wordAccidental = regexp.MustCompile(`^\s*([A-Ga-g])[\s-]*((?i)flat|sharp)\b`)

// signAccidental writes a tonic's accidental in words as its sign ("Eb
// major"), keeping the letter's case for ParseKey's small-letter rule.
func signAccidental(s string) string {
	m := wordAccidental.FindStringSubmatchIndex(s)
	if m == nil {
		return s
	}
	sign := "#"
	if strings.EqualFold(s[m[4]:m[5]], "flat") {
		sign = "b"
	}
	return s[m[2]:m[3]] + sign + s[m[1]:]
}

// germanKeyName is a key named in German, "Es-Dur", "fis-moll", "B dur".
var germanKeyName = regexp.MustCompile(`^\s*([A-Ha-h](?:is|es|s)?)[\s-]*((?i)dur|moll)\s*$`)

// germanKey is the English name of a key written in German ("Es-Dur" is
// "Eb major", "B-Dur" "Bb major", "h-moll" "B minor"), and whether s is
// one: refused with it, not guessed, as a German note name is.
func germanKey(s string) (string, bool) {
	m := germanKeyName.FindStringSubmatch(s)
	if m == nil {
		return "", false
	}
	name := strings.ToLower(m[1])
	letter := strings.ToUpper(name[:1])
	if letter == "H" {
		letter = "B"
	}
	acc := ""
	switch {
	case name == "b":
		acc = "b"
	case strings.HasSuffix(name, "is"):
		acc = "#"
	case strings.HasSuffix(name, "s"): // es, as, and Es alone for E flat
		acc = "b"
	}
	mode := "major"
	if strings.EqualFold(m[2], "moll") {
		mode = "minor"
	}
	return letter + acc + " " + mode, true
}

// String formats the key as "F# minor".
func (k Key) String() string { return k.Tonic.Name() + " " + k.Mode.String() }

// Pretty formats the key with musical signs, "F♯ minor".
func (k Key) Pretty() string { return k.Tonic.PrettyName() + " " + k.Mode.String() }

// lowest is the line-of-fifths place of the first note of the diatonic set.
func (k Key) lowest() int { return k.Tonic.Fifths() - int(k.Mode) }

// Signature is the key signature: sharps positive, flats negative.
func (k Key) Signature() int { return k.lowest() + 1 }

// Scale is the key's seven degrees, spelled, from the tonic upward in octave 4.
func (k Key) Scale() []Note {
	t := k.Tonic
	t.Octave = 4
	out := make([]Note, 0, 7)
	for deg := 0; deg < 7; deg++ {
		// Degree d of any mode is the unique note of the set with letter t+d.
		l := Letter(mod(int(t.Letter)+deg, 7))
		for p := k.lowest(); p < k.lowest()+7; p++ {
			if n := noteAt(p, 4); n.Letter == l {
				n.Octave = t.Octave + (int(t.Letter)+deg)/7
				out = append(out, n)
			}
		}
	}
	return out
}

// WindowSpan is where the key's spelling window lies on the line of fifths:
// from five fifths below to six fifths above the middle of its diatonic set
// (interface contract, "Spelling window"; the common meantone keyboard
// practice). C major gives E♭ (-3) … G♯ (8). A minor key's window sits one
// fifth sharper than its relative major's, so that it holds the raised
// fourth, sixth and seventh a minor key borrows (G minor: A♭ … C♯, where
// C♯ is the third of the dominant's dominant); the church modes keep their
// own diatonic set.
func (k Key) WindowSpan() (lo, hi int) {
	mid := k.lowest() + 3
	if k.Mode == Minor {
		mid++
	}
	return mid - 5, mid + 6
}

// Window is the key's twelve chromatic spellings in line-of-fifths order, in
// octave 4.
func (k Key) Window() []Note { return k.window(make([]Note, 0, 12)) }

func (k Key) window(out []Note) []Note {
	lo, hi := k.WindowSpan()
	for p := lo; p <= hi; p++ {
		out = append(out, noteAt(p, 4))
	}
	return out
}
