package target

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

// The names the meter and the reports show, and the usual ways musicians
// write them, are accepted as --temperament values (the examples:
// "Werckmeister III", "¼-comma meantone", "quarter-comma", "edo31"); plain
// "meantone" is the quarter-comma kind (common practice).
func TestTemperamentNamesAsMusiciansWriteThem(t *testing.T) {
	for in, want := range map[string]string{
		"Werckmeister III": "werckmeister3", "werckmeister-iii": "werckmeister3", "Kirnberger III": "kirnberger3",
		"Young II": "young", "Vallotti": "vallotti", "Pythagorean": "pythagorean", "equal temperament": "equal",
		"12-TET": "equal", "5-limit just from the tonic": "just", "just intonation": "just",
		"¼-comma meantone": "meantone:1/4", "1/4-comma meantone": "meantone:1/4", "quarter-comma": "meantone:1/4",
		"Quarter-comma meantone": "meantone:1/4", "⅙-comma": "meantone:1/6", "sixth-comma meantone": "meantone:1/6",
		"2/7-comma meantone": "meantone:2/7", "third-comma": "meantone:1/3", "meantone 1/5": "meantone:1/5",
		"edo31": "edo:31", "31-EDO": "edo:31", "19-tet": "edo:19", "EDO 53": "edo:53",
		"regular, fifth 696.5 ¢": "fifth:696.5", "regular, fifth 696.5¢": "fifth:696.5", "Meantone:1/4": "meantone:1/4",
		"meantone quarter-comma": "meantone:1/4", "meantone": "meantone:1/4", "Meantone": "meantone:1/4", " Meantone : 1/6 ": "meantone:1/6", "Two-sevenths comma": "meantone:2/7",
	} {
		tm, err := ParseTemperament(in)
		if err != nil || tm.Spec() != want {
			t.Errorf("ParseTemperament(%q) = %v, %v; want %s", in, tm, err, want)
		}
	}
	// Every name a screen shows reads back as its temperament.
	for _, spec := range append(Builtin, "fifth:696.5", "meantone:3/10", "edo:22") {
		tm := mustTemperament(t, spec)
		if back, err := ParseTemperament(tm.Name()); err != nil || back.Spec() != spec {
			t.Errorf("%s's name %q reads back as %v, %v", spec, tm.Name(), back, err)
		}
	}
}

// A mistyped name is answered with the nearest known one; a name nothing is
// near gets the usual list. Either way the error says it is an unknown name
// (so the command can tell a missing file).
func TestUnknownTemperamentSuggestsTheNearest(t *testing.T) {
	for in, want := range map[string]string{
		"werkmeister3": "did you mean werckmeister3?", "Werkmeister": "did you mean werckmeister3?",
		"kirnberger 2": "did you mean kirnberger3?", "valotti": "did you mean vallotti?",
		"pythagorian": "did you mean pythagorean?", "meanton": "did you mean meantone:1/4?",
		"juts": "did you mean just?", "wobbly": "try equal, meantone:1/4",
	} {
		_, err := ParseTemperament(in)
		if err == nil || !errors.Is(err, ErrUnknownTemperament) || !strings.Contains(err.Error(), want) {
			t.Errorf("ParseTemperament(%q): %v; want %q", in, err, want)
		}
	}
	if _, err := ParseTemperament("edo:7"); errors.Is(err, ErrUnknownTemperament) {
		t.Errorf("edo:7 is a known kind with a bad value, not an unknown name: %v", err)
	}
}

// Values that give readings no musician can use are refused with the range
// that works: where the fifth reaches 720 ¢ (5-EDO) B♭ lands on A, and at
// 685.714 ¢ (7-EDO) C♯ lands on C; between them the chromatic semitone
// (7 fifths − 4 octaves) and the diatonic one (3 octaves − 5 fifths) are
// both positive, so a window's spellings keep their order (chain-of-fifths
// arithmetic, common practice). An EDO's fifth is its step count nearest 3/2
// times 1200/N (definition): 7-EDO's 4 steps give 685.714 ¢, 25-EDO's 15
// give 720, 35-EDO's 20 give 685.714; from 37 steps on the nearest step is
// within 600/N < 16.24 ¢ of 701.955, inside the bounds.
func TestUnusableFifthsAreRefusedWithTheRangeThatWorks(t *testing.T) {
	for spec, want := range map[string]string{
		"fifth:720":    "between 685.714 and 720",
		"fifth:685.7":  "between 685.714 and 720",
		"edo:7":        "12, 17, 19, 22, 24, 26, 27, 29, 31, 32, 33, 34, 36, 37 … 999",
		"edo:5":        "12, 17, 19, 22",
		"edo:35":       "12, 17, 19, 22",
		"edo:1000":     "37 … 999",
		"meantone:1/1": "between -0.839 and 0.755",
	} {
		_, err := ParseTemperament(spec)
		if err == nil || !strings.Contains(err.Error(), want) || strings.Contains(err.Error(), "\n") {
			t.Errorf("ParseTemperament(%q): %v; want it to name %q", spec, err, want)
		}
	}
	// Just inside the bounds, B♭ stays above A and C♯ above C.
	for _, f := range []float64{685.8, 719.9} {
		tu := Tuning{Key: Key{Tonic: Note{Letter: C}, Mode: Major}, Temperament: mustTemperament(t, "fifth:"+strconv.FormatFloat(f, 'f', -1, 64)), A4: 440}
		if tu.TargetPitch(note(t, "Bb4")) <= tu.TargetPitch(note(t, "A4")) || tu.TargetPitch(note(t, "C#4")) <= tu.TargetPitch(note(t, "C4")) {
			t.Errorf("fifth %g: spellings out of order", f)
		}
	}
}

// Just intonation keeps its tonic where equal temperament at the given A4
// puts it (interface contract, the --a4 row): a choir singing with a piano at
// 442 Hz starts from the piano's C. With --anchor a4 the figures
// return: A4 at 442 Hz, C4 a just major sixth (5/3) below, 265.2 Hz, which is
// 15.64 ¢ above the piano's 262.817 Hz (442·2^(−9/12)).
func TestJustKeepsTheTonicWhereEqualTemperamentPutsIt(t *testing.T) {
	tu := tuning(t, "C minor", "just", 442)
	c4 := note(t, "C4")
	near(t, "C4 from equal", tu.CentsFromEqual(c4), 0, 1e-9)
	near(t, "C4 Hz", tu.Target(c4), 442*math.Exp2(-9.0/12), 1e-9)
	if !strings.Contains(tu.String(), "tonic anchored") {
		t.Errorf("%q does not say the tonic is anchored", tu)
	}
	tu.Anchor = AnchorA4
	near(t, "A4 Hz", tu.Target(note(t, "A4")), 442, 1e-9)
	near(t, "C4 Hz", tu.Target(c4), 265.2, 1e-9)
	near(t, "C4 from equal", tu.CentsFromEqual(c4), 15.64, 0.005)
	tu.Anchor = AnchorTonic
	near(t, "C4 from equal", tu.CentsFromEqual(c4), 0, 1e-9)
	for in, want := range map[string]Anchor{"": AnchorDefault, "a4": AnchorA4, "A4": AnchorA4, "tonic": AnchorTonic} {
		if a, err := ParseAnchor(in); err != nil || a != want {
			t.Errorf("ParseAnchor(%q) = %v, %v", in, a, err)
		}
	}
	if _, err := ParseAnchor("middle"); err == nil {
		t.Error("--anchor middle accepted")
	}
}
