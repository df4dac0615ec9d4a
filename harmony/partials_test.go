package harmony

import (
	"math"
	"testing"

	"fifthline/target"
)

// Voices on one channel: F3 F4 A4 with E6 read where A4's 3rd partial lies
// (3/1 above it, 6 ¢ sharp, as one microphone heard an oboe's), which names
// no chord, is F major without it; the same notes played by four players
// name none, and a chord named with all its notes keeps them all. Equal
// temperament at A4 = 440 Hz (ISO 16; 440·2^(n/12)), partials from the
// ratios, chord names common practice.
func TestANoteOnAVoicesHarmonicLeftOutWhereTheChordNamesNone(t *testing.T) {
	tu := target.Default()
	et := func(n float64) float64 { return 440 * math.Exp2(n/12) }
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	e6 := 3 * et(0) * math.Exp2(6.0/1200)
	notes := []Note{
		{Start: 0, End: 2, Who: "1", Note: parse("F3"), Hz: et(-16)},
		{Start: 0, End: 2, Who: "2", Note: parse("F4"), Hz: et(-4)},
		{Start: 0, End: 2, Who: "3", Note: parse("A4"), Hz: et(0)},
		{Start: 0, End: 2, Who: "4", Note: parse("E6"), Hz: e6},
	}
	got := FindOneChannel(notes, tu, target.DefaultSeventh)
	if len(got) != 1 || got[0].Name() != "F major" || len(got[0].Notes) != 3 {
		t.Fatalf("one channel: %+v, want F major of F3 F4 A4", got)
	}
	for _, k := range got[0].Notes {
		if k == 3 {
			t.Errorf("F major's members %v hold E6, the partial", got[0].Notes)
		}
	}
	if got := Find(notes, tu, target.DefaultSeventh); len(got) != 0 {
		t.Errorf("players: %+v, want no chord (each note is a player's)", got)
	}
	// G4 on C3's 3rd partial (3/1), where C major names all three: a member.
	full := []Note{
		{Start: 0, End: 2, Who: "1", Note: parse("C3"), Hz: et(-21)},
		{Start: 0, End: 2, Who: "2", Note: parse("E4"), Hz: et(-5)},
		{Start: 0, End: 2, Who: "3", Note: parse("G4"), Hz: 3 * et(-21)},
	}
	if got := FindOneChannel(full, tu, target.DefaultSeventh); len(got) != 1 || got[0].Name() != "C major" || len(got[0].Notes) != 3 {
		t.Errorf("C major: %+v, want all three notes", got)
	}
}
