package main

import (
	"testing"

	"fifthline/internal/testsignal"
)

// bassoonWinds: a wind quartet of our own writing on the FluidR3 bassoon's
// hardest keys (General MIDI 70; programs as in ensembleTakes), G minor:
// i – iv – V – i, chords of 1.4 s. The bassoon's G2 is read at its 5th
// partial (B4) for 0.1 s after its attack and its D3 as the D4 and A4 of a
// slur for 0.2 s at half the frames' offsets against the onset, and its G2
// and G3 glide some 10 ¢ up into their vibrato (pitchdetect's
// TestABassoonsAttackIsPartOfItsNote); the flute's D5, held from the
// D major chord (its root) into G minor (its fifth), sounds on the
// bassoon's D3's 4th harmonic and G3's 3rd. The flute rests through the
// first chord; the last is written just (a 6/5 minor third, 315.64 ¢, is
// 15.64 ¢ above equal temperament's).
var bassoonWinds = ensembleTake{
	name: "winds-bassoon", key: "G minor", players: []string{"bn", "cl", "ob", "fl"}, cents: 1,
	chords: []string{"G minor", "C minor", "D major", "G minor"},
	parts: []testsignal.MIDIPart{
		{Program: 70, Notes: []testsignal.TimedNote{note(43, 0, 1.4, 0), note(48, 1.5, 1.4, 0), note(50, 3, 1.4, 0), note(55, 4.5, 1.4, 0)}},
		{Program: 71, Notes: []testsignal.TimedNote{note(62, 0, 1.4, 0), note(63, 1.5, 1.4, 0), note(66, 3, 1.4, 0), note(62, 4.5, 1.4, justFifth)}},
		{Program: 68, Notes: []testsignal.TimedNote{note(70, 0, 1.4, 0), note(67, 1.5, 1.4, 0), note(69, 3, 1.4, 0), note(70, 4.5, 1.4, 15.64)}},
		{Program: 73, Notes: []testsignal.TimedNote{note(72, 1.5, 1.4, 0), note(74, 3, 2.9, justFifth)}},
	},
}

// The bassoon's take is read by every test of the rendered takes.
func init() { ensembleTakes = append(ensembleTakes, bassoonWinds) }

// The bassoon's take played live, as the winds are in
// TestListenPlayersHearsRenderedWindsLive.
func TestListenPlayersHearsBassoonWindsLive(t *testing.T) {
	t.Parallel()
	hearTakeLive(t, renderTake(t, bassoonWinds))
}
