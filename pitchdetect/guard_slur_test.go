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

// A low voice whose fundamental is all but gone (a thin sample, a small
// loudspeaker) is still heard at its fundamental while its odd partials
// sound (the missing fundamental: common practice in psychoacoustics):
// partials 3, 5 and 7 are F's alone, where a slur's two notes that repeat
// together at F (2F and 3F) have nothing. FluidR3's choir aahs C3 was read
// an octave high for a third of its frames before (fifthbench's rendered
// clips). Tones equal-tempered at A4 = 440 Hz (ISO 16); fundamental −40 dB,
// odd partials 10 dB under the even ones.
func TestAWeakFundamentalWithOddPartialsIsNotAnOctaveUp(t *testing.T) {
	rate := 48000.0
	voice := testsignal.Spectrum{Name: "fundamental -40 dB, odd partials -10 dB",
		Amps: []float64{0.01, 1, 0.3, 0.8, 0.3, 0.5, 0.2, 0.3, 0.1, 0.1}}
	for _, hz := range []float64{97.99886, 130.81278, 174.61412} { // G2, C3, F3
		x := testsignal.Tone(rate, int(0.6*rate), voice, 0.3, testsignal.Steady(hz))
		for _, e := range run(t, rate, x) {
			if e.Voiced && math.Abs(testsignal.Cents(e.Hz, hz)) > 50 {
				t.Errorf("%.2f Hz: the frame at %.3f s reads %.2f Hz", hz, e.Time, e.Hz)
			}
		}
	}
}
