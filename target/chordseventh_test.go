package target

import (
	"strings"
	"testing"
)

// One minor seventh: a declared chord of quality 7 or m7 tunes its seventh
// to the ratio the chords heard are read against (interface contract,
// --chords: "sevenths 16/9 unless --seventh says otherwise"), so declaring
// the chord the tool just named keeps the row's seventh. harmonic7 keeps 7/4
// whatever the seventh. Cents from the ratios: 1200·log2(16/9) = 996.090,
// 9/5 = 1017.596, 7/4 = 968.826 (common practice); 16/9 and 9/5 lie a
// syntonic comma, 21.506 ¢, apart (common practice).
func TestDeclaredChordSeventhIsTheHeardOne(t *testing.T) {
	for _, tc := range []struct {
		chord    string
		seventh  float64 // Chord.Seventh; 0 as a tuning set in code leaves it
		root, at string  // the root and the seventh above it
		cents    float64
		fraction string
	}{
		{"G 7", 0, "G3", "F4", 996.090, "16/9"},
		{"G 7", 16.0 / 9, "G3", "F4", 996.090, "16/9"},
		{"G 7", 9.0 / 5, "G3", "F4", 1017.596, "9/5"},
		{"G 7", 7.0 / 4, "G3", "F4", 968.826, "7/4"},
		{"D m7", 0, "D4", "C5", 996.090, "16/9"},
		{"D m7", 9.0 / 5, "D4", "C5", 1017.596, "9/5"},
		{"G harmonic7", 9.0 / 5, "G3", "F4", 968.826, "7/4"},
		{"G harmonic7", 0, "G3", "F4", 968.826, "7/4"},
	} {
		tu := tuning(t, "C major", "meantone:1/4", 440)
		c, err := ParseChord(tc.chord)
		if err != nil {
			t.Fatal(err)
		}
		c.Seventh, tu.Chord = tc.seventh, c
		near(t, tc.chord+" seventh above the root's tempered target",
			tu.TargetPitch(note(t, tc.at))-tu.TemperedPitch(note(t, tc.root)), tc.cents, tol)
		if m := c.Members()[3]; m.Fraction != tc.fraction {
			t.Errorf("%s with seventh %v: member %s at %s, want %s", tc.chord, tc.seventh, m.Note, m.Fraction, tc.fraction)
		}
		// The one-line tuning says which seventh, but not for harmonic7,
		// whose 7/4 its name says.
		want := " · chord " + c.String() + " (seventh " + tc.fraction + ")"
		if c.Quality.Name == "harmonic7" {
			want = " · chord G harmonic7"
		}
		if !strings.HasSuffix(tu.String(), want) {
			t.Errorf("tuning %q, want it to end %q", tu.String(), want)
		}
	}
	// The heard G dominant seventh under the same seventh reads the
	// declared chord's targets as just: every member 0 ¢ from just.
	for _, seventh := range []float64{DefaultSeventh, 9.0 / 5, 7.0 / 4} {
		tu := tuning(t, "C major", "meantone:1/4", 440)
		tu.Chord, _ = ParseChord("G 7")
		tu.Chord.Seventh = seventh
		var hz []float64
		for _, n := range []string{"G3", "B3", "D4", "F4"} {
			hz = append(hz, tu.Target(note(t, n)))
		}
		h, ok := tu.NameChord(hz, seventh)
		if !ok || h.Name() != "G dominant seventh" {
			t.Fatalf("seventh %v: heard %v %v", seventh, h.Name(), ok)
		}
		for _, m := range h.Members {
			near(t, "heard "+m.Role+" from just", m.JustCents, 0, tol)
		}
	}
}
