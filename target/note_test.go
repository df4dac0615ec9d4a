package target

import (
	"strings"
	"testing"
)

// The spelled-note syntax is the interface contract's ("Spelled notes").
func TestParseNoteAcceptsTheContractSyntax(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want string
	}{
		{"C4", "C4"}, {"F#4", "F#4"}, {"Bb3", "Bb3"}, {"c##5", "C##5"}, {"Cx5", "C##5"},
		{"Ebb2", "Ebb2"}, {"G♯4", "G#4"}, {"A♭4", "Ab4"}, {"F𝄪3", "F##3"}, {"B𝄫1", "Bbb1"},
		{"B#3", "B#3"}, {"Cb4", "Cb4"}, {"a0", "A0"}, {"C8", "C8"}, {"C-1", "C-1"},
	} {
		n, err := ParseNote(tc.in)
		if err != nil {
			t.Errorf("ParseNote(%q): %v", tc.in, err)
			continue
		}
		if got := n.String(); got != tc.want {
			t.Errorf("ParseNote(%q) = %s, want %s", tc.in, got, tc.want)
		}
	}
}

func TestParseNoteRejectsBadInput(t *testing.T) {
	for _, in := range []string{"", "H4", "C", "F#", "C#b4", "C###4", "Cbbb4", "C4.5", "Cz4", "C99", "#4"} {
		if n, err := ParseNote(in); err == nil {
			t.Errorf("ParseNote(%q) = %v, want an error", in, n)
		}
	}
}

// A player used to German names writes H for B (and B for B♭): the
// message says so, since H is refused (contract: "--key H" is a usage
// error). German naming: common practice.
func TestParseNoteExplainsGermanH(t *testing.T) {
	for _, in := range []string{"H4", "h3", "H"} {
		_, err := ParseNote(in)
		if err == nil || !strings.Contains(err.Error(), "German H is B, German B is Bb") {
			t.Errorf("ParseNote(%q): %v, want the German-names hint", in, err)
		}
	}
}

// The octave number belongs to the letter (contract): B#3 sounds with C4,
// Cb4 with B3 (scientific pitch notation, common practice).
func TestOctaveBelongsToTheLetter(t *testing.T) {
	for _, tc := range []struct {
		note string
		semi int // equal semitones from C4
	}{
		{"C4", 0}, {"B#3", 0}, {"Dbb4", 0}, {"Cb4", -1}, {"B3", -1}, {"A4", 9}, {"A0", -39}, {"C8", 48},
	} {
		n, _ := ParseNote(tc.note)
		if got := n.Semitones(); got != tc.semi {
			t.Errorf("%s.Semitones() = %d, want %d", tc.note, got, tc.semi)
		}
	}
}

// Places on the line of fifths, counted from C (common practice: F C G D A E B
// F# C# G# D# A# E# B#, flats the other way).
func TestLineOfFifths(t *testing.T) {
	for _, tc := range []struct {
		note string
		p    int
	}{
		{"C4", 0}, {"G4", 1}, {"F4", -1}, {"B4", 5}, {"F#4", 6}, {"Gb4", -6}, {"B#4", 12},
		{"Dbb4", -12}, {"Fb4", -8}, {"C##4", 14},
	} {
		n, _ := ParseNote(tc.note)
		if got := n.Fifths(); got != tc.p {
			t.Errorf("%s.Fifths() = %d, want %d", tc.note, got, tc.p)
		}
		if back := noteAt(tc.p, n.Octave); back != n {
			t.Errorf("noteAt(%d) = %v, want %v", tc.p, back, n)
		}
	}
}

// Spelled interval arithmetic (common practice): a major third above D is
// F#, a perfect fifth below C4 is F3, an augmented fourth above C is F#.
func TestIntervals(t *testing.T) {
	majThird := Interval{Fifths: 4, Octaves: -2}
	for _, tc := range []struct {
		from string
		iv   Interval
		want string
	}{
		{"D4", majThird, "F#4"},
		{"B3", majThird, "D#4"},
		{"Eb4", majThird, "G4"},
		{"C4", Interval{Fifths: -1, Octaves: 0}, "F3"},
		{"C4", Interval{Fifths: 6, Octaves: -3}, "F#4"},
		{"Bb4", Interval{Fifths: 2, Octaves: -1}, "C5"},
	} {
		a, _ := ParseNote(tc.from)
		got := a.Transpose(tc.iv)
		if got.String() != tc.want {
			t.Errorf("%s + %v = %s, want %s", tc.from, tc.iv, got, tc.want)
		}
		if back := Between(a, got); back != tc.iv {
			t.Errorf("Between(%s, %s) = %v, want %v", a, got, back, tc.iv)
		}
	}
}

func TestPrettyUsesMusicalSigns(t *testing.T) {
	for in, want := range map[string]string{"F#4": "F♯4", "Bb3": "B♭3", "Cx5": "C𝄪5", "Ebb2": "E𝄫2", "A4": "A4"} {
		n, _ := ParseNote(in)
		if got := n.Pretty(); got != want {
			t.Errorf("%s.Pretty() = %q, want %q", in, got, want)
		}
	}
}
