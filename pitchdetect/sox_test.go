package pitchdetect

import (
	"encoding/binary"
	"math"
	"os/exec"
	"strconv"
	"testing"
)

// soxSynth renders seconds of a sox synth waveform at hz as float samples.
// sox is a reference tool here: if it is missing the test fails (make test
// installs it), it does not skip.
func soxSynth(t *testing.T, rate float64, wave string, hz, seconds float64) []float32 {
	t.Helper()
	sox, err := exec.LookPath("sox")
	if err != nil {
		t.Fatalf("sox not installed (Debian package sox): %v", err)
	}
	out, err := exec.Command(sox, "-n", "-r", strconv.FormatFloat(rate, 'f', -1, 64),
		"-e", "floating-point", "-b", "32", "-c", "1", "-t", "raw", "-",
		"synth", strconv.FormatFloat(seconds, 'f', -1, 64), wave, strconv.FormatFloat(hz, 'f', -1, 64),
		"gain", "-6").Output()
	if err != nil {
		t.Fatalf("sox synth %s %g: %v", wave, hz, err)
	}
	x := make([]float32, len(out)/4)
	for i := range x {
		x[i] = math.Float32frombits(binary.LittleEndian.Uint32(out[4*i:]))
	}
	return x
}

// Tones from sox's synth effect at stated frequencies: an implementation
// outside this project. Its sine is exact; its triangle carries only odd
// partials (like a clarinet's low register) and aliases little.
func TestSoxSynthTones(t *testing.T) {
	for _, c := range []struct {
		wave   string
		rate   float64
		hz     float64
		median float64 // cents
	}{
		{"sine", 44100, 27.5, 0.02},     // A0
		{"sine", 44100, 440, 0.02},      // A4, ISO 16
		{"sine", 48000, 261.6256, 0.02}, // C4, equal temperament from A4 = 440 Hz
		{"sine", 96000, 4186.009, 0.02}, // C8
		{"sine", 48000, 1000, 0.02},
		{"triangle", 44100, 110, 0.05},
		{"triangle", 48000, 659.2551, 0.05}, // E5
		{"triangle", 96000, 55, 0.05},
	} {
		x := soxSynth(t, c.rate, c.wave, c.hz, 0.6)
		d, err := New(c.rate, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		m := measure(d.Feed(x, nil), c.hz)
		if m.voiced < m.frames*9/10 || m.gross > 0 || m.median > c.median {
			t.Errorf("sox %s %g Hz at %g Hz: %d/%d voiced, %d gross, median %.4f ¢, max %.4f ¢",
				c.wave, c.hz, c.rate, m.voiced, m.frames, m.gross, m.median, m.max)
		}
	}
}
