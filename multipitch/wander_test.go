package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A low voice with a slow, narrow vibrato (20 ¢ peak to peak at 3 to 4 Hz,
// a wind player's, common practice) under a steady one: within a third of
// a second its upper partials move by a bin or more, and what the plain
// harmonic model leaves of them must not pass for a voice above it. The
// issue's figures: no voice missed, phantoms ≤ 10 % of the voices
// reported, the steady voice within 2 ¢ in every frame, the moving one's
// mean within 3 ¢ of its centre.
func TestWanderingVoiceKeepsItsPartials(t *testing.T) {
	for _, rateHz := range []float64{3, 4} {
		low := part{testsignal.Saw, testsignal.Vibrato(130.81, 20, rateHz), 130.81}
		x := chord(4, 40, 5, low, steady(testsignal.OddOnly, 329.63))
		s := hear(t, x, Config{}, 0, 4, 130.81, 329.63)
		mean := 0.0
		for _, c := range s.perVoice[0] {
			mean += c / float64(len(s.perVoice[0]))
		}
		steadyWorst := 0.0
		for _, c := range s.perVoice[1] {
			steadyWorst = math.Max(steadyWorst, math.Abs(c))
		}
		t.Logf("vibrato %g Hz: %d frames, %d missed, %d phantoms, moving voice's mean %+.3f ¢, steady voice's worst %.3f ¢", rateHz, s.frames, s.missed, s.phantoms, mean, steadyWorst)
		if s.frames < 6 || s.missed > 0 || 10*s.phantoms > 2*s.frames || math.Abs(mean) > 3 || steadyWorst > 2 {
			t.Errorf("vibrato %g Hz: want no voice missed, phantoms ≤ 10 %%, the moving voice's mean within 3 ¢, the steady one within 2 ¢", rateHz)
		}
	}
}
