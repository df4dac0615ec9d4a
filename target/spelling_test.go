package target

import (
	"math"
	"strings"
	"testing"
)

// The quarter-gap rule (interface contract, "Alternative spelling"): a
// reading sits on the other spelling only when the held pitch is nearer the
// alternative's target and within a quarter of the gap between the two
// targets. The gaps are the definitions' enharmonic dieses: ¼-comma 128/125 =
// 41.059 ¢ (Barbour 1951), ⅙-comma 7·1200 − 12·(701.955 − 21.506/6) =
// 19.553 ¢, Pythagorean the Pythagorean comma 23.460 ¢ (G♭ below F♯); the
// contract rounds their quarters to 10.3, 4.9 and 5.9 ¢.
func TestSitsOnTheOtherSpellingOnlyWithinAQuarterOfTheGap(t *testing.T) {
	for _, tc := range []struct {
		spec    string
		gap     float64 // G♭4's target minus F♯4's
		quarter float64 // as the contract states it, to 0.1 ¢
	}{
		{"meantone:1/4", 41.059, 10.3},
		{"meantone:1/6", 19.553, 4.9},
		{"pythagorean", -23.460, 5.9},
	} {
		tu := tuning(t, "C major", tc.spec, 440)
		fs, gb := note(t, "F#4"), note(t, "Gb4")
		gap := tu.TargetPitch(gb) - tu.TargetPitch(fs)
		near(t, tc.spec+" gap", gap, tc.gap, 0.001)
		near(t, tc.spec+" quarter", math.Abs(gap)/4, tc.quarter, 0.05)
		at := func(fromGb float64) Reading { // the held pitch, cents from G♭4's target
			return tu.Classify(tu.Target(gb) * math.Exp2(fromGb/1200))
		}
		toward := -math.Copysign(1, gap) // from G♭ back toward F♯
		for _, c := range []struct {
			fromGb       float64
			on, towardGb bool
		}{
			{0, true, false},
			{toward * (math.Abs(gap)/4 - 0.01), true, false},
			{toward * (math.Abs(gap)/4 + 0.01), false, true},
			{toward * (math.Abs(gap)/2 - 0.01), false, true},  // just nearer G♭
			{toward * (math.Abs(gap)/2 + 0.01), false, false}, // just nearer F♯
		} {
			r := at(c.fromGb)
			if r.Note.String() != "F#4" || r.Alt.String() != "Gb4" || r.OnOther != c.on || r.TowardOther() != c.towardGb {
				t.Errorf("%s, %+.2f ¢ from Gb4: %s alt %s, on %v toward %v; want on %v toward %v",
					tc.spec, c.fromGb, r.Note, r.Alt, r.OnOther, r.TowardOther(), c.on, c.towardGb)
			}
		}
	}
}

// The two musicians: in ⅙-comma an F♯ pushed up 11 ¢ (an expressive
// leading tone) is 8.6 ¢ from G♭ but 4.9 ¢ is the limit: it reads "sharp,
// toward G♭", never "on G♭"; a Pythagorean F♯ 12 ¢ low likewise, flat.
func TestAnExpressiveLeadingToneIsNotTheOtherSpelling(t *testing.T) {
	for _, tc := range []struct {
		spec    string
		cents   float64
		on      bool
		verdict string
	}{
		{"meantone:1/6", +11, false, "F#4 +11.0 ¢, toward Gb4"},
		{"pythagorean", -12, false, "F#4 -12.0 ¢, toward Gb4"},
		{"meantone:1/4", +3, false, "F#4 +3.0 ¢ (Gb4 would be -38.1 ¢)"},
		{"meantone:1/4", +41.059, true, "F#4 +41.1 ¢, sits on Gb4 (0.0 ¢)"},
		// Past G♭ (19.6 ¢ above F♯ in ⅙-comma) it no longer leans toward it.
		{"meantone:1/6", +40, false, "F#4 +40.0 ¢ (Gb4 would be +20.4 ¢)"},
	} {
		tu := tuning(t, "G major", tc.spec, 440)
		r := tu.Classify(tu.Target(note(t, "F#4")) * math.Exp2(tc.cents/1200))
		if r.OnOther != tc.on || r.Verdict() != tc.verdict {
			t.Errorf("%s, F#4 %+g ¢: %q (on %v), want %q", tc.spec, tc.cents, r.Verdict(), r.OnOther, tc.verdict)
		}
	}
}

// Where both spellings share one pitch (equal temperament, 12-EDO, the well
// temperaments: twelve notes to the octave by definition), no reading is ever
// on the other spelling, and the tuning says "one pitch" once, in its
// description, instead of on every note.
func TestSharedPitchesAreSaidOnce(t *testing.T) {
	for _, spec := range []string{"equal", "edo:12", "werckmeister3", "kirnberger3", "vallotti", "young"} {
		tu := tuning(t, "C major", spec, 440)
		if !tu.SharesPitches() || strings.Count(tu.String(), "enharmonic spellings share one pitch") != 1 {
			t.Errorf("%s: SharesPitches %v, %q", spec, tu.SharesPitches(), tu)
		}
		for _, n := range tu.Window() {
			for _, c := range []float64{-49, -20, 0, 20, 49} {
				r := tu.Classify(tu.Target(n) * math.Exp2(c/1200))
				if r.OnOther || r.TowardOther() || strings.Contains(r.Verdict(), "(") {
					t.Errorf("%s, %s %+g ¢: %q", spec, n, c, r.Verdict())
				}
			}
		}
	}
	for _, spec := range []string{"meantone:1/4", "pythagorean", "edo:31", "just"} {
		if tu := tuning(t, "C major", spec, 440); tu.SharesPitches() || strings.Contains(tu.String(), "share") {
			t.Errorf("%s says its spellings share pitches: %q", spec, tu)
		}
	}
}

// The alternative spelling (interface contract): twelve fifths away, the
// respelling with fewer accidentals, none when it would carry two
// accidentals more than the note (G has none: not F𝄪, not A𝄫).
func TestAlternativeIsTheRespellingWithFewerAccidentals(t *testing.T) {
	for n, want := range map[string]string{
		"C": "B#", "D": "", "E": "Fb", "F": "E#", "G": "", "A": "", "B": "Cb",
		"F#": "Gb", "C#": "Db", "G#": "Ab", "D#": "Eb", "A#": "Bb", "E#": "F", "B#": "C",
		"Bb": "A#", "Eb": "D#", "Ab": "G#", "Db": "C#", "Gb": "F#", "Cb": "B", "Fb": "E",
		"F##": "G", "C##": "D", "G##": "A", "Bbb": "A", "Ebb": "D", "Abb": "G", "Dbb": "C",
	} {
		alt, ok := Alternative(note(t, n+"4"))
		if got := map[bool]string{true: alt.Name(), false: ""}[ok]; got != want {
			t.Errorf("Alternative(%s) = %q, want %q", n, got, want)
		}
	}
	// The octave belongs to the letter: B♯3 is C4's, C♭4 is B3's.
	for n, want := range map[string]string{"C4": "B#3", "B3": "Cb4", "Gb4": "F#4"} {
		if alt, _ := Alternative(note(t, n)); alt.String() != want {
			t.Errorf("Alternative(%s) = %s, want %s", n, alt, want)
		}
	}
}

// The contract breaks a tie in accidentals by the nearer target, so the
// choice could flip (F𝄪/A𝄫) frame by frame as a held G crosses its target.
// No tie survives the two-accidental rule, for any note up to double
// accidentals: the alternative depends on the note alone and stays put while
// a note is held, whatever the temperament.
func TestAlternativeDependsOnTheNoteAlone(t *testing.T) {
	for p := -15; p <= 19; p++ { // every spelling from F𝄫 to B𝄪
		n := noteAt(p, 4)
		up, down := n.respell(12), n.respell(-12)
		if abs(up.Accidental) == abs(down.Accidental) {
			if _, ok := Alternative(n); ok {
				t.Errorf("%s: a tie between %s and %s is offered", n, up, down)
			}
		}
	}
	for _, spec := range []string{"meantone:1/4", "pythagorean", "edo:31", "just", "equal"} {
		tu := tuning(t, "G minor", spec, 415)
		for _, n := range tu.Window() {
			want, _ := Alternative(n)
			for c := -45.0; c <= 45; c += 0.5 {
				r := tu.Classify(tu.Target(n) * math.Exp2(c/1200))
				if r.Note.Name() == n.Name() && r.Alt.Name() != want.Name() {
					t.Fatalf("%s, %s %+g ¢: alt %s, want %s", spec, n, c, r.Alt, want)
				}
			}
		}
	}
}

// The minor key's raised fourth (the viol player in G minor): an
// in-tune C♯4, third of A major, the dominant's dominant, reads C♯4 on its
// target, not "D♭4 −41 ¢ · sits on C♯4". ¼-comma at A4 = 415, the common
// meantone keyboard practice.
func TestMinorKeysReadTheirRaisedFourth(t *testing.T) {
	for _, tc := range []struct{ key, held string }{
		{"G minor", "C#4"}, {"D minor", "G#4"}, {"C minor", "F#4"}, {"F# minor", "B#3"}, {"A minor", "D#4"},
	} {
		tu := tuning(t, tc.key, "meantone:1/4", 415)
		r := tu.Classify(tu.Target(note(t, tc.held)))
		if r.Note.String() != tc.held || math.Abs(r.Deviation) > 1e-9 || r.OnOther {
			t.Errorf("%s: in-tune %s reads %q", tc.key, tc.held, r.Verdict())
		}
	}
}
