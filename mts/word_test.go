package mts

import (
	"math"
	"testing"
)

func cents(a, b float64) float64 { return 1200 * math.Log2(a/b) }

// The frequency word: semitone byte of equal temperament at A4 = 440 Hz, then
// 14 bits of fraction (MMA, MIDI Tuning Standard, "frequency data format").
func TestWordsNameTheStandardsFrequencies(t *testing.T) {
	for _, c := range []struct {
		b  [3]byte
		hz float64
	}{
		{[3]byte{0x00, 0x00, 0x00}, 8.1758},   // MTS: the lowest frequency, key 0
		{[3]byte{0x3C, 0x00, 0x00}, 261.6256}, // MTS: key 60, middle C in equal temperament
		{[3]byte{0x45, 0x00, 0x00}, 440},      // MTS: key 69 is A4 = 440 Hz (ISO 16)
		{[3]byte{0x44, 0x7F, 0x7F}, 439.9984}, // MTS: one step (0.0061 ¢) below 440 Hz
	} {
		w, ok := wordOf(c.b[:])
		if !ok {
			t.Fatalf("% X read as no change", c.b)
		}
		// The standard prints its frequencies to about one step.
		if got := w.Hz(); math.Abs(cents(got, c.hz)) > 100.0/Steps {
			t.Errorf("% X = %.4f Hz, the standard says %.4f", c.b, got, c.hz)
		}
		if back := FromHz(c.hz).Bytes(); back != c.b {
			t.Errorf("%.4f Hz → % X, want % X", c.hz, back, c.b)
		}
	}
	// MTS: the highest word is 7F 7F 7E, 7F 7F 7F being "no change"; the
	// standard prints its frequency as 13289.73 Hz, which rounds two steps
	// below key 128 (13289.75 Hz in equal temperament) to within 0.01 ¢.
	if MaxWord.Bytes() != [3]byte{0x7F, 0x7F, 0x7E} {
		t.Errorf("MaxWord = % X", MaxWord.Bytes())
	}
	if e := cents(MaxWord.Hz(), 13289.73); math.Abs(e) > 0.01 {
		t.Errorf("7F 7F 7E = %.4f Hz, %.4f ¢ from the standard's 13289.73 Hz", MaxWord.Hz(), e)
	}
}

// Words round to the nearest step: within half of 100/16384 ¢ everywhere in
// the range (MTS: resolution 0.0061 ¢).
func TestWordsRoundToHalfAStep(t *testing.T) {
	const halfStep = 100.0 / Steps / 2
	for hz := 8.2; hz < 13289; hz *= 1.0007 {
		w := FromHz(hz)
		if e := math.Abs(cents(w.Hz(), hz)); e > halfStep+1e-9 {
			t.Fatalf("%.4f Hz: word is %.5f ¢ off, more than half a step (%.5f ¢)", hz, e, halfStep)
		}
		for _, b := range w.Bytes() {
			if b >= 0x80 {
				t.Fatalf("%.4f Hz: byte 0x%02X is not a data byte", hz, b)
			}
		}
	}
}

// Beyond the range a frequency clamps to the nearest end; never to the
// reserved "no change" (MTS: 7F 7F 7F).
func TestWordsClampAtTheRangesEnds(t *testing.T) {
	for _, c := range []struct {
		hz      float64
		want    Word
		outside int
	}{
		{7.7, 0, -1}, {0, 0, -1}, {-3, 0, -1}, {math.NaN(), 0, -1},
		{8.1758, 0, 0}, {13289, FromHz(13289), 0},
		{13300, MaxWord, 1}, {20000, MaxWord, 1}, {math.Inf(1), MaxWord, 1},
	} {
		if got := FromHz(c.hz); got != c.want {
			t.Errorf("FromHz(%g) = % X, want % X", c.hz, got.Bytes(), c.want.Bytes())
		}
		if got := Outside(c.hz); got != c.outside {
			t.Errorf("Outside(%g) = %d, want %d", c.hz, got, c.outside)
		}
	}
}
