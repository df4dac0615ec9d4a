package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A section spread wider than a window's main lobe at its strong partials
// is still one voice: every frame reads one voice within 60 ¢ of the
// singers' mean pitch, never two (unison.go). Three singers (chorus, as in
// TestChorusReadOverEachHop: sawtooth voices, each with its own vibrato of
// 20 ¢ peak to peak at 4.8 to 5.9 Hz) at -w, 0 and +w ¢, six takes from E3
// up (ISO 16, A4 = 440 Hz), 40 dB SNR. Exact truth: the singers' mean pitch
// in cents over each frame's hop (the pitch a listener assigns a unison:
// common practice, from memory), every voice read on the note counted.
// Measured before unison.go: ±15 ¢, 17 of 138 frames two voices, 9.9 ¢
// RMS from the truth; ±20 ¢, 89 frames, 22.0 ¢. After: none; 4.1 and
// 6.2 ¢ RMS, held to 5 and 7.
func TestASectionIsOneVoice(t *testing.T) {
	for _, tc := range []struct {
		spread, rmsCents float64
	}{{15, 5}, {20, 7}} {
		twins, frames := 0, 0
		var sq float64
		for take := range 6 {
			hz := et(-17) * math.Exp2(float64(take)*1.37/12)
			x, centre := chorus(hz, 3, []float64{-tc.spread, 0, tc.spread}, take)
			testsignal.AddNoise(x, testsignal.White(newRand(uint64(take+3)), len(x)), 40)
			e, err := New(rate, 0, 0, Config{})
			if err != nil {
				t.Fatal(err)
			}
			hop := float64(e.Hop()) / rate
			e.Feed(testsignal.Float32(x), func(f Frame) {
				if f.Time < 0.4 || f.Time > 2.6 {
					return
				}
				frames++
				near := 0
				for _, v := range f.Voices {
					if c := testsignal.Cents(v.Hz, hz); math.Abs(c) < 60 {
						near++
						d := c - centre(f.Time-hop/2, f.Time+hop/2)
						sq += d * d
					}
				}
				if near > 1 {
					twins++
				}
			})
		}
		rms := math.Sqrt(sq / float64(frames))
		t.Logf("±%g ¢: %d frames, %d with two voices on the note, %.2f ¢ RMS from the truth", tc.spread, frames, twins, rms)
		if twins > 0 || rms > tc.rmsCents {
			t.Errorf("±%g ¢: %d of %d frames read two voices on the note, %.2f ¢ RMS; want none, at most %g ¢", tc.spread, twins, frames, rms, tc.rmsCents)
		}
	}
}

// aah is a sung vowel's partial levels (dB, partial 1 first), measured on
// FluidR3's choir aahs (General MIDI program 52) at F3 here: its 3rd and
// 4th partials strongest, the fundamental 10 dB under them.
var aah = []float64{28, 30, 38, 36, 31, 27, 13, 3, 2, 1, 2, 7, 6, 5, 4, 3}

// unison renders three steady copies of the aah voice at -8, 0 and +8 ¢
// from hz, each with its own partials' phases, peak 0.2 each: the truth is
// hz, their mean pitch in cents (common practice, from memory).
func unison(hz, seconds float64, seed int) []float64 {
	n := int(seconds * rate)
	x := make([]float64, n)
	for i, off := range []float64{-8, 0, 8} {
		sp := testsignal.Spectrum{Amps: make([]float64, len(aah)), Phases: make([]float64, len(aah))}
		for k, db := range aah {
			sp.Amps[k] = math.Pow(10, db/20)
			sp.Phases[k] = 2.3 * float64((k+1)*(i+seed+2))
		}
		for j, v := range testsignal.Tone(rate, n, sp, 0.2, testsignal.Steady(hz*math.Exp2(off/1200))) {
			x[j] += v
		}
	}
	return x
}

// Three copies of one harmonic voice detuned ±8 ¢ beat at each partial
// (partial k's copies k·8 ¢ apart), and a window's reading of a partial
// follows where the beating puts its weight: the frames scatter though no
// copy moves. Each note's frames average to the copies' mean pitch within
// what that beating leaves over 2.2 s. E3 to C4 (ISO 16), 40 dB SNR.
// Measured: one voice in every frame; the notes' means +3.4, +1.9, -0.3,
// -0.2 and -1.6 ¢ from the truth, the frames 4.8 ¢ from their notes' means
// (standard deviation), before and after unison.go. Held to one voice on
// the note in every frame, each mean within 4 ¢, the frames within 6 ¢.
func TestThreeDetunedCopiesReadAtTheirMean(t *testing.T) {
	var dev []float64
	for i, key := range []float64{-17, -16, -14, -12, -9} { // E3 F3 G3 A3 C4
		hz := et(key)
		x := unison(hz, 3, i)
		testsignal.AddNoise(x, testsignal.White(newRand(uint64(i+11)), len(x)), 40)
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		var cs []float64
		e.Feed(testsignal.Float32(x), func(f Frame) {
			if f.Time < 0.4 || f.Time > 2.6 {
				return
			}
			near := 0
			for _, v := range f.Voices {
				if c := testsignal.Cents(v.Hz, hz); math.Abs(c) < 60 {
					near++
					cs = append(cs, c)
				}
			}
			if near != 1 {
				t.Errorf("%.2f Hz at %.2f s: %d voices on the note; want 1", hz, f.Time, near)
			}
		})
		mean := 0.0
		for _, c := range cs {
			mean += c / float64(len(cs))
		}
		for _, c := range cs {
			dev = append(dev, c-mean)
		}
		t.Logf("%.2f Hz: %d frames, their mean %+.2f ¢ from the truth", hz, len(cs), mean)
		if math.Abs(mean) > 4 {
			t.Errorf("%.2f Hz: frames' mean %+.2f ¢ from the copies' mean pitch; want within 4", hz, mean)
		}
	}
	sd := math.Sqrt(sumSquares(dev) / float64(len(dev)-1))
	t.Logf("frames %.2f ¢ from their notes' means (standard deviation)", sd)
	if sd > 6 {
		t.Errorf("frames %.2f ¢ from their notes' means; want at most 6", sd)
	}
}

func sumSquares(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v * v
	}
	return s
}
