package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// vibratoFrames runs a fresh estimator over x and returns, for each true
// voice, the mean of its frames' readings in cents (the voice within 50 ¢
// of it) over the frames centred from..to, and how many frames heard more
// than one voice within 50 ¢ of it.
func vibratoFrames(t *testing.T, x []float64, from, to float64, truth ...float64) (mean []float64, twins int) {
	t.Helper()
	e, err := New(rate, 0, 0, Config{})
	if err != nil {
		t.Fatal(err)
	}
	mean = make([]float64, len(truth))
	count := make([]int, len(truth))
	e.Feed(testsignal.Float32(x), func(f Frame) {
		if f.Time < from || f.Time > to {
			return
		}
		for i, hz := range truth {
			near := 0
			for _, v := range f.Voices {
				if c := testsignal.Cents(v.Hz, hz); math.Abs(c) < 50 {
					if near++; near == 1 {
						mean[i] += c
						count[i]++
					}
				}
			}
			if near > 1 {
				twins++
			}
		}
	})
	for i := range mean {
		if count[i] < 20 {
			t.Fatalf("voice %d heard in %d frames", i, count[i])
		}
		mean[i] /= float64(count[i])
	}
	return mean, twins
}

// A wide vibrato is one voice. C5 and D5 (523.25 and 587.33 Hz, equal
// temperament at A4 = 440 Hz, ISO 16), a saw's partials, ±30 ¢ at 5.5 Hz
// (a wide sung or bowed vibrato, common practice): the long window put a
// voice at each end of the swing in every frame, the lower 15 ¢ flat
// (measured), where its sub-windows hear one. Truth is exact: the
// vibrato's centre. Every frame hears one voice there, its frames' mean
// within 0.5 ¢ of the centre (measured +0.09 and −0.28 ¢).
func TestAWideVibratoIsOneVoice(t *testing.T) {
	for _, hz := range []float64{et(3), et(5)} {
		x := chord(4, 40, 1, part{testsignal.Saw, testsignal.Vibrato(hz, 60, 5.5), hz})
		mean, twins := vibratoFrames(t, x, 0.5, 3.5, hz)
		t.Logf("%.2f Hz ±30 ¢: frames' mean %+.3f ¢, %d frames with two voices", hz, mean[0], twins)
		if twins > 0 || math.Abs(mean[0]) > 0.5 {
			t.Errorf("%.2f Hz ±30 ¢: %d frames with two voices, frames' mean %+.3f ¢; want none, within 0.5 ¢", hz, twins, mean[0])
		}
	}
}

// The string quartet's D minor seventh (D3 A3 F4 C5 at the rendered
// quartet's truths, voices_mix_test.go) as additive voices, each with a
// bowed vibrato of ±13 ¢ at its own rate (4.5 to 5.3 Hz, common practice
// for strings), 35 dB SNR: the centres are the truth by construction. Each
// voice's frames average within 0.3 ¢ of its centre (measured −0.26 to
// +0.18 ¢), one voice each. What the rendered quartet reads further off
// (1 to 2 ¢) is the samples' own: their partials' time-averaged
// frequencies disagree by cents (voices_mix_test.go says how much).
func TestAQuartetWithVibratoReadAtItsCentres(t *testing.T) {
	truth := []float64{146.953, 220.593, 348.217, 526.017}
	rates := []float64{5.2, 4.5, 5.3, 5.0}
	var parts []part
	for i, hz := range truth {
		parts = append(parts, part{testsignal.Saw, testsignal.Vibrato(hz, 26, rates[i]), hz})
	}
	mean, twins := vibratoFrames(t, chord(3, 35, 1, parts...), 0.5, 2.5, truth...)
	t.Logf("frames' means %+.3f ¢, %d frames with two voices near one", mean, twins)
	for i, c := range mean {
		if math.Abs(c) > 0.3 {
			t.Errorf("%.3f Hz: frames' mean %+.3f ¢ from its centre; want within 0.3", truth[i], c)
		}
	}
	if twins > 0 {
		t.Errorf("%d frames heard two voices near one", twins)
	}
}
