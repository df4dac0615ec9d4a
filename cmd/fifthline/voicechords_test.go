package main

import (
	"math"
	"slices"
	"testing"

	"fifthline/harmony"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// A voice the estimator loses for a moment under a chord that holds sings
// on: the chord is one row, its member read over both pieces' frames. A
// voice silent for longer than lostSeconds, or found again after the chord
// around it changed, starts a chord row of its own. C3 in equal temperament
// from A4 = 440 Hz (ISO 16: 440·2^(−21/12)); E4 and G4 its just tenth and
// twelfth (5/2, 3: common practice), A2 110 Hz and its just twelfth E4 330
// Hz.
func TestAVoiceLostUnderAHeldChord(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	note := func(voice int, hz, from, to float64) voiceNote {
		tr := &harmony.Track{}
		for at := from; at <= to; at += 0.01 {
			tr.Add(at, hz)
		}
		return voiceNote{Event: session.Event{Held: pitchdetect.Held{Start: from, End: to, Hz: hz}, Reading: tu.Classify(hz)}, voice: voice, frames: tr}
	}
	for _, tc := range []struct {
		name   string
		notes  []voiceNote
		starts []float64 // the chord rows' starts (C3 and G4 alone: C open fifth)
	}{
		{"lost for 0.6 s", []voiceNote{note(1, c3, 0, 3), note(2, c3*5/2, 0, 1.2), note(3, c3*3, 0, 3), note(2, c3*5/2, 1.8, 3)}, []float64{0}},
		// G4's gap is bridged once E4's is, around it.
		{"two lost in turn", []voiceNote{note(1, c3, 0, 3), note(3, c3*3, 0, 1), note(3, c3*3, 1.3, 3), note(2, c3*5/2, 0, 1.2), note(2, c3*5/2, 1.5, 3)}, []float64{0}},
		{"silent for 1.2 s", []voiceNote{note(1, c3, 0, 3.4), note(2, c3*5/2, 0, 1), note(3, c3*3, 0, 3.4), note(2, c3*5/2, 2.2, 3.4)}, []float64{0, 1, 2.2}},
		{"the chord changed meanwhile", []voiceNote{note(1, c3, 0, 1.5), note(2, c3*5/2, 0, 1.2), note(1, 110, 1.5, 3), note(2, 330, 1.8, 3)}, []float64{0, 1.8}},
	} {
		chords := chordsOf(tc.notes, tu, target.DefaultSeventh)
		var starts []float64
		for _, c := range chords {
			starts = append(starts, c.Start)
			for i, m := range c.Members {
				if n := tc.notes[c.Notes[i]]; n.Reading.Note != m.Note || math.Abs(m.JustCents) > 0.01 {
					t.Errorf("%s: %s member %d is %s %+.2f ¢ from just, from note %s: want its own note, just", tc.name, c.Name(), i, m.Note, m.JustCents, n.Reading.Note)
				}
			}
		}
		if !slices.Equal(starts, tc.starts) {
			t.Errorf("%s: chord rows starting at %v, want %v", tc.name, starts, tc.starts)
		}
	}
}
