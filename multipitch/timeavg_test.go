package multipitch

import (
	"math"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

// A voice loudest at the low end of its vibrato (a bowed string whose
// fundamental swells as the pitch dips) is read at the vibrato's time
// average, its centre by construction, not at the loudness-weighted pitch
// a long window's one fit gives. D5 (587.33 Hz, equal temperament at
// A4 = 440 Hz, ISO 16), ±15 ¢ at 5.5 Hz: a violinist's vibrato (common
// practice), its level swinging ±60 % in step with the pitch's dip.
func TestVibratoReadAtItsTimeAverage(t *testing.T) {
	const d5, width, vibHz = 587.33, 30.0, 5.5 // width peak to peak
	x := chord(4, 0, 1, part{testsignal.Saw, testsignal.Vibrato(d5, width, vibHz), d5})
	for i := range x {
		x[i] *= 1 - 0.6*math.Sin(2*math.Pi*vibHz*float64(i)/rate)
	}
	mean := func(avg bool) float64 {
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		if !avg {
			e.avg = nil
		}
		sum, n := 0.0, 0
		e.Feed(testsignal.Float32(x), func(f Frame) {
			if f.Time < 0.5 || f.Time > 3.5 || len(f.Voices) != 1 {
				return
			}
			sum += testsignal.Cents(f.Voices[0].Hz, d5)
			n++
		})
		if n < 20 {
			t.Fatalf("%d frames with one voice", n)
		}
		return sum / float64(n)
	}
	long, got := mean(false), mean(true)
	t.Logf("mean over frames: %+.3f ¢ (long window alone %+.3f ¢)", got, long)
	if math.Abs(got) > 1 || math.Abs(got) > math.Abs(long)/2 {
		t.Errorf("read %+.3f ¢ from the vibrato's centre; want within 1 ¢ and half the long window's %+.3f ¢", got, long)
	}
}

// A voice each of whose partials lies within a short window's main lobe
// of a lower voice's partial, both with vibrato: a violin's D5 over a
// cello's G2 (98.00 Hz, equal temperament at A4 = 440 Hz, ISO 16), the
// violin 2.3 Hz above the cello's 6th harmonic as in the rendered string
// quartet (voices_mix_test.go, its truths 590.50 and 98.03 Hz), so that its
// k-th partial lies k·2.3 Hz from the cello's 6k-th, a fifth of a
// 4096-sample sub-window's bin per partial. Each bows its own vibrato,
// ±13 ¢ at 5.5 and 4.9 Hz (common practice for strings), the violin
// loudest at the low end of its cycle. Truth is exact: the vibratos'
// centres. Alone, the violin's frames average to its centre within 1 ¢
// (0.90 ¢ measured). Over the cello the long window alone reads it 5.95 ¢
// flat by loudness, and so did the sub-windows while no partial of it
// could steer them (6.04 ¢); read by the partials it owns, it is held to
// what it reaches, within 2.5 ¢ (2.20 ¢ measured: the cello's own vibrato
// within each sub-window still pulls it), and the cello within 0.5 ¢.
func TestVibratoReadOverALowerVoicesPartials(t *testing.T) {
	g2 := et(-26)
	d5 := 6*g2 + 2.3
	n := int(4 * rate)
	violin := testsignal.Tone(rate, n, testsignal.Saw, 0.2, testsignal.Vibrato(d5, 26, 5.5))
	for i := range violin {
		violin[i] *= 1 - 0.6*math.Sin(2*math.Pi*5.5*float64(i)/rate)
	}
	// mean is each true voice's mean error over the frames that hear all
	// of them (one voice each, within 50 ¢), with or without the time
	// average.
	mean := func(x []float64, avg bool, truth ...float64) []float64 {
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		if !avg {
			e.avg = nil
		}
		sum, frames := make([]float64, len(truth)), 0
		e.Feed(testsignal.Float32(x), func(f Frame) {
			if f.Time < 0.5 || f.Time > 3.5 {
				return
			}
			got := make([]float64, len(truth))
			heard := 0
			for i, hz := range truth {
				for _, v := range f.Voices {
					if c := testsignal.Cents(v.Hz, hz); math.Abs(c) < 50 {
						got[i] = c
						heard++
						break
					}
				}
			}
			if heard == len(truth) {
				frames++
				for i := range sum {
					sum[i] += got[i]
				}
			}
		})
		if frames < 20 {
			t.Fatalf("%d frames hear all %d voices", frames, len(truth))
		}
		for i := range sum {
			sum[i] /= float64(frames)
		}
		return sum
	}
	alone := slices.Clone(violin)
	testsignal.AddNoise(alone, testsignal.White(newRand(3), n), 40)
	duo := chord(4, 0, 1, part{testsignal.Saw, testsignal.Vibrato(g2, 26, 4.9), g2})
	for i := range duo {
		duo[i] += violin[i]
	}
	testsignal.AddNoise(duo, testsignal.White(newRand(3), n), 40)

	lone := mean(alone, true, d5)[0]
	long := mean(duo, false, g2, d5)[1]
	got := mean(duo, true, g2, d5)
	t.Logf("violin D5: alone %+.3f ¢; over the cello %+.3f ¢ (long window alone %+.3f ¢); cello G2 %+.3f ¢", lone, got[1], long, got[0])
	if math.Abs(lone) > 1 {
		t.Errorf("violin alone read %+.3f ¢ from its centre; want within 1 ¢", lone)
	}
	if math.Abs(got[1]) > 2.5 || math.Abs(got[0]) > 0.5 {
		t.Errorf("over the cello: violin %+.3f ¢, cello %+.3f ¢ from their centres; want within 2.5 and 0.5 ¢", got[1], got[0])
	}
}
