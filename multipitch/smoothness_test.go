package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// formant is a sawtooth whose 3rd partial stands 18 dB over its 1st (1/3
// raised to 8), as the rendered FluidR3 bassoon's does (measured).
var formant = testsignal.Spectrum{Name: "saw, 3rd partial 18 dB over its 1st", Amps: func() []float64 {
	a := append([]float64(nil), testsignal.Saw.Amps...)
	a[2] = 8
	return a
}()}

// A voice lying on a lower voice's partial s (3 to 6) is a voice where the
// lower voice's partials sk (k odd) stand out of their neighbours, and
// that voice's own partials where they do not: the spectral-smoothness
// principle (Klapuri, IEEE TSAP 11(6), 2003). Each case is one 40 dB SNR
// window read as it sounds, then asked about C3 and a voice on its partial
// s: G4 a just twelfth above (3/1), C5 (4/1), E5 (5/1), G5 (6/1), from the
// ratios.
func TestVoiceOnPartialsJudgedOnTheEnvelope(t *testing.T) {
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

// A voice with a formant on its 3rd partial and a vibrato of 15 ¢ at 4 Hz
// (about the rendered bassoon's, measured) under an odd-only E4 a just
// major tenth up (5/2, from the ratio): the estimator reads a G4 on its
// 3rd partial in nearly every frame (29 of 29 measured), and marks it
// there in most (20 of 29), so its note is no voice (voicetrack.go).
func TestFormantPartialWithVibratoMarked(t *testing.T) {
	x := chord(3, 40, 3, part{formant, testsignal.Vibrato(c3, 15, 4), c3}, steady(testsignal.OddOnly, c3*5/2))
	e, _ := New(rate, 0, 0, Config{})
	read, marked := 0, 0
	e.Feed(testsignal.Float32(x), func(f Frame) {
		for _, v := range f.Voices {
			if math.Abs(testsignal.Cents(v.Hz, 3*c3)) < 50 {
				read++
				if v.OnPartials {
					marked++
				}
			}
		}
	})
	t.Logf("G4 read in %d frames, marked in %d", read, marked)
	if 2*marked <= read {
		t.Errorf("G4 on the formant's 3rd partial marked in %d of the %d frames it was read in, want most", marked, read)
	}
}
