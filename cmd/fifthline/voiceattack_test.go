package main

import "testing"

// A short note an octave under a voice that begins while it sounds and
// holds on past its end is that voice's attack read an octave low, no
// voice; one lasting half a second or more, one struck with the voice
// above, or one begun under it, is a voice (the notes listed as they end). Frames at the estimator's
// default hop and window at 44.1 kHz (4096 and 16384 samples); A4 440.00
// Hz and A5 880.00 Hz (ISO 16), A2 110.00 Hz under them.
func TestVoiceAttackReadAnOctaveLow(t *testing.T) {
	a2, a4, a5 := 110.0, 440.0, 880.0
	for _, tc := range []struct {
		name   string
		voices []steadyVoice
		want   string
	}{
		{"attack read an octave low", []steadyVoice{{a2, 0.05, 0, 2.5}, {a4, 0.05, 0, 0.45}, {a5, 0.05, 0.25, 2.5}}, "A2 A5"},
		{"octave below held a while", []steadyVoice{{a2, 0.05, 0, 2.5}, {a4, 0.05, 0, 1.2}, {a5, 0.05, 0.25, 2.5}}, "A4 A2 A5"},
		{"octave below struck with it", []steadyVoice{{a2, 0.05, 0, 2.5}, {a4, 0.05, 0, 0.45}, {a5, 0.05, 0, 2.5}}, "A4 A2 A5"},
		{"octave above sounding before it", []steadyVoice{{a5, 0.05, 0, 2.5}, {a4, 0.05, 0.25, 0.7}}, "A4 A5"},
	} {
		if got := trackedNotes(tc.voices); got != tc.want {
			t.Errorf("%s: heard %q, want %q", tc.name, got, tc.want)
		}
	}
}
