package pitchdetect

import (
	"math"
	"os"
	"strings"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
)

// fluid-soundfont-gm (Debian) installs the FluidR3 General MIDI font here.
const fluidR3 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"

// loopTone is a sample's loop repeated: exactly periodic, with fundamental
// k·R/L (sf2.Sample.LoopTruth), the truth for a real timbre.
type loopTone struct {
	Instrument, Sample string
	Rate, Hz           float64
	LoopSeconds        float64
	Cycles             int
	X                  []float64
}

// fluidLoops returns up to perInstrument loops for each named instrument.
func fluidLoops(t testing.TB, names []string, perInstrument int, seconds float64) []loopTone {
	t.Helper()
	fh, err := os.Open(fluidR3)
	if err != nil {
		t.Fatalf("FluidR3 SoundFont missing (Debian package fluid-soundfont-gm): %v", err)
	}
	defer fh.Close()
	st, err := fh.Stat()
	if err != nil {
		t.Fatal(err)
	}
	font, err := sf2.Open(fh, st.Size())
	if err != nil {
		t.Fatal(err)
	}
	var out []loopTone
	for _, in := range font.Instruments {
		want := false
		for _, n := range names {
			want = want || strings.EqualFold(in.Name, n)
		}
		if !want {
			continue
		}
		seen := map[int]bool{}
		for _, z := range in.Zones {
			s := font.Samples[z.Sample]
			_, k, ok := s.LoopTruth(font.NominalHz(z))
			// Long loops (a second or more) are slow to check and wander.
			if !ok || seen[z.Sample] || strings.HasSuffix(s.Name, "(R)") || len(seen) == perInstrument ||
				s.LoopEnd-s.LoopStart > 16384 {
				continue
			}
			loop, err := font.Frames(s.LoopStart, s.LoopEnd)
			if err != nil {
				t.Fatal(err)
			}
			if !loopHoldsCycles(loop, k) || !seamless(loop) || flawedLoops[s.Name] {
				continue // the header's pitch does not match the loop, or it clicks
			}
			seen[z.Sample] = true
			hz := float64(k) * float64(s.Rate) / float64(len(loop))
			x := make([]float64, int(seconds*float64(s.Rate)))
			for i := range x {
				x[i] = loop[i%len(loop)]
			}
			testsignal.Normalize(x, 0.5)
			out = append(out, loopTone{in.Name, s.Name, float64(s.Rate), hz, float64(len(loop)) / float64(s.Rate), k, x})
		}
	}
	return out
}

// Instruments of the ensemble in FluidR3: bowed strings, reeds, brass,
// voice, recorder. (Its choir is many voices at once: not one pitch.)
var ensemble = []string{"Cello", "Viola", "Violin", "Contrabass", "Clarinet", "Oboe", "Bassoon",
	"Tenor Sax", "Trumpet", "Trombone", "Tuba", "French Horns", "Ohh Voices", "Recorder"}

// Real timbres: FluidR3 sample loops repeated. A short loop (≤ 2048 frames)
// is one waveform over and over, so every frame has exact truth; a long loop
// carries the player's own wander (several cents), so only its mean over
// whole loops does, and that mean is sampled at the hop: 0.25 ¢ allowed.
func TestSoundFontLoops(t *testing.T) {
	loops := fluidLoops(t, ensemble, 4, 2)
	if len(loops) < 12 {
		t.Fatalf("only %d usable loops", len(loops))
	}
	for _, l := range loops {
		d, _ := New(l.Rate, 0, 0)
		est := d.Feed(testsignal.Float32(l.X), nil)
		m := measure(est, l.Hz)
		mean, ok := meanOverLoops(est, l.LoopSeconds, 0)
		c := testsignal.Cents(mean, l.Hz)
		short := l.LoopSeconds*l.Rate <= 2048
		if m.gross > 0 || m.voiced < m.frames*3/4 || !ok || math.Abs(c) > 0.25 ||
			(short && (m.median > 0.02 || m.max > 0.2 || m.voiced < m.frames*9/10)) {
			t.Errorf("%s %q (%.3f Hz at %g Hz): %d/%d voiced, %d gross, mean over loops %+.4f ¢, frame median %.4f ¢",
				l.Instrument, l.Sample, l.Hz, l.Rate, m.voiced, m.frames, m.gross, c, m.median)
		} else {
			t.Logf("%s %q %.3f Hz: mean %+.4f ¢, frame median %.4f ¢", l.Instrument, l.Sample, l.Hz, c, m.median)
		}
	}
}

// loopHoldsCycles checks, independently of the detector, that a loop holds
// k whole cycles: most of its energy then sits in the loop's DFT bins that
// are multiples of k, and fewer under k-1 or k+1.
func loopHoldsCycles(loop []float64, k int) bool {
	c := fourier.NewFFT(len(loop)).Coefficients(nil, loop)
	share := func(k int) float64 {
		var on, all float64
		for i, z := range c[1:] {
			p := real(z)*real(z) + imag(z)*imag(z)
			all += p
			if (i+1)%k == 0 {
				on += p
			}
		}
		return on / all
	}
	s := share(k)
	return s > 0.8 && s > share(k+1) && (k == 1 || s > share(k-1))
}

// meanOverLoops is the mean pitch of the voiced frames covering a whole
// number of loop repetitions after the first span (the loop's average
// fundamental is exactly k·R/L even where the recorded pitch wanders).
func meanOverLoops(est []Estimate, loopSeconds, skip float64) (float64, bool) {
	if len(est) == 0 {
		return 0, false
	}
	t0 := est[0].Time + skip
	last := est[len(est)-1].Time
	n := math.Floor((last - t0) / loopSeconds)
	if n < 1 {
		return 0, false
	}
	var sum float64
	count := 0
	for _, e := range est {
		if e.Time >= t0 && e.Time < t0+n*loopSeconds {
			if !e.Voiced {
				continue
			}
			sum += e.Hz
			count++
		}
	}
	return sum / float64(count), count > 0
}

// flawedLoops are loops whose seam breaks the waveform although the sample
// values meet: at "Cello G3(L)" the harmonic comb's share of the spectrum
// falls from 0.8 to 0.03 for the frames spanning each seam, so those frames
// are (rightly) unvoiced and the loop mean is taken over part of its
// vibrato cycle only.
var flawedLoops = map[string]bool{"Cello G3(L)": true}

// seamless reports whether the step from a loop's last sample back to its
// first is no larger than the loop's ordinary sample-to-sample steps: a
// clicking seam is a flaw of the sample, not of any instrument.
func seamless(loop []float64) bool {
	var ss float64
	for i := 1; i < len(loop); i++ {
		ss += (loop[i] - loop[i-1]) * (loop[i] - loop[i-1])
	}
	rms := math.Sqrt(ss / float64(len(loop)-1))
	return math.Abs(loop[0]-loop[len(loop)-1]) <= 4*rms
}
