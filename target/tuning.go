package target

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
)

// Anchor says which note sits exactly where the reference puts it.
type Anchor int

const (
	// AnchorDefault is the contract's default: A4 exactly at the
	// reference, except in just intonation, which keeps its tonic where
	// equal temperament at the reference puts it (a choir tuning its
	// triads to a piano at that A4 starts from the piano's tonic).
	AnchorDefault Anchor = iota
	// AnchorA4 keeps A4 exactly at the reference frequency.
	AnchorA4
	// AnchorTonic keeps the key's tonic (in octave 4) where equal
	// temperament at the reference would put it.
	AnchorTonic
)

// ParseAnchor reads an --anchor value: "a4" or "tonic"; "" or "default"
// leaves the choice to the temperament.
func ParseAnchor(s string) (Anchor, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "default":
		return AnchorDefault, nil
	case "a4", "a":
		return AnchorA4, nil
	case "tonic":
		return AnchorTonic, nil
	}
	return 0, fmt.Errorf("anchor %q: use a4 or tonic", s)
}

// String is the flag value.
func (a Anchor) String() string {
	switch a {
	case AnchorA4:
		return "a4"
	case AnchorTonic:
		return "tonic"
	}
	return "default"
}

// Reference-pitch bounds for A4: wide enough for low Baroque (392, 415) and
// high modern orchestras (446), narrow enough to catch a mistyped value.
const (
	MinA4 = 380.0
	MaxA4 = 480.0
)

// a4Name is the note before a reference written as the screens write it,
// "A4 = 415 Hz".
var a4Name = regexp.MustCompile(`^(?i)a4?\s*=\s*`)

// ParseA4 reads an --a4 value in hertz; the unit may follow the number
// ("415Hz", "415 Hz") and the note precede it ("A4 = 415 Hz"), as players
// write a reference pitch.
func ParseA4(s string) (float64, error) {
	num := strings.TrimSpace(s)
	num = a4Name.ReplaceAllString(num, "") // "A4 = 415 Hz", as the screens write it
	if n := len(num) - len("hz"); n > 0 && strings.EqualFold(num[n:], "hz") {
		num = strings.TrimSpace(num[:n])
	}
	f, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return 0, fmt.Errorf("--a4 %q is not a number of hertz", s)
	}
	if !(f >= MinA4 && f <= MaxA4) {
		return 0, fmt.Errorf("--a4 %s is outside %g to %g Hz", s, MinA4, MaxA4)
	}
	return f, nil
}

// Tuning is everything a reading depends on: key, temperament, reference
// pitch, and optionally a chord and a transposition. The zero Transposition
// means concert pitch; a nil Chord means the temperament's targets.
type Tuning struct {
	Key         Key
	Temperament Temperament
	A4          float64
	Anchor      Anchor
	Chord       *Chord
	Transpose   Transposition
}

// Default is C major, equal temperament, A4 = 440 Hz (ISO 16).
func Default() Tuning {
	return Tuning{Key: Key{Tonic: Note{Letter: C, Octave: 4}, Mode: Major}, Temperament: Equal, A4: 440}
}

var a4 = Note{Letter: A, Octave: 4}

// tempered is the note's pitch in cents above the reference's C4 (before
// anchoring) from the temperament alone.
func (t Tuning) tempered(n Note) float64 {
	return 100*float64(n.Semitones()) + t.Temperament.Offset(n.Fifths(), t.Key.Tonic.Fifths())
}

// Anchored is the anchor in force: the declared one, or where none is
// declared, the tonic in just intonation and A4 otherwise.
func (t Tuning) Anchored() Anchor {
	if t.Anchor != AnchorDefault {
		return t.Anchor
	}
	if _, just := t.Temperament.(Just); just {
		return AnchorTonic
	}
	return AnchorA4
}

// shift is what anchoring adds to every tempered pitch.
func (t Tuning) shift() float64 {
	if t.Anchored() == AnchorTonic {
		tonic := t.Key.Tonic
		tonic.Octave = 4
		return 100*float64(tonic.Semitones()) - t.tempered(tonic)
	}
	return 900 - t.tempered(a4)
}

// TemperedPitch is the note's target as a pitch (cents above the
// equal-tempered C4 at the reference, C4 = A4 · 2^(-9/12)), ignoring any chord.
func (t Tuning) TemperedPitch(n Note) float64 { return t.tempered(n) + t.shift() }

// TargetPitch is the note's target as a pitch (cents above the
// equal-tempered C4 at the reference), with the chord's just intervals if one
// is declared.
func (t Tuning) TargetPitch(n Note) float64 { return t.targetPitch(n, t.shift()) }

// targetPitch is TargetPitch with the anchoring shift already worked out.
func (t Tuning) targetPitch(n Note, shift float64) float64 {
	if t.Chord != nil {
		if root, ratio, ok := t.Chord.rootOf(n); ok {
			return t.tempered(root) + shift + Cents(ratio)
		}
	}
	return t.tempered(n) + shift
}

// Target is the note's target frequency in hertz (concert pitch).
func (t Tuning) Target(n Note) float64 { return t.hz(t.TargetPitch(n)) }

// CentsFromEqual is how far the note's target lies from the same note in
// equal temperament at the same reference.
func (t Tuning) CentsFromEqual(n Note) float64 {
	return t.TargetPitch(n) - 100*float64(n.Semitones())
}

// c4 is the equal-tempered C4 at the reference.
func (t Tuning) c4() float64 { return t.A4 * math.Exp2(-9.0/12) }

func (t Tuning) hz(pitch float64) float64 { return t.c4() * math.Exp2(pitch/1200) }

// SharesPitches reports whether the temperament gives every window note and
// its other spelling one pitch (equal temperament, the well temperaments),
// so that a screen can say so once instead of on every note.
func (t Tuning) SharesPitches() bool {
	for _, n := range t.Key.Window() {
		if alt, ok := Alternative(n); ok && math.Abs(t.tempered(alt)-t.tempered(n)) >= samePitchCents {
			return false
		}
	}
	return true
}

// Window is the key's twelve spellings in line-of-fifths order, with the
// chord's members in place of the window notes they share a pitch class with.
func (t Tuning) Window() []Note { return t.window(make([]Note, 0, 12)) }

// window appends the window to w (Classify passes an array on its stack).
func (t Tuning) window(w []Note) []Note {
	w = t.Key.window(w)
	if t.Chord == nil {
		return w
	}
	for _, m := range t.Chord.Members() {
		for i, n := range w {
			if n.PitchClass() == m.Note.PitchClass() {
				w[i] = Note{Letter: m.Note.Letter, Accidental: m.Note.Accidental, Octave: 4}
			}
		}
	}
	return w
}

// String describes the tuning in one line: "C major · 1/4-comma meantone · A4 = 415 Hz".
func (t Tuning) String() string {
	s := fmt.Sprintf("%s · %s · A4 = %s Hz", t.Key, t.Temperament.Name(), strconv.FormatFloat(t.A4, 'f', -1, 64))
	if t.Anchored() == AnchorTonic {
		s += " (tonic anchored)"
	}
	if t.SharesPitches() {
		s += " · enharmonic spellings share one pitch"
	}
	if t.Chord != nil {
		s += " · chord " + t.Chord.String()
		if f := t.Chord.SeventhFraction(); f != "" {
			s += " (seventh " + f + ")"
		}
	}
	if !t.Transpose.IsConcert() {
		s += " · written for an instrument in " + t.Transpose.Name
	}
	return s
}
