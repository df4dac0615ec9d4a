package target

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Letter is a note letter, C through B, in scale order.
type Letter int

// The seven letters in scale order from C.
const (
	C Letter = iota
	D
	E
	F
	G
	A
	B
)

// letterFifths is each natural's place on the line of fifths, counted from C
// (F = -1, C = 0, G = 1 … B = 5).
var letterFifths = [7]int{0, 2, 4, -1, 1, 3, 5}

// letterSemitones is each natural's distance above C in equal semitones.
var letterSemitones = [7]int{0, 2, 4, 5, 7, 9, 11}

const letterNames = "CDEFGAB"

// Note is a spelled note: a letter, an accidental (sharps positive, flats
// negative) and an octave number in scientific pitch notation. The octave
// belongs to the letter, so B♯3 sounds near C4 and C♭4 near B3.
type Note struct {
	Letter     Letter
	Accidental int
	Octave     int
}

// maxAccidental bounds what the parsers accept; triple sharps are not music
// any key in this program spells.
const maxAccidental = 2

// Fifths is the note's place on the line of fifths, counted from C
// (G = 1, F = -1, F♯ = 6, G♭ = -6). It ignores the octave.
func (n Note) Fifths() int { return letterFifths[n.Letter] + 7*n.Accidental }

// Semitones is the note's distance from C4 in equal-tempered semitones.
func (n Note) Semitones() int {
	return 12*(n.Octave-4) + letterSemitones[n.Letter] + n.Accidental
}

// PitchClass is the note's equal-tempered pitch class, 0 (C) to 11 (B).
func (n Note) PitchClass() int { return mod(n.Semitones(), 12) }

// String formats the note as the contract spells it: letter, "#", "##",
// "b" or "bb", octave ("F#4", "Bb3", "B#3").
func (n Note) String() string { return n.Name() + strconv.Itoa(n.Octave) }

// Name is the note without its octave ("F#").
func (n Note) Name() string {
	var b strings.Builder
	b.WriteByte(letterNames[n.Letter])
	b.WriteString(accidentalText(n.Accidental))
	return b.String()
}

func accidentalText(a int) string {
	if a > 0 {
		return strings.Repeat("#", a)
	}
	return strings.Repeat("b", -a)
}

// Pretty formats the note with the musical signs ♯ ♭ 𝄪 𝄫, for screens.
func (n Note) Pretty() string { return n.PrettyName() + strconv.Itoa(n.Octave) }

// PrettyName is Pretty without the octave.
func (n Note) PrettyName() string {
	s := string(letterNames[n.Letter])
	switch a := n.Accidental; {
	case a == 2:
		s += "𝄪"
	case a == -2:
		s += "𝄫"
	case a > 0:
		s += strings.Repeat("♯", a)
	case a < 0:
		s += strings.Repeat("♭", -a)
	}
	return s
}

// ParseNote reads a spelled note with its octave: "F#4", "Bb3", "Cx5",
// "E𝄫2", "g♯4". Letters are case-insensitive; accidentals are #, ##, x, b,
// bb and the signs ♯ ♭ 𝄪 𝄫.
func ParseNote(s string) (Note, error) {
	n, rest, err := parseName(s)
	if err != nil {
		return Note{}, err
	}
	if rest == "" {
		return Note{}, fmt.Errorf("note %q has no octave number (write it like F#4)", s)
	}
	oct, err := strconv.Atoi(rest)
	if err != nil || oct < -1 || oct > 10 {
		return Note{}, fmt.Errorf("note %q: octave %q is not a number from -1 to 10", s, rest)
	}
	n.Octave = oct
	return n, nil
}

// ParseName reads a spelled note without an octave ("F#", "Bb", "E𝄫"); the
// returned note has octave 4.
func ParseName(s string) (Note, error) {
	n, rest, err := parseName(s)
	if err != nil {
		return Note{}, err
	}
	if rest != "" {
		return Note{}, fmt.Errorf("note name %q has unexpected %q after the accidentals", s, rest)
	}
	n.Octave = 4
	return n, nil
}

// parseName reads a letter and its accidentals and returns what follows.
func parseName(s string) (Note, string, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return Note{}, "", fmt.Errorf("empty note name")
	}
	i := strings.IndexByte(letterNames, upper(t[0]))
	if i < 0 && upper(t[0]) == 'H' {
		// German note names: H is B, and B is B♭. Say so rather than guess.
		return Note{}, "", fmt.Errorf("note %q: note names here are English, A to G (German H is B, German B is Bb)", s)
	}
	if i < 0 {
		return Note{}, "", fmt.Errorf("note %q does not start with a letter A to G", s)
	}
	n := Note{Letter: Letter(i), Octave: 4}
	t = t[1:]
	seenSharp, seenFlat := false, false
	for t != "" {
		step, size := accidentalAt(t)
		if size == 0 {
			break
		}
		if step > 0 {
			seenSharp = true
		} else {
			seenFlat = true
		}
		n.Accidental += step
		t = t[size:]
	}
	if seenSharp && seenFlat {
		return Note{}, "", fmt.Errorf("note %q mixes sharps and flats", s)
	}
	if n.Accidental > maxAccidental || n.Accidental < -maxAccidental {
		return Note{}, "", fmt.Errorf("note %q has more than two accidentals", s)
	}
	return n, t, nil
}

// accidentalAt reports the accidental at the start of s and its byte length.
func accidentalAt(s string) (step, size int) {
	for _, a := range []struct {
		text string
		step int
	}{{"𝄪", 2}, {"𝄫", -2}, {"♯", 1}, {"♭", -1}, {"#", 1}, {"x", 2}, {"X", 2}, {"b", -1}} {
		if strings.HasPrefix(s, a.text) {
			return a.step, len(a.text)
		}
	}
	return 0, 0
}

func upper(c byte) byte {
	if 'a' <= c && c <= 'z' {
		return c - 'a' + 'A'
	}
	return c
}

// Interval is a spelled interval: a distance along the line of fifths and a
// number of whole octaves. A major third up is {Fifths: 4, Octaves: -2}
// (four fifths up, two octaves down); Interval.Between computes it.
type Interval struct {
	Fifths  int
	Octaves int
}

// Between is the spelled interval from a up to b.
func Between(a, b Note) Interval {
	f := b.Fifths() - a.Fifths()
	// Each fifth moves 4 letter steps; the octaves make up the rest.
	steps := b.absLetter() - a.absLetter() - 4*f
	return Interval{Fifths: f, Octaves: steps / 7}
}

// Semitones is the interval's size in equal-tempered semitones.
func (iv Interval) Semitones() int { return 7*iv.Fifths + 12*iv.Octaves }

// absLetter counts letter steps from C0.
func (n Note) absLetter() int { return 7*n.Octave + int(n.Letter) }

// Transpose moves the note by a spelled interval.
func (n Note) Transpose(iv Interval) Note {
	p := n.Fifths() + iv.Fifths
	abs := n.absLetter() + 4*iv.Fifths + 7*iv.Octaves
	l := mod(abs, 7)
	return Note{
		Letter:     Letter(l),
		Accidental: (p - letterFifths[l]) / 7,
		Octave:     floorDiv(abs, 7),
	}
}

// respell returns the note moved k places along the line of fifths while
// keeping its equal-tempered pitch (k a multiple of 12).
func (n Note) respell(k int) Note {
	m := n.Transpose(Interval{Fifths: k, Octaves: 0})
	// Fix the octave so that the equal-tempered pitch is unchanged.
	m.Octave += floorDiv(n.Semitones()-m.Semitones(), 12)
	return m
}

// noteAt returns the spelled note at place p on the line of fifths whose
// letter lies in the given octave.
func noteAt(p, octave int) Note {
	l := mod(p*4, 7) // each fifth is four letter steps from C
	return Note{Letter: Letter(l), Accidental: (p - letterFifths[l]) / 7, Octave: octave}
}

func mod(a, m int) int {
	r := a % m
	if r < 0 {
		r += m
	}
	return r
}

func floorDiv(a, m int) int { return int(math.Floor(float64(a) / float64(m))) }
