package session

import (
	"context"
	"math"
	"slices"
	"testing"

	"fifthline/target"
)

// quarterComma is C major in ¼-comma meantone at A4 = 415 Hz, where F♯ and
// G♭ lie a lesser diesis apart (128/125 = 41.059 ¢, Barbour 1951).
func quarterComma(t *testing.T) target.Tuning {
	tm, err := target.Meantone(1, 4)
	if err != nil {
		t.Fatal(err)
	}
	return target.Tuning{Key: target.Default().Key, Temperament: tm, A4: 415}
}

// cents moves a frequency by c cents (the definition of the cent).
func cents(hz, c float64) float64 { return hz * math.Exp2(c/1200) }

// A held note's other spelling stays put while its pitch wavers across its
// target, frame by frame (interface contract, "Alternative spelling": of the
// two respellings the one with fewer accidentals, none with two more): G
// offers none (not F𝄪 below, not A𝄫 above), C always B♯, F♯ always G♭.
func TestTheOtherSpellingStaysPutWhileANoteIsHeld(t *testing.T) {
	tu := quarterComma(t)
	for note, want := range map[string]string{"G4": "", "C4": "B#3", "F#4": "Gb4"} {
		n, _ := target.ParseNote(note)
		hz := tu.Target(n)
		var parts []tonePart
		for range 10 { // ±6 ¢ every 0.1 s, one legato note
			parts = append(parts, tonePart{cents(hz, 6), 0.1}, tonePart{cents(hz, -6), 0.1})
		}
		alts := map[string]bool{}
		signs := map[bool]bool{}
		err := Run(context.Background(), &tones{rate: 48000, parts: parts}, Options{Tunings: NewTunings(tu),
			OnFrame: func(f Frame) {
				for _, r := range []target.Reading{f.Reading, f.HeldReading} {
					if r.Hz > 0 && r.Note.String() == note {
						alts[map[bool]string{true: r.Alt.String()}[r.HasAlt]] = true
						signs[r.Deviation > 0] = true
					}
				}
			}})
		if err != nil {
			t.Fatal(err)
		}
		if len(signs) != 2 || len(alts) != 1 || !alts[want] {
			t.Errorf("%s wavering across its target (both sides seen: %v): alternatives %v, want only %q", note, len(signs) == 2, alts, want)
		}
	}
}

// The held-note CSV line (interface contract, analyze): on_other_spelling
// follows alt_cents; alt_note and alt_cents are empty where none is offered.
func TestRecordSaysWhetherTheNoteSatOnTheOtherSpelling(t *testing.T) {
	tu := quarterComma(t)
	at := slices.Index(Columns, "on_other_spelling")
	if at < 0 || Columns[at-1] != "alt_cents" {
		t.Fatalf("columns %v", Columns)
	}
	for _, c := range []struct {
		note          string
		cents         float64
		alt, altC, on string
	}{
		{"Gb4", 0, "Gb4", "0.00", "true"},     // G♭'s own target, read as F♯4 +41.06 ¢
		{"F#4", 25, "Gb4", "-16.06", "false"}, // nearer G♭, outside the quarter gap
		{"G4", 0, "", "", "false"},            // no other spelling
	} {
		n, _ := target.ParseNote(c.note)
		ev := Event{Reading: tu.Classify(cents(tu.Target(n), c.cents)), Tuning: tu}
		rec := ev.Record(false)
		if rec[at-2] != c.alt || rec[at-1] != c.altC || rec[at] != c.on {
			t.Errorf("%s %+g ¢: alt_note %q alt_cents %q on_other_spelling %q; want %q %q %q", c.note, c.cents, rec[at-2], rec[at-1], rec[at], c.alt, c.altC, c.on)
		}
	}
}
