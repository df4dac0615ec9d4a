package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A voice 15 or 21 ¢ from a lower voice's partial s (the detunings of a
// trumpet's C5 under a trombone's F3's 3rd partial and a flute's E5 over a
// trombone's C3's 5th, measured on voices_untuned_test.go's renders) makes
// peaks of its own beside the lower voice's partials a few partials up,
// where k times the detuning parts the lobes; the lower voice's own
// partials, asked about at a reading 12 ¢ off them (as the joint fit reads
// a partial taken for a voice: 9 to 14 ¢ off, measured), make none. Each
// case is one 40 dB SNR window; the voice above is an odd-only spectrum
// (a clarinet's, common practice), the lower one the formant sawtooth.
func TestVoiceBesidePartialsHasPeaksOfItsOwn(t *testing.T) {
	for _, s := range partialSteps {
		for _, off := range []float64{-21, -15, 15, 21} {
			up := s * c3 * math.Exp2(off/1200)
			e, _ := New(rate, 0, 0, Config{})
			e.Analyze(chord(float64(e.Window())/rate, 40, 5, steady(formant, c3), steady(testsignal.OddOnly, up)), nil)
			if n := e.ownPeaks(up, c3, s, []Voice{{Hz: c3}, {Hz: up}}); n < ownPeakMin {
				t.Errorf("a voice %+g ¢ from C3's partial %g: %d partials of its own, want %d or more", off, s, n, ownPeakMin)
			}
		}
		for _, off := range []float64{-12, 12} {
			up := s * c3 * math.Exp2(off/1200)
			e, _ := New(rate, 0, 0, Config{})
			e.Analyze(chord(float64(e.Window())/rate, 40, 5, steady(formant, c3)), nil)
			if n := e.ownPeaks(up, c3, s, []Voice{{Hz: c3}, {Hz: up}}); n >= ownPeakMin {
				t.Errorf("a lone C3 asked %+g ¢ from its partial %g: %d peaks of a voice's own, want under %d", off, s, n, ownPeakMin)
			}
		}
	}
}
