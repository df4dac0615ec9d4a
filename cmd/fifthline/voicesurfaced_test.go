package main

import (
	"testing"
)

// A quieter note on a louder held note's partial (3 to 6), begun while that
// note sounds and ending with it, is that note's partial surfacing, no
// voice; struck with it, outlasting it, or louder than it, it is a voice,
// save an octave above it, which surfaces at any level.
// Frames at the estimator's default hop and window at 44.1 kHz (4096 and
// 16384 samples); G3 196.00 Hz in equal temperament from A4 = 440 Hz (ISO
// 16), its 2nd partial G4 392.00 Hz, 3rd D5 588.00 Hz and 5th B5 980.00 Hz (from the ratios).
func TestVoiceNoteSurfacingOnAHeldNotesPartial(t *testing.T) {
	g3, g4, d5, b5 := 196.0, 392.0, 588.0, 980.0
	for _, tc := range []struct {
		name   string
		voices []steadyVoice
		want   string
	}{
		{"quiet 3rd partial surfacing", []steadyVoice{{g3, 0.1, 0, 2.5}, {d5, 0.02, 1, 2.5}}, "G3"},
		{"quiet 5th partial surfacing for a while", []steadyVoice{{g3, 0.1, 0, 2.5}, {b5, 0.02, 1, 1.8}}, "G3"},
		{"quiet twelfth struck with it", []steadyVoice{{g3, 0.1, 0, 2.5}, {d5, 0.02, 0, 2.5}}, "G3 D5"},
		{"quiet twelfth outlasting it", []steadyVoice{{g3, 0.1, 0, 1.5}, {d5, 0.02, 1, 2.5}}, "G3 D5"},
		{"louder twelfth entering", []steadyVoice{{g3, 0.02, 0, 2.5}, {d5, 0.1, 1, 2.5}}, "G3 D5"},
		// An octave surfaces at any level: a horn's 2nd partial stands as
		// loud as its fundamental or louder (FluidR3's, measured in
		// voices_unseen2_test.go's brass quartet), and a real octave
		// doubling is reported once anyway (the contract).
		{"louder octave surfacing", []steadyVoice{{g3, 0.05, 0, 2.5}, {g4, 0.1, 1, 2.5}}, "G3"},
		{"louder octave outlasting it", []steadyVoice{{g3, 0.05, 0, 1.5}, {g4, 0.1, 1, 2.5}}, "G3 G4"},
	} {
		if got := trackedNotes(tc.voices); got != tc.want {
			t.Errorf("%s: heard %q, want %q", tc.name, got, tc.want)
		}
	}
}
