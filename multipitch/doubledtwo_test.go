package multipitch

import (
	"strconv"
	"testing"

	"fifthline/internal/testsignal"
)

// A voice two octaves above a lower one lays its partials on the lower
// one's 4th, 8th, 12th, … alone and cannot be told from it, any more than
// an octave's can: the lower voice is marked doubled and no voice is
// invented. The take: sox's sawtooths (sox synth, tones of known pitch) on
// G2 98 Hz, D3 147 Hz and B3 245 Hz, summed to one channel with white
// noise 40 dB under; with G4 392 Hz over them (in phase, as sox starts
// every tone, and a quarter period late), with G3 196 Hz instead (the
// octave), or alone. G2 is marked in at least three frames in four with G4
// or G3 and in none without; D3 and B3 are never marked, and no other
// voice is read. Measured once: G2's 4th, 8th and 16th partials stand
// +14 dB over its odd envelope with G4 in phase, its 2nd and 14th 0 dB.
func TestATwoOctaveDoublingIsMarked(t *testing.T) {
	chord := []float64{98, 147, 245}
	for _, tc := range []struct {
		name  string
		upper []string // sox synth arguments of the doubling voice, if any
		marks bool
	}{
		{"G4 in phase", []string{"sawtooth", "392"}, true},
		{"G4 a quarter period late", []string{"sawtooth", "392", "0", "25"}, true},
		{"G3", []string{"sawtooth", "196"}, true},
		{"no doubling", nil, false},
	} {
		args := []string{"synth", "2"}
		for _, hz := range chord {
			args = append(args, "sawtooth", strconv.FormatFloat(hz, 'f', -1, 64))
		}
		args = append(append(args, tc.upper...), "remix", "-", "gain", "-8")
		x := soxRaw(t, "-n", args...)
		testsignal.AddNoise(x, testsignal.White(newRand(14), len(x)), 40)
		s := hear(t, x, Config{}, 0.1, 1.9, chord...)
		s.meets(t, tc.name, 2)
		if marked := s.doubled[0]; tc.marks && 4*marked < 3*s.frames || !tc.marks && marked > 0 {
			t.Errorf("%s: G2 marked doubled in %d of %d frames", tc.name, marked, s.frames)
		}
		if s.doubled[1] > 0 || s.doubled[2] > 0 || s.phantoms > 0 {
			t.Errorf("%s: D3, B3 marked doubled %v, %d voices invented", tc.name, s.doubled[1:], s.phantoms)
		}
	}
}
