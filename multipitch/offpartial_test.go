package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// brass is a low brass voice: its fundamental far under partials 2 to 5,
// which carry most of its power (Fletcher & Rossing, "The Physics of
// Musical Instruments", from memory; testsignal.WeakFund's shape).
var brass = testsignal.WeakFund

// flute is a flute in its middle register: a strong fundamental, the 2nd
// partial 8 dB under it and the 3rd 20 dB (Fletcher & Rossing, from
// memory): nearly all its power in partials 1 and 2.
var flute = testsignal.Spectrum{Name: "flute", Amps: []float64{1, 0.4, 0.1, 0.03}}

// A flute a few cents over a low brass voice's 5th or 6th partial is a voice
// of its own, read to the cent: E5 21 ¢ over a C3's 5th partial and B5 14 ¢
// over an E3's 6th (C3 130.81 and E3 164.81 Hz, equal temperament at A4 =
// 440 Hz, ISO 16; the 5th partial lies 13.7 ¢ under the equal-tempered
// major third two octaves up and the 6th 2.0 ¢ over the fifth, common
// practice, so the flutes stand 7.3 and 16.0 ¢ sharp of equal
// temperament), at 40 dB SNR, the flute with a vibrato of ±5 ¢ at 5 Hz
// (common practice). Truth is exact: the vibrato's centre. The flute's
// fundamental and 2nd partial, nearly all its power, lie within a
// sub-window's main lobe of the brass voice's partials but apart in the
// long window's, which reads it (timeavg.go): its frames average within
// 0.3 ¢ of the truth (the sub-windows' mean read B5 +0.49 ¢).
func TestFluteOffALowerVoicesPartial(t *testing.T) {
	for _, tc := range []struct {
		name  string
		lo, s float64
		off   float64 // ¢ over partial s of lo
	}{
		{"E5 over C3's 5th", 130.81, 5, 21},
		{"B5 over E3's 6th", 164.81, 6, 14},
	} {
		up := tc.s * tc.lo * math.Exp2(tc.off/1200)
		x := chord(3, 40, 11, steady(brass, tc.lo), part{flute, testsignal.Vibrato(up, 10, 5), up})
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		sum, n := 0.0, 0
		e.Feed(testsignal.Float32(x), func(f Frame) {
			if f.Time < 0.5 || f.Time > 2.5 {
				return
			}
			for _, v := range f.Voices {
				if c := testsignal.Cents(v.Hz, up); math.Abs(c) < 50 {
					sum += c
					n++
				}
			}
		})
		if n < 15 {
			t.Fatalf("%s: read in %d frames", tc.name, n)
		}
		t.Logf("%s: %d frames read, mean %+.3f ¢ from the truth", tc.name, n, sum/float64(n))
		if c := sum / float64(n); math.Abs(c) > 0.3 {
			t.Errorf("%s: frames read %+.3f ¢ from the truth on average, want within 0.3 ¢", tc.name, c)
		}
	}
}
