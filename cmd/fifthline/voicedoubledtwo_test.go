package main

import "testing"

// A voice two octaves above a lower one is that voice's doubling, as an
// octave's is (docs/interface.md, "Additions of this repository": doubled
// is true where another voice sounds an octave above; multipitch/doubled.go).
// The take: sox's sawtooths (sox synth, tones of known pitch) on G2 98 Hz,
// D3 147 Hz and B3 245 Hz held 2 s, with G4 392 Hz, two octaves over G2,
// with G3 196 Hz, one octave over it, or with neither. analyze --voices
// auto reads G2, D3 and B3 (B3 is 245 Hz, 13.67 ¢ under equal temperament's
// B3 from A4 = 440 Hz, ISO 16), G2 marked doubled with G4 or G3 and not
// without, on its note rows and on its G major chord rows (--chords); G4
// and G3 are never reported as voices.
func TestAnalyzeVoicesMarksADoublingTwoOctavesUp(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, upper, doubled string
	}{
		{"G4", " sawtooth 392", "true"},
		{"G3", " sawtooth 196", "true"},
		{"neither", "", "false"},
	} {
		path, out := soxVoices(t, "synth 2 sawtooth 98 sawtooth 147 sawtooth 245"+tc.upper+" remix - gain -8")
		want := []string{"G2 " + tc.doubled, "D3 false", "B3 false"}
		_, rows := readCSV(t, out)
		if got := noteMarks(rows); !equalStrings(got, want) {
			t.Errorf("%s: notes %v, want %v:\n%s", tc.name, got, want, out)
		}
		code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--chords", path)
		if code != 0 {
			t.Fatalf("%s --chords: exit %d: %s", tc.name, code, stderr)
		}
		_, rows = readCSV(t, out)
		if got := noteMarks(rows); !equalStrings(got, want) || rows[0]["chord"] != "G major" {
			t.Errorf("%s --chords: %v, want G major with %v:\n%s", tc.name, got, want, out)
		}
	}
}
