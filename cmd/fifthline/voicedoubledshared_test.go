package main

import (
	"fmt"
	"strings"
	"testing"
)

// Equal temperament from A4 = 440 Hz (ISO 16): G3, D4, G4 (B3 beside E3).
const g3Hz, d4Hz, g4Hz = 195.9977, 293.6648, 391.9954

// soxWaves is a 44.1 kHz take of sox tones of one wave (sawtooth, square)
// held 2 s together at the given pitches, summed to one channel 8 dB under
// full scale, with pad seconds of silence after.
func soxWaves(t *testing.T, wave string, pad float64, hz ...float64) string {
	t.Helper()
	var synth, mix []string
	for i, f := range hz {
		synth = append(synth, fmt.Sprintf("%s %.4f", wave, f))
		mix = append(mix, fmt.Sprint(i+1))
	}
	return sox(t, "chord.wav", "-r", "44100", "-b", "16", fmt.Sprintf("synth 2 %s remix %s gain -8 pad 0 %g", strings.Join(synth, " "), strings.Join(mix, ","), pad))
}

// The take: sox sawtooths on G3 B♭3 D4 and G4, just above G3
// (ratios 1, 6/5, 3/2 and 2: common practice), every even partial of G3
// beside one of D4's or B♭3's. analyze --voices auto --chords reads G
// minor, three voices, G3 marked doubled on its row; without G4 nothing is
// marked. The same holds for square waves (odd partials only) in G major,
// equal-tempered (ISO 16).
func TestAnalyzeVoicesMarksARootDoubledUnderSharedNeighbours(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, wave, chord string
		hz                []float64
		notes             []string
	}{
		{"just G minor, sawtooths", "sawtooth", "G minor", []float64{g3Hz, g3Hz * 6 / 5, g3Hz * 3 / 2}, []string{"G3", "Bb3", "D4"}},
		{"tempered G major, squares", "square", "G major", []float64{g3Hz, b3Hz, d4Hz}, []string{"G3", "B3", "D4"}},
	} {
		for _, double := range []bool{true, false} {
			hz, name := tc.hz, tc.name
			if double {
				hz, name = append(hz[:3:3], 2*tc.hz[0]), name+" with G4"
			}
			code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--chords", soxWaves(t, tc.wave, 0.4, hz...))
			if code != 0 {
				t.Fatalf("%s: exit %d: %s", name, code, stderr)
			}
			_, rows := readCSV(t, out)
			want := []string{tc.notes[0] + fmt.Sprint(" ", double), tc.notes[1] + " false", tc.notes[2] + " false"}
			if got := noteMarks(rows); !equalStrings(got, want) || rows[0]["chord"] != tc.chord {
				t.Errorf("%s: %v, want %s with %v:\n%s", name, got, tc.chord, want, out)
			}
		}
	}
}

// Live, the same take played into a private virtual microphone (a
// PulseAudio null sink; nothing is heard) and read by listen --plain
// --voices auto: three notes, G3 marked doubled, no voice for G4.
func TestListenVoicesMarksARootDoubledUnderSharedNeighbours(t *testing.T) {
	t.Parallel()
	out := voicesHeardLive(t, soxWaves(t, "sawtooth", 1, g3Hz, g3Hz*6/5, g3Hz*3/2, g4Hz))
	_, rows := readCSV(t, out)
	if got, want := noteMarks(rows), []string{"G3 true", "Bb3 false", "D4 false"}; !equalStrings(got, want) {
		t.Errorf("notes %v, want %v:\n%s", got, want, out)
	}
}
