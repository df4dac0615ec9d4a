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

// FluidR3's trombones (General MIDI program 58, 0-based 57: common
// practice) on G2 D3 B3 in equal temperament (MIDI keys 43, 50, 59; ISO
// 16), held 2.5 s, with white noise 40 dB under; with a fourth trombone on
// G4 (key 67), two octaves over G2, G2 is marked doubled in at least three
// frames in four of the held chord (its attack over) and G4 is never read as
// a voice; without it G2 is never marked. No other voice is marked either
// way. (Measured once: marked in 17 of 17 frames.)
func TestATromboneTwoOctavesUpIsMarked(t *testing.T) {
	keys := []int{43, 50, 59, 67}
	for _, double := range []bool{true, false} {
		var parts []testsignal.MIDIPart
		for _, k := range keys[:3] {
			parts = append(parts, testsignal.MIDIPart{Program: 57, Notes: []testsignal.TimedNote{{Key: k, Seconds: 2.5}}})
		}
		if double {
			parts = append(parts, testsignal.MIDIPart{Program: 57, Notes: []testsignal.TimedNote{{Key: keys[3], Seconds: 2.5}}})
		}
		x := fluidRaw(t, parts...)
		testsignal.AddNoise(x, testsignal.White(newRand(1), len(x)), 40)
		s := hear(t, x, Config{}, 0.4, 2.4, keyHz(keys[0]), keyHz(keys[1]), keyHz(keys[2]), keyHz(keys[3]))
		t.Logf("G4 %v: G2 marked doubled in %d of %d frames, G4 read in %d", double, s.doubled[0], s.frames, len(s.perVoice[3]))
		if s.frames < 4 || double && 4*s.doubled[0] < 3*s.frames || !double && s.doubled[0] > 0 || len(s.perVoice[3]) > 0 {
			t.Errorf("G4 %v: G2 marked doubled in %d of %d frames, G4 read in %d", double, s.doubled[0], s.frames, len(s.perVoice[3]))
		}
		if s.doubled[1] > 0 || s.doubled[2] > 0 {
			t.Errorf("G4 %v: D3 or B3 marked doubled %v", double, s.doubled[1:3])
		}
	}
}
