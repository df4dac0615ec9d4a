package target

import (
	"fmt"
	"slices"
	"strings"
)

// Quality is a chord quality: the spelled intervals of its members above the
// root and the just ratio each member sits at.
type Quality struct {
	Name    string
	members []chordTone
}

type chordTone struct {
	fifths   int // place above the root on the line of fifths
	ratio    float64
	fraction string
}

// Chord members above the root, with the just ratio each is tuned to: pure
// thirds 5/4 and 6/5 and the pure fifth 3/2 (common practice); the minor
// seventh at the ratio --seventh chooses, 16/9 unless it says otherwise (the
// same for a declared chord as for a heard one: interface contract, --chords);
// the harmonic seventh 7/4 on request; diminished and augmented fifths as two
// stacked thirds.
var (
	majThird = chordTone{4, 5.0 / 4, "5/4"}
	minThird = chordTone{-3, 6.0 / 5, "6/5"}
	fifth    = chordTone{1, 3.0 / 2, "3/2"}
	dimFifth = chordTone{-6, 36.0 / 25, "36/25"}
	augFifth = chordTone{8, 25.0 / 16, "25/16"}
	minSev   = chordTone{-2, 0, ""} // ratio 0: the chosen seventh (just)
	harmSev  = chordTone{-2, 7.0 / 4, "7/4"}
	majSev   = chordTone{5, 15.0 / 8, "15/8"}
)

var qualities = map[string]Quality{
	"major":      {"major", []chordTone{majThird, fifth}},
	"minor":      {"minor", []chordTone{minThird, fifth}},
	"diminished": {"diminished", []chordTone{minThird, dimFifth}},
	"augmented":  {"augmented", []chordTone{majThird, augFifth}},
	"7":          {"7", []chordTone{majThird, fifth, minSev}},
	"harmonic7":  {"harmonic7", []chordTone{majThird, fifth, harmSev}},
	"m7":         {"m7", []chordTone{minThird, fifth, minSev}},
	"maj7":       {"maj7", []chordTone{majThird, fifth, majSev}},
}

var qualityAliases = map[string]string{
	"": "major", "maj": "major", "m": "minor", "min": "minor", "dim": "diminished",
	"aug": "augmented", "+": "augmented", "dom7": "7", "dominant7": "7",
	"7h": "harmonic7", "h7": "harmonic7", "min7": "m7", "minor7": "m7", "major7": "maj7",
	// The names analyze and the meter give a heard chord (NameChord), so a
	// player can declare the chord as it was named.
	"dominant seventh": "7", "minor seventh": "m7", "major seventh": "maj7",
}

// Chord is a declared chord: while it sounds, its members are tuned to just
// ratios above the root's tempered target, the way an ensemble tunes a held
// chord.
type Chord struct {
	Root    Note
	Quality Quality
	// Seventh is the just ratio of the minor seventh of qualities 7 and m7
	// (ParseSeventh); 0 means DefaultSeventh. harmonic7 keeps 7/4.
	Seventh float64
}

// ChordMember is one note of a chord with the ratio it sits at above the root.
type ChordMember struct {
	Note     Note
	Ratio    float64
	Fraction string
}

// ParseChord reads a chord: a root and a quality, as "D major", "D", "F#m",
// "G7", "G harmonic7", "Bb maj7", "B dim", "C aug". Qualities: major, minor,
// diminished, augmented, 7 and m7 (minor seventh at the Seventh ratio),
// harmonic7 (7/4), maj7.
func ParseChord(s string) (*Chord, error) {
	root, rest, err := parseName(s)
	if err != nil {
		return nil, fmt.Errorf("chord %q: %v", s, err)
	}
	q := strings.Join(strings.Fields(strings.ToLower(rest)), " ")
	if a, ok := qualityAliases[q]; ok {
		q = a
	}
	qual, ok := qualities[q]
	if !ok {
		return nil, fmt.Errorf("chord %q: unknown quality %q (major, minor, diminished, augmented, 7 or dominant seventh, harmonic7, m7 or minor seventh, maj7 or major seventh)", s, strings.TrimSpace(rest))
	}
	return &Chord{Root: root, Quality: qual}, nil
}

// String formats the chord as "D major".
func (c Chord) String() string { return c.Root.Name() + " " + c.Quality.Name }

// SeventhFraction is the chord's minor seventh as a fraction ("16/9"), ""
// when its quality has none whose ratio is chosen (harmonic7's is 7/4).
func (c Chord) SeventhFraction() string {
	for _, t := range c.Quality.members {
		if t.ratio == 0 {
			_, f := t.just(c.Seventh)
			return f
		}
	}
	return ""
}

// Members lists the chord's notes from the root, spelled (octave 4).
func (c Chord) Members() []ChordMember {
	r := c.Root
	r.Octave = 4
	out := []ChordMember{{Note: r, Ratio: 1, Fraction: "1/1"}}
	for _, t := range c.Quality.members {
		ratio, fraction := t.just(c.Seventh)
		out = append(out, ChordMember{Note: noteAt(r.Fifths()+t.fifths, 4), Ratio: ratio, Fraction: fraction})
	}
	return out
}

// rootOf finds, for a member n of the chord, the root in the octave at or
// below it and the ratio n sits at above that root.
func (c Chord) rootOf(n Note) (root Note, ratio float64, ok bool) {
	ratio = 1
	if rf := c.Root.Fifths(); n.Fifths() != rf {
		i := slices.IndexFunc(c.Quality.members, func(t chordTone) bool { return rf+t.fifths == n.Fifths() })
		if i < 0 {
			return Note{}, 0, false
		}
		ratio, _ = c.Quality.members[i].just(c.Seventh)
	}
	root = c.Root
	root.Octave = n.Octave
	for root.Semitones() > n.Semitones() {
		root.Octave--
	}
	for n.Semitones()-root.Semitones() >= 12 {
		root.Octave++
	}
	return root, ratio, true
}
