package target

import (
	"math"
	"testing"
)

// A chord member is read as its chord spells it (interface contract,
// "Spelling window": G♯ as the third of E major in F major), against that
// spelling's target. F major's window holds A♭, not G♯ (Ab…C♯); in ¼-comma
// meantone at A4 = 440 Hz the G♯ a pure third above E sits exactly on G♯'s
// target (the temperament's major thirds are pure 5/4, its definition), and
// 41.059 ¢ below A♭'s (the lesser diesis 128/125, Barbour 1951).
func TestReadAsSpellsTheChordMember(t *testing.T) {
	tu := tuning(t, "F major", "meantone:1/4", 440)
	hz := tu.Target(note(t, "E4")) * 5 / 4
	r := tu.ReadAs(note(t, "G#1"), hz) // the octave given does not matter
	if r.Note.String() != "G#4" || r.Alt.String() != "Ab4" {
		t.Fatalf("ReadAs(G#) read %s / alt %s, want G#4 / Ab4", r.Note, r.Alt)
	}
	near(t, "cents from G#4", r.Deviation, 0, 1e-9)
	near(t, "cents from Ab4", r.AltDeviation, -41.059, 0.001)
	if r.OnOther || r.SamePitch {
		t.Errorf("OnOther %v SamePitch %v: a pure G#4 is on G#4", r.OnOther, r.SamePitch)
	}
	if w := tu.Classify(hz); w.Note.String() != "Ab4" {
		t.Errorf("alone the window reads it %s, want Ab4", w.Note)
	}
	// For the note the window gives, ReadAs is Classify.
	for _, f := range []float64{130.81, 261.63 * math.Exp2(7.0/1200), 415.3, 987.77} {
		c, a := tu.Classify(f), tu.ReadAs(tu.Classify(f).Note, f)
		if c.Note != a.Note || c.Alt != a.Alt || c.OnOther != a.OnOther || c.SamePitch != a.SamePitch ||
			math.Abs(c.Deviation-a.Deviation) > 1e-9 || math.Abs(c.AltDeviation-a.AltDeviation) > 1e-9 {
			t.Errorf("%g Hz: Classify %+v, ReadAs %+v", f, c, a)
		}
	}
	if r := tu.ReadAs(note(t, "G#4"), 0); r != (Reading{}) {
		t.Errorf("ReadAs of no pitch: %+v", r)
	}
}

// Under a declared chord the member's target is just above the root, and
// its other spelling keeps the temperament's gap from it (interface
// contract, "Alternative spelling": "in a temperament where both spellings
// share one pitch it never does"). In equal temperament an equal-tempered
// G♯4 over a declared E major is 13.69 ¢ above its just target (5/4 =
// 386.31 ¢ against 400 ¢, from the definitions) and not on A♭4; in ¼-comma
// meantone A♭4 lies the lesser diesis, 41.059 ¢ (Barbour 1951), above the
// just G♯4.
func TestDeclaredChordKeepsTheOtherSpellingsGap(t *testing.T) {
	chord, err := ParseChord("E major")
	if err != nil {
		t.Fatal(err)
	}
	tu := tuning(t, "F major", "equal", 440)
	tu.Chord = chord
	r := tu.Classify(415.3047)
	if r.Note.String() != "G#4" || !r.SamePitch || r.OnOther || r.AltDeviation != r.Deviation {
		t.Errorf("equal: %+v, want G#4 sharing its pitch with Ab4", r)
	}
	near(t, "equal-tempered G#4 against just", r.Deviation, 400-Cents(5.0/4), 0.001)

	tu = tuning(t, "F major", "meantone:1/4", 440)
	tu.Chord = chord
	just := tu.Target(note(t, "G#4"))
	r = tu.Classify(just * math.Exp2(41.059/1200))
	if !r.OnOther || r.SamePitch {
		t.Errorf("¼-comma, a diesis above the just G#4: %+v, want it on Ab4", r)
	}
	near(t, "against Ab4", r.AltDeviation, 0, 0.001)
	near(t, "against G#4", r.Deviation, 41.059, 0.001)
}
