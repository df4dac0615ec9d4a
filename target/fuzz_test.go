package target

import (
	"math"
	"slices"
	"strings"
	"testing"
)

// The parsers must never panic, and what they accept must behave.

func FuzzParseNote(f *testing.F) {
	for _, s := range []string{"F#4", "Bb3", "C𝄪5", "E𝄫-1", "B#3", "x", "H4"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		n, err := ParseNote(s)
		if err != nil {
			return
		}
		back, err := ParseNote(n.String())
		if err != nil || back != n {
			t.Fatalf("%q → %v → %q → %v, %v", s, n, n.String(), back, err)
		}
	})
}

func FuzzParseChord(f *testing.F) {
	for _, s := range []string{"D major", "G7", "G dominant seventh", "Bb  maj7", "B dim", "F#m", "C open fifth", "H7"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c, err := ParseChord(s)
		if err != nil {
			return
		}
		back, err := ParseChord(c.String())
		if err != nil || back.String() != c.String() {
			t.Fatalf("%q → %q → %v, %v", s, c.String(), back, err)
		}
	})
}

func FuzzParseKey(f *testing.F) {
	for _, s := range []string{"G major", "f# minor", "Bb", "E♭ dorian", "H", "g", "c aeolian", "A# minor"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		k, err := ParseKey(s)
		if err != nil {
			return
		}
		lo, hi := k.WindowSpan()
		if w := k.Window(); len(w) != 12 || hi-lo != 11 || w[0].Fifths() != lo {
			t.Fatalf("%q: window of %d from %d to %d", s, len(w), lo, hi)
		}
		// The diatonic set lies inside the window, with the tonic.
		for _, n := range k.Scale() {
			if n.Fifths() < lo || n.Fifths() > hi {
				t.Fatalf("%q: scale note %s outside the window %d…%d", s, n, lo, hi)
			}
		}
		if _, err := ParseKey(k.String()); err != nil {
			t.Fatalf("%q → %q does not parse: %v", s, k, err)
		}
	})
}

func FuzzParseTemperament(f *testing.F) {
	for _, s := range append(Builtin, "meantone:1/0", "fifth:2000", "edo:0", "fifth:1e308", "edo:7", "fifth:720",
		"Werckmeister III", "¼-comma meantone", "quarter-comma", "edo31", "31-EDO", "regular, fifth 696.5¢", "werkmeister") {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tm, err := ParseTemperament(s)
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		checkTemperament(t, tm)
		if r, ok := tm.(Regular); ok {
			checkOrder(t, r)
		}
	})
}

func FuzzParseCustom(f *testing.F) {
	f.Add(werckmeisterFile)
	f.Add("fifth = 696.578\n")
	f.Add("C# = 1/0\n")
	f.Fuzz(func(t *testing.T, s string) {
		c, err := ParseCustom("fuzz", []byte(s))
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		checkTemperament(t, c)
	})
}

// checkTemperament: every window note of every key gets a finite target and
// classifying that target finds the note again.
func checkTemperament(t *testing.T, tm Temperament) {
	tu := Tuning{Key: Key{Tonic: Note{Letter: D}, Mode: Minor}, Temperament: tm, A4: 415}
	for _, n := range tu.Window() {
		hz := tu.Target(n)
		if math.IsNaN(hz) || hz <= 0 || math.IsInf(hz, 0) {
			t.Fatalf("%s: %s target %g", tm.Spec(), n, hz)
		}
		if r := tu.Classify(hz); r.Note.Name() != n.Name() && math.Abs(r.Deviation) > 1e-6 {
			t.Fatalf("%s: %s's own target reads as %s %+.3f¢", tm.Spec(), n, r.Note, r.Deviation)
		}
	}
}

// checkOrder: in an accepted regular temperament every key's window keeps
// its spellings in order and apart: C before C♯ before D … (the fifth
// bounds' reason).
func checkOrder(t *testing.T, r Regular) {
	for tonic := -7; tonic <= 7; tonic++ {
		tu := Tuning{Key: Key{Tonic: noteAt(tonic, 4), Mode: Major}, Temperament: r, A4: 440}
		w := tu.Window()
		slices.SortFunc(w, func(a, b Note) int { return a.Semitones() - b.Semitones() })
		for i := 1; i < len(w); i++ {
			if tu.TargetPitch(w[i]) <= tu.TargetPitch(w[i-1]) {
				t.Fatalf("%s in %s: %s at or below %s", r.Spec(), tu.Key, w[i], w[i-1])
			}
		}
	}
}

// An accepted reference is a number of hertz within the bounds, with or
// without its unit.
func FuzzParseA4(f *testing.F) {
	for _, s := range []string{"440", "415Hz", "415 Hz", "442hz", "hz", "-440", "1e9", "NaN"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		hz, err := ParseA4(s)
		if err == nil && !(hz >= MinA4 && hz <= MaxA4) {
			t.Fatalf("%q → %g Hz, outside %g to %g", s, hz, MinA4, MaxA4)
		}
	})
}
