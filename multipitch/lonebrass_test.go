package multipitch

import (
	"testing"

	"fifthline/internal/testsignal"
)

// A lone bassoon, horn or trombone is not an octave double, though its
// even partials may stand well above its odd ones' envelope (a formant):
// FluidR3's (General MIDI programs 71 bassoon, 61 French horn and 58
// trombone, 0-based 70, 60 and 57: common practice) held 2 s on MIDI
// keys of their ranges, with white noise 40 dB under. No note is marked
// doubled: fewer than half its frames of the held tone (0.3 to 1.9 s).
// Measured, marked frames of 13 before oddsHold → after: trombone C3 and
// B♭3 13 → 0, bassoon F3 12 → 9 and B♭3 7 → 6 (just under half), the
// others at most 3 → 2. Its odd partials sink under the even envelope as a
// double's do (evenprofile_test.go); after oneInstrument (lock.go: its even
// partials keep their phases to its odd ones, as no second player's do)
// bassoon F3 9 → 4, B♭3 6 → 1, C3 1 → 1, French horn D3 2 → 1.
func TestALoneBassoonHornOrTromboneIsNotDoubled(t *testing.T) {
	for _, tc := range []struct {
		name    string
		program int
		keys    []int
	}{
		{"bassoon", 70, []int{43, 48, 53, 58}},
		{"French horn", 60, []int{50, 57, 62}},
		{"trombone", 57, []int{43, 48, 53, 58}},
	} {
		for _, key := range tc.keys {
			x := fluidRaw(t, testsignal.MIDIPart{Program: tc.program, Notes: []testsignal.TimedNote{{Key: key, Seconds: 2}}})
			testsignal.AddNoise(x, testsignal.White(newRand(uint64(key)), len(x)), 40)
			s := hear(t, x, Config{}, 0.3, 1.9, keyHz(key))
			t.Logf("FluidR3 %s, key %d: marked doubled in %d of %d frames", tc.name, key, s.doubled[0], s.frames)
			if s.frames < 4 || 2*s.doubled[0] >= s.frames {
				t.Errorf("FluidR3 %s, key %d: marked doubled in %d of %d frames", tc.name, key, s.doubled[0], s.frames)
			}
		}
	}
}
