package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A slur's frames hold the end of one note and the start of the next, and
// together the two repeat at a period neither has: G4 and D5 (3:2) at G3,
// A4 and B4 (9:8 in equal temperament, near enough) at A1, E5 and G5 at C3.
// Across the slur no two frames running may read anything but one of the
// two notes (within 50 ¢): a single stray frame is no note to the
// Segmenter, but a run of them held by the tracking pick would be. The tones are equal-tempered (ISO 16,
// A4 = 440 Hz), odd-partial (a clarinet-like spectrum) and weak-fundamental
// (an oboe-like one), the first fading out over 40 ms as the second fades in.
func TestASlurIsNotReadAtItsNotesSharedPeriod(t *testing.T) {
	rate := 48000.0
	et := func(key int) float64 { return 440 * math.Exp2(float64(key-69)/12) }
	for _, s := range []testsignal.Spectrum{testsignal.OddOnly, testsignal.WeakFund} {
		for _, pair := range [][2]int{{67, 74}, {69, 71}, {76, 79}, {70, 72}} {
			a, b := et(pair[0]), et(pair[1])
			n, fade := int(0.4*rate), int(0.04*rate)
			x := testsignal.Tone(rate, 2*n, s, 0.3, testsignal.Steady(a))
			y := testsignal.Tone(rate, 2*n, s, 0.3, testsignal.Steady(b))
			for i := range x {
				g := math.Min(math.Max(float64(i-n)/float64(fade), 0), 1)
				x[i] = x[i]*(1-g) + y[i]*g
			}
			stray := 0
			for _, e := range run(t, rate, x) {
				if !e.Voiced {
					continue
				}
				stray++
				if math.Abs(testsignal.Cents(e.Hz, a)) <= 50 || math.Abs(testsignal.Cents(e.Hz, b)) <= 50 {
					stray = 0
				}
				if stray > 1 {
					t.Errorf("%s %.2f→%.2f Hz: frames to %.3f s read %.2f Hz", s.Name, a, b, e.Time, e.Hz)
				}
			}
		}
	}
}
