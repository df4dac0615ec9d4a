package target

import (
	"math"
	"strings"
	"testing"
)

// heard is one expected member: its spelled note, role, and readings.
type heard struct {
	note, role       string
	cents, justCents float64
}

// The chords a group holds, named and read member by member. Pitches are
// given as spelled notes at their targets (with a detuning in cents where
// stated), so every expected reading follows from definitions:
// 1200·log2(5/4) = 386.314 ¢, 6/5 = 315.641 ¢, 3/2 = 701.955 ¢, 16/9 =
// 996.090 ¢, 7/4 = 968.826 ¢, 25/16 = 772.627 ¢ and 36/25 = 631.283 ¢ (two
// pure thirds stacked, common practice; from the ratios); equal temperament's thirds
// 400 and 300 ¢ and fifth 700 ¢ (ISO 16 at A4 = 440 Hz, twelve equal
// semitones); ¼-comma meantone's major third exactly 5/4 and fifth a quarter
// of the syntonic comma (21.506 ¢) narrow, 5.377 ¢ (its definition).
func TestNameChord(t *testing.T) {
	for _, tc := range []struct {
		key, temperament string
		notes            []string // sounding notes, "+2" appended for cents off target
		seventh          float64
		name             string
		want             []heard // lowest first
	}{
		{"C major", "equal", []string{"C4", "E4", "G4"}, DefaultSeventh, "C major", []heard{
			{"C4", "root", 0, 0}, {"E4", "third", 0, 400 - 386.314}, {"G4", "fifth", 0, 700 - 701.955}}},
		// The contract's example: G♯ as the third of E major in F major
		// (F major's window spells that pitch class A♭).
		{"F major", "equal", []string{"E3", "Ab3", "B3"}, DefaultSeventh, "E major", []heard{
			{"E3", "root", 0, 0}, {"G#3", "third", 0, 400 - 386.314}, {"B3", "fifth", 0, 700 - 701.955}}},
		{"C major", "meantone:1/4", []string{"C4", "E4", "G4"}, DefaultSeventh, "C major", []heard{
			{"C4", "root", 0, 0}, {"E4", "third", 0, 0}, {"G4", "fifth", 0, -5.377}}},
		// A third played 2 ¢ high reads +2 against the temperament and
		// 2 ¢ more against just.
		{"C major", "meantone:1/4", []string{"C4", "E4+2", "G4"}, DefaultSeventh, "C major", []heard{
			{"C4", "root", 0, 0}, {"E4", "third", 2, 2}, {"G4", "fifth", 0, -5.377}}},
		// First inversion: the root is the C above, the third an octave and
		// a sixth below it.
		{"C major", "equal", []string{"E3", "G3", "C4"}, DefaultSeventh, "C major", []heard{
			{"E3", "third", 0, 400 - 386.314}, {"G3", "fifth", 0, 700 - 701.955}, {"C4", "root", 0, 0}}},
		{"C major", "equal", []string{"A3", "C4", "E4"}, DefaultSeventh, "A minor", []heard{
			{"A3", "root", 0, 0}, {"C4", "third", 0, 300 - 315.641}, {"E4", "fifth", 0, 700 - 701.955}}},
		{"C major", "equal", []string{"G3", "B3", "D4", "F4"}, DefaultSeventh, "G dominant seventh", []heard{
			{"G3", "root", 0, 0}, {"B3", "third", 0, 400 - 386.314}, {"D4", "fifth", 0, 700 - 701.955},
			{"F4", "seventh", 0, 1000 - 996.090}}},
		{"C major", "equal", []string{"G3", "B3", "F4"}, 7.0 / 4, "G dominant seventh", []heard{
			{"G3", "root", 0, 0}, {"B3", "third", 0, 400 - 386.314}, {"F4", "seventh", 0, 1000 - 968.826}}},
		// A doubled root: both are roots; the upper one is read against the
		// lower (an equal octave is a pure 2/1).
		{"C major", "equal", []string{"C3", "G3", "C4", "E4"}, DefaultSeventh, "C major", []heard{
			{"C3", "root", 0, 0}, {"G3", "fifth", 0, 700 - 701.955}, {"C4", "root", 0, 0}, {"E4", "third", 0, 400 - 386.314}}},
		// Symmetric chords: the root whose spelling stays in the key.
		// C major's window holds G♯, not A♭ (interface contract).
		{"C major", "equal", []string{"C4", "E4", "Ab4"}, DefaultSeventh, "C augmented", []heard{
			{"C4", "root", 0, 0}, {"E4", "third", 0, 400 - 386.314}, {"G#4", "fifth", 0, 800 - 772.627}}},
		{"C major", "equal", []string{"B3", "D4", "F4"}, DefaultSeventh, "B diminished", []heard{
			{"B3", "root", 0, 0}, {"D4", "third", 0, 300 - 315.641}, {"F4", "fifth", 0, 600 - 631.283}}},
		// A duet's third names the triad it implies; a bare fifth is open.
		{"G major", "equal", []string{"F#3", "D4"}, DefaultSeventh, "D major", []heard{
			{"F#3", "third", 0, 400 - 386.314}, {"D4", "root", 0, 0}}},
		{"C major", "equal", []string{"D3", "A3"}, DefaultSeventh, "D open fifth", []heard{
			{"D3", "root", 0, 0}, {"A3", "fifth", 0, 700 - 701.955}}},
	} {
		tu := tuning(t, tc.key, tc.temperament, 440)
		hz := make([]float64, len(tc.notes))
		for i, s := range tc.notes {
			name, off, _ := strings.Cut(s, "+")
			c := 0.0
			if off != "" {
				c = 2
			}
			hz[i] = tu.Target(note(t, name)) * math.Exp2(c/1200)
		}
		c, ok := tu.NameChord(hz, tc.seventh)
		if !ok || c.Name() != tc.name || len(c.Members) != len(tc.want) {
			t.Errorf("%s %s %v: named %q (%v) with %d members, want %q", tc.key, tc.temperament, tc.notes, c.Name(), ok, len(c.Members), tc.name)
			continue
		}
		for i, w := range tc.want {
			m := c.Members[i]
			if m.Note.String() != w.note || m.Role != w.role || math.Abs(m.Cents-w.cents) > 0.001 || math.Abs(m.JustCents-w.justCents) > 0.001 {
				t.Errorf("%s %v member %d: %s %s %+.3f ¢ just %+.3f ¢, want %s %s %+.3f ¢ just %+.3f ¢",
					tc.name, tc.notes, i, m.Note, m.Role, m.Cents, m.JustCents, w.note, w.role, w.cents, w.justCents)
			}
		}
	}
}

// Pitches that make no chord it knows are not named (a whole tone; one pitch
// class in octaves), and nonsense input is refused rather than read.
func TestNameChordRefuses(t *testing.T) {
	tu := Default()
	for _, hz := range [][]float64{{261.626, 293.665}, {130.813, 261.626}, {261.626}, nil, {261.626, 0, 392}, {261.626, math.NaN(), 392}} {
		if c, ok := tu.NameChord(hz, DefaultSeventh); ok {
			t.Errorf("%v named %q", hz, c.Name())
		}
	}
}

func TestParseSeventh(t *testing.T) {
	for s, want := range map[string]float64{"7/4": 1.75, "9/5": 1.8, " 16/9 ": 16.0 / 9} {
		if r, err := ParseSeventh(s); err != nil || r != want {
			t.Errorf("ParseSeventh(%q) = %v, %v", s, r, err)
		}
	}
	for _, s := range []string{"", "3/2", "7:4", "1.75"} {
		if _, err := ParseSeventh(s); err == nil || !strings.HasPrefix(err.Error(), "--seventh") {
			t.Errorf("ParseSeventh(%q) = %v, want an error", s, err)
		}
	}
}

func FuzzParseSeventh(f *testing.F) {
	for _, s := range []string{"7/4", "9/5", "16/9", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		r, err := ParseSeventh(s)
		if err == nil && !(r > 1.7 && r < 1.8+1e-12) {
			t.Fatalf("%q → %v", s, r)
		}
	})
}
