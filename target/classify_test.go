package target

import (
	"math"
	"strings"
	"testing"
)

func note(t *testing.T, s string) Note {
	t.Helper()
	n, err := ParseNote(s)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

// The scene: ¼-comma meantone at A4 = 415 Hz, C major. A player who
// puts G♭4 where F♯4 is wanted is read as F♯4 about 41 ¢ sharp, and seen to
// sit on G♭4 (the lesser diesis 128/125 = 41.059 ¢, Barbour 1951).
func TestClassifySeesTheOtherSpelling(t *testing.T) {
	tu := tuning(t, "C major", "meantone:1/4", 415)
	gb := tu.Target(note(t, "Gb4"))
	r := tu.Classify(gb)
	if r.Note.String() != "F#4" || r.Alt.String() != "Gb4" {
		t.Fatalf("Classify(Gb4 target) read %s / alt %s, want F#4 / Gb4", r.Note, r.Alt)
	}
	near(t, "cents from F#4", r.Deviation, 41.059, 0.001)
	near(t, "cents from Gb4", r.AltDeviation, 0, 1e-9)
	if !r.OnOther || r.SamePitch || r.TowardOther() {
		t.Errorf("OnOther %v SamePitch %v TowardOther %v: want it on the other spelling", r.OnOther, r.SamePitch, r.TowardOther())
	}
	r = tu.Classify(tu.Target(note(t, "F#4")) * math.Exp2(-3.0/1200))
	near(t, "F#4 3 ¢ flat", r.Deviation, -3, 1e-9)
	near(t, "against Gb4", r.AltDeviation, -44.059, 0.001)
	if r.OnOther || r.TowardOther() {
		t.Error("a slightly flat F#4 is not on Gb4")
	}
}

// In equal temperament and the well temperaments both spellings are one pitch
// (twelve notes to the octave, one per key: their definition, common
// practice), and the reading says so rather than invent a difference. 370 Hz
// is a shade above equal-tempered F♯4, 369.994 Hz at A4 = 440 Hz (ISO 16).
func TestClassifySaysWhenSpellingsShareAPitch(t *testing.T) {
	for _, spec := range []string{"equal", "werckmeister3", "vallotti", "edo:12"} {
		tu := tuning(t, "C major", spec, 440)
		r := tu.Classify(370)
		if r.Note.String() != "F#4" || !r.SamePitch || r.OnOther || r.TowardOther() || r.AltDeviation != r.Deviation {
			t.Errorf("%s: %+v, want F#4 sharing its pitch with Gb4", spec, r)
		}
	}
}

// Readings across the range (A0 to C8) in equal temperament at ISO 16's
// 440 Hz, against standard frequency tables: 27.5 Hz is A0, 4186.009 Hz C8.
func TestClassifyAcrossTheRange(t *testing.T) {
	tu := Default()
	for _, tc := range []struct {
		hz    float64
		note  string
		cents float64
	}{
		{27.5, "A0", 0}, {4186.009, "C8", 0}, {261.626, "C4", 0}, {440 * math.Exp2(10.0/1200), "A4", 10},
		{311.127, "Eb4", 0}, {415.305, "G#4", 0}, {466.164, "Bb4", 0},
	} {
		r := tu.Classify(tc.hz)
		if r.Note.String() != tc.note {
			t.Errorf("Classify(%g) = %s, want %s", tc.hz, r.Note, tc.note)
		}
		near(t, "cents", r.Deviation, tc.cents, 0.01) // tables give Hz to 0.001
	}
	for _, bad := range []float64{0, -440, math.NaN(), math.Inf(1)} {
		if r := tu.Classify(bad); r.Hz != 0 || r.Verdict() != "no pitch" {
			t.Errorf("Classify(%g) = %+v, want the zero Reading", bad, r)
		}
	}
}

// The alternative spelling (contract): twelve fifths away, fewer accidentals,
// ties broken by the nearer target.
func TestAlternativeSpelling(t *testing.T) {
	tu := tuning(t, "C major", "meantone:1/4", 440)
	for _, tc := range []struct{ key, held, note, alt string }{
		{"C major", "F#4", "F#4", "Gb4"},
		{"C major", "Bb4", "Bb4", "A#4"},
		{"C major", "E4", "E4", "Fb4"},
		{"C major", "C4", "C4", "B#3"},
		{"C major", "B3", "B3", "Cb4"},
		{"G major", "D#4", "D#4", "Eb4"},
		{"D minor", "G#4", "G#4", "Ab4"},
		{"G minor", "C#4", "C#4", "Db4"},
	} {
		tk := tu
		tk.Key, _ = ParseKey(tc.key)
		r := tk.Classify(tk.Target(note(t, tc.held)))
		if r.Note.String() != tc.note || r.Alt.String() != tc.alt {
			t.Errorf("%s, %s: read %s alt %s, want %s alt %s", tc.key, tc.held, r.Note, r.Alt, tc.note, tc.alt)
		}
	}
	// D's respellings C## and Ebb both carry two accidentals more than D:
	// none is offered, however the pitch leans.
	d := tu.Target(note(t, "D4"))
	for _, c := range []float64{-5, 5} {
		if r := tu.Classify(d * math.Exp2(c/1200)); r.HasAlt || r.OnOther || r.Verdict() != "D4 "+FormatCents(c, 1) {
			t.Errorf("D4 %+g ¢: alt %s (%v), verdict %q; want none", c, r.Alt, r.HasAlt, r.Verdict())
		}
	}
}

// --anchor tonic keeps the tonic where equal temperament puts it (ISO 16
// C4 = 261.626 Hz) while A4 moves with the temperament.
func TestAnchorTonic(t *testing.T) {
	tu := tuning(t, "C major", "meantone:1/4", 440)
	tu.Anchor = AnchorTonic
	near(t, "C4 Hz", tu.Target(note(t, "C4")), 261.626, 0.0005)
	// A lies three fifths above C less an octave, each ¼-comma fifth
	// 1200·log2(5)/4 = 696.578 ¢ (definition): 3·696.578 − 1200 = 889.735 ¢.
	near(t, "C4→A4", interval(tu, "C4", "A4"), 889.735, 0.001)
	tu.Anchor = AnchorA4
	near(t, "A4 Hz", tu.Target(note(t, "A4")), 440, 1e-9)
	tu.Anchor = AnchorDefault // outside just, the default keeps A4
	near(t, "A4 Hz", tu.Target(note(t, "A4")), 440, 1e-9)
}

// Chord-relative targets: members at just ratios above the root's tempered
// target (pure thirds and fifths, common practice). The harmonic seventh 7/4
// lies 31.174 ¢ below the equal minor seventh (common practice).
func TestChordTargets(t *testing.T) {
	tu := tuning(t, "C major", "meantone:1/4", 415)
	tu.Chord, _ = ParseChord("D major")
	d := tu.TemperedPitch(note(t, "D4"))
	near(t, "D→F#", tu.TargetPitch(note(t, "F#4"))-d, 386.314, tol)
	near(t, "D→A", tu.TargetPitch(note(t, "A4"))-d, 701.955, tol)
	near(t, "D→A5", tu.TargetPitch(note(t, "A5"))-d, 1901.955, tol)
	near(t, "B unchanged", tu.TargetPitch(note(t, "B4")), tu.TemperedPitch(note(t, "B4")), 0)

	eq := tuning(t, "C major", "equal", 440)
	eq.Chord, _ = ParseChord("G harmonic7")
	near(t, "G harmonic seventh vs equal", eq.CentsFromEqual(note(t, "F5")), -31.174, tol)

	// A chord member's spelling takes the window place of its pitch class:
	// with an A♭ major chord in C major the meter reads A♭, not G♯.
	tu.Chord, _ = ParseChord("Ab major")
	if r := tu.Classify(tu.Target(note(t, "Ab4"))); r.Note.String() != "Ab4" {
		t.Errorf("with chord Ab major, read %s, want Ab4", r.Note)
	}
	// The qualities as a heard chord is named (the contract's "dominant
	// seventh"; "minor seventh", "major seventh": docs/interface.md) are the
	// declared chords of the same shape.
	for spoken, symbol := range map[string]string{"G dominant seventh": "G7", "D minor  seventh": "Dm7", "F Major Seventh": "F maj7"} {
		a, errA := ParseChord(spoken)
		b, errB := ParseChord(symbol)
		if errA != nil || errB != nil || a.String() != b.String() {
			t.Errorf("ParseChord(%q) = %v, %v; want %q's %v", spoken, a, errA, symbol, b)
		}
	}
	for _, bad := range []string{"H major", "D foo", "", "D#b"} {
		if _, err := ParseChord(bad); err == nil {
			t.Errorf("ParseChord(%q) accepted", bad)
		}
	}
}

// Transposing instruments read in written pitch, spelled by interval (the
// issue: a B♭ clarinet's concert B♭4 reads as written C5; common practice for
// the others).
func TestTransposingInstruments(t *testing.T) {
	for _, tc := range []struct{ spec, concert, written string }{
		{"Bb", "Bb4", "C5"}, {"A", "A4", "C5"}, {"F", "F4", "C5"}, {"Eb", "Eb4", "C5"},
		{"Eb4", "Eb5", "C5"}, {"Bb2", "Bb3", "C5"}, {"Bb", "F#4", "G#4"}, {"concert", "F#4", "F#4"},
	} {
		tr, err := ParseTransposition(tc.spec)
		if err != nil {
			t.Fatal(err)
		}
		if got := tr.Written(note(t, tc.concert)); got.String() != tc.written {
			t.Errorf("%s instrument: concert %s written %s, want %s", tc.spec, tc.concert, got, tc.written)
		}
		if back := tr.Concert(tr.Written(note(t, tc.concert))); back.String() != tc.concert {
			t.Errorf("%s instrument: round trip gave %s", tc.spec, back)
		}
	}
	tu := tuning(t, "C major", "meantone:1/4", 415)
	tu.Transpose, _ = ParseTransposition("Bb")
	r := tu.Classify(tu.Target(note(t, "Bb4")))
	if r.Note.String() != "Bb4" || r.Written.String() != "C5" || r.AltWritten.String() != "B#4" {
		t.Errorf("Bb clarinet reading: %s written %s alt %s", r.Note, r.Written, r.AltWritten)
	}
	if _, err := ParseTransposition("H"); err == nil {
		t.Error("--transpose H accepted")
	}
	// Named as players name it, "clarinet in B♭" (common practice): no
	// article to agree with the letter ("a B♭", "an F").
	if got := tu.String(); !strings.HasSuffix(got, " · written for an instrument in Bb") {
		t.Errorf("transposed tuning %q", got)
	}
}

func TestParseA4(t *testing.T) {
	// The unit after the number, as a player writes a reference ("A4 =
	// 415 Hz"), is the same value.
	for _, ok := range []string{"440", "415", "392", "466.0", "380", "480", "415Hz", "415 Hz", "442hz", " 430.5 HZ ", "A4 = 415 Hz", "a=442", "A4=415"} {
		if _, err := ParseA4(ok); err != nil {
			t.Errorf("ParseA4(%q): %v", ok, err)
		}
	}
	// "--a4 -440" and "--a4 abc" are the contract's and the examples.
	for _, bad := range []string{"-440", "abc", "0", "NaN", "Inf", "379.9", "1e9", "", "Hz", " hz", "415 kHz", "415Hzz", "A4 =", "B4 = 415", "A4 = A4 = 415"} {
		if _, err := ParseA4(bad); err == nil {
			t.Errorf("ParseA4(%q) accepted", bad)
		}
	}
}

// Cents in a line of text are one style everywhere: the sign, the number,
// a space and the cent sign, as a measure and its unit are written (SI
// Brochure, 9th edition, 5.4.3, from memory: a space between the number
// and the unit); what rounds to nothing has no sign.
func TestFormatCents(t *testing.T) {
	for _, tc := range []struct {
		c    float64
		d    int
		want string
	}{{3.24, 1, "+3.2 ¢"}, {-0.04, 1, "0.0 ¢"}, {-0.4, 1, "-0.4 ¢"}, {0, 2, "0.00 ¢"}, {41.059, 0, "+41 ¢"}} {
		if got := FormatCents(tc.c, tc.d); got != tc.want {
			t.Errorf("FormatCents(%g, %d) = %q, want %q", tc.c, tc.d, got, tc.want)
		}
	}
}

// Classify runs for every frame and every column of the meter's trace.
func BenchmarkClassify(b *testing.B) {
	k, _ := ParseKey("G minor")
	tm, _ := ParseTemperament("meantone:1/4")
	tu := Tuning{Key: k, Temperament: tm, A4: 415}
	for b.Loop() {
		tu.Classify(351.2)
	}
}
