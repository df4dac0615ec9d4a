package ui

import (
	"strings"
	"testing"
)

// A row shows what sounds now. On one microphone a row is a place in the
// chord, lowest first: when the chord has fewer voices heard than before
// (C major's C4 E4 G4, then F4 and A4 with the third voice not heard, as
// a voice hidden in its bass's partials is), the third row says "not
// heard", not the G4 of the chord before. Pitches in equal temperament at
// A4 = 440 Hz (ISO 16); frames every 85 ms on the voices' long windows.
func TestAVoiceNotHeardSaysSoInsteadOfTheChordBefore(t *testing.T) {
	g := voicesMeter(t)
	f4, a4 := et(-4), et(0)
	at := 1.024
	for ; at < 2; at += 0.085 {
		voicesFrame(g, at, -20, c4, c4*5/4, c4*3/2)
	}
	for ; at < 3; at += 0.085 {
		voicesFrame(g, at, -20, f4, a4, 0)
	}
	r := g.readings()
	if !r[0].Holding || r[0].Note.Pretty() != "F4" || !r[1].Holding || r[1].Note.Pretty() != "A4" {
		t.Errorf("voices 1 and 2: %+v, %+v; want F4 and A4 held", r[0], r[1])
	}
	if !r[2].Unheard {
		t.Errorf("voice 3 while F4 and A4 sound: %+v, want not heard", r[2])
	}
	cols := columnsFor(g, 80)
	if got := groupRowLine(2, r[2], cols).Text(); !strings.Contains(got, "voice 3 not heard") || strings.Contains(got, "G4") {
		t.Errorf("voice 3's row: %q, want it not heard, without the G4 before", got)
	}
	// Once every voice has stopped, the rows show the last chord's notes
	// (dim), as the "last chord" line names it.
	for end := at + 1; at < end; at += 0.085 {
		voicesFrame(g, at, -120, 0, 0, 0)
	}
	for i, want := range []string{"F4", "A4", "G4"} {
		if r := g.readings()[i]; r.Unheard || r.Holding || r.Note.Pretty() != want {
			t.Errorf("after the group stopped, voice %d: %+v, want %s, dim", i+1, r, want)
		}
	}
}

// A player's row is that player: one who stops while the others play on
// keeps the last note, dim (players on their own channels, 10 ms frames;
// E3 B3 G♯4 in equal temperament at A4 = 440 Hz, ISO 16).
func TestAPlayerWhoStopsKeepsTheLastNote(t *testing.T) {
	g := groupHolding(keyOf(t, "A major"), trio, e3, b3, gSharp4)
	feedGroup(g, 1, 2, e3, b3, 0)
	if r := g.readings()[2]; r.Unheard || r.Holding || r.Note.Pretty() != "G♯4" {
		t.Errorf("the violin after it stopped: %+v, want G♯4, dim", r)
	}
}
