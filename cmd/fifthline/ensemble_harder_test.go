package main

import (
	"strings"
	"testing"

	"fifthline/internal/testsignal"
)

// harderTakes: the same three groups in quicker writing that asks more of
// the ownership test and the bleed estimate: chords of 0.9 s, a unison
// between two players, an octave doubling, and a player entering late on a
// chord already sounding (the chord is then named twice: before the entry
// and after it, as two players' stretches). The last chord is written just,
// as in ensembleTakes. Their bar is the ensemble issue's: 1 ¢ for the
// winds, whose FluidR3 samples hold a steady pitch, 1.5 ¢ for the strings
// and voices, whose samples carry vibrato (the "with vibrato"),
// and 1.5 ¢ for thirds and fifths against the take without bleed. The
// clarinet's E4 of the third chord holds it only since the segmenter reads
// an attack's glide alike whether the note follows a rest or a slur: the
// A4 before it ends, alone, on one quiet release frame that the bleed left
// after cleaning makes read no pitch, so wet the E4 follows a rest and
// alone a slur (pitchdetect's TestGlideReadsAlikeAfterARestOrASlur).
//
// General MIDI programs as in ensembleTakes.
var harderTakes = []ensembleTake{
	{
		name: "winds-harder", key: "C major", players: []string{"bn", "cl", "ob", "fl"}, cents: 1,
		chords: []string{"C major", "F major", "F major", "C major", "G major"},
		parts: []testsignal.MIDIPart{
			{Program: 70, Cents: 0, Notes: []testsignal.TimedNote{note(48, 0, 0.9, 0), note(53, 1, 0.9, 0), note(48, 2, 0.9, 0), note(55, 3, 0.9, 0)}},
			// The clarinet and oboe end in unison on D5, the chord's fifth.
			{Program: 71, Cents: 3, Notes: []testsignal.TimedNote{note(64, 0, 0.9, 0), note(69, 1, 0.9, 0), note(64, 2, 0.9, 0), note(74, 3, 0.9, justFifth-3)}},
			{Program: 68, Cents: -4, Notes: []testsignal.TimedNote{note(67, 0, 0.9, 0), note(72, 1, 0.9, 0), note(67, 2, 0.9, 0), note(74, 3, 0.9, justFifth+4)}},
			// The flute rests through the first chord and enters 0.4 s into
			// the second; its G5 doubles the oboe's G4 an octave up, and the
			// G4 it may read at its attack is the bassoon's third harmonic.
			{Program: 73, Cents: 2, Notes: []testsignal.TimedNote{note(77, 1.4, 0.5, 0), note(79, 2, 0.9, 0), note(83, 3, 0.9, justThird-2)}},
		},
	},
	{
		name: "strings-harder", key: "D major", players: []string{"vc", "vla", "vl2", "vl1"}, cents: 1.5,
		chords: []string{"D major", "G major", "G major", "A major", "D major"},
		parts: []testsignal.MIDIPart{
			{Program: 42, Cents: 0, Notes: []testsignal.TimedNote{note(50, 0, 0.9, 0), note(43, 1, 0.9, 0), note(45, 2, 0.9, 0), note(50, 3, 0.9, 0)}},
			// The viola doubles the first violin's E5 an octave down.
			{Program: 41, Cents: -3, Notes: []testsignal.TimedNote{note(57, 0, 0.9, 0), note(59, 1, 0.9, 0), note(64, 2, 0.9, 0), note(57, 3, 0.9, justFifth+3)}},
			{Program: 40, Cents: 4, Notes: []testsignal.TimedNote{note(66, 0, 0.9, 0), note(74, 1, 0.9, 0), note(73, 2, 0.9, 0), note(66, 3, 0.9, justThird-4)}},
			// The first violin rests through the first chord and enters
			// 0.4 s into the second, in unison with the second violin's D5.
			{Program: 40, Cents: -2, Notes: []testsignal.TimedNote{note(74, 1.4, 0.5, 0), note(76, 2, 0.9, 0), note(74, 3, 0.9, 2)}},
		},
	},
	{
		name: "choir-harder", key: "F major", players: []string{"b", "t", "a", "s"}, cents: 1.5,
		chords: []string{"F major", "Bb major", "C major", "C major", "F major"},
		parts: []testsignal.MIDIPart{
			{Program: 53, Cents: 2, Notes: []testsignal.TimedNote{note(41, 0, 0.9, 0), note(46, 1, 0.9, 0), note(48, 2, 0.9, 0), note(41, 3, 0.9, 0)}},
			// The tenor doubles the bass's C3 an octave up in the third chord.
			{Program: 53, Cents: -3, Notes: []testsignal.TimedNote{note(60, 0, 0.9, 0), note(62, 1, 0.9, 0), note(60, 2, 0.9, 0), note(57, 3, 0.9, justThird+5)}},
			// The altos sing the tenors' D4 in unison in the second chord.
			{Program: 53, Cents: 1, Notes: []testsignal.TimedNote{note(65, 0, 0.9, 0), note(62, 1, 0.9, 0), note(64, 2, 0.9, 0), note(60, 3, 0.9, justFifth+1)}},
			// The sopranos rest through the second chord and enter 0.5 s
			// into the third (after a rest: a voice's release rings on for
			// some 0.3 s).
			{Program: 53, Cents: -4, Notes: []testsignal.TimedNote{note(69, 0, 0.9, 0), note(67, 2.5, 0.4, 0), note(65, 3, 0.9, 6)}},
		},
	},
}

// The harder takes are read by every test of the rendered takes.
func init() { ensembleTakes = append(ensembleTakes, harderTakes...) }

// The harder winds played live, as the winds are in
// TestListenPlayersHearsRenderedWindsLive: listen learns the bleed as it
// hears it, with no second pass. (The strings and voices live:
// ensemble_live_test.go; the harder choir's bass is not held to it.)
func TestListenPlayersHearsHarderWindsLive(t *testing.T) {
	t.Parallel()
	r := renderTake(t, harderTakes[0])
	lone := r.loneNotes(t)
	out := playQuartetLive(t, r.wet, "--key", r.key, "--players", strings.Join(r.players, ","))
	_, rows := readCSV(t, out)
	checkPlayerNotes(t, "listen", r, lone, rows, false)
	if t.Failed() {
		t.Log(out)
	}
}
