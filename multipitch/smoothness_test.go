package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A voice lying on a lower voice's partial s (3 to 6) is a voice where the
// lower voice's partials sk (k odd) stand out of their neighbours, and
// that voice's own partials where they do not: the spectral-smoothness
// principle (Klapuri, IEEE TSAP 11(6), 2003). Each case is one 40 dB SNR
// window read as it sounds, then asked about C3 and a voice on its partial
// s: G4 a just twelfth above (3/1), C5 (4/1), E5 (5/1), G5 (6/1), from the
// ratios.
func TestVoiceOnPartialsJudgedOnTheEnvelope(t *testing.T) {
	formant := testsignal.Saw
	formant.Name, formant.Amps = "saw, 3rd partial 18 dB over its 1st", append([]float64(nil), formant.Amps...)
	formant.Amps[2] = 8 // 1/3 raised to 8: 18 dB over the fundamental's 1, as the rendered bassoon's (measured)
	for _, s := range partialSteps {
		up := s * c3
		for _, tc := range []struct {
			name    string
			parts   []part
			partial bool // the voice above is C3's partials
		}{
			// A lone voice, smooth or with a formant: nothing above it.
			{"lone sawtooth C3", []part{steady(testsignal.Saw, c3)}, true},
			{"lone " + formant.Name + " C3", []part{steady(formant, c3)}, true},
			// Sawtooths (sox's): every partial of the voice above is one
			// of C3's, adding 10·log10(1+s²) dB there (partialGain).
			{"sawtooth over sawtooth C3", []part{steady(testsignal.Saw, c3), steady(testsignal.Saw, up)}, false},
			{"sawtooth over sawtooth C3 and E4", []part{steady(testsignal.Saw, c3), steady(testsignal.Saw, c3*5/2), steady(testsignal.Saw, up)}, false},
			// A clarinet-like voice (odd partials) over the formant.
			{"odd-only over formant C3", []part{steady(formant, c3), steady(testsignal.OddOnly, up)}, false},
		} {
			e, _ := New(rate, 0, 0, Config{})
			e.Analyze(chord(float64(e.Window())/rate, 40, 11, tc.parts...), nil)
			vs := []Voice{{Hz: c3}, {Hz: up}}
			e.markPartials(vs)
			if vs[1].OnPartials != tc.partial || vs[0].OnPartials {
				t.Errorf("%s, partial %g: marked on C3's partials %v, want %v (C3 marked %v)", tc.name, s, vs[1].OnPartials, tc.partial, vs[0].OnPartials)
			}
			t.Logf("%s, partial %g: C3's partials %gk stand %.1f dB out of their envelope", tc.name, s, s, 10*math.Log10(e.partialsExcess(c3, s, vs)))
		}
	}
}
