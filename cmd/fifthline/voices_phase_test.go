package main

import (
	"encoding/binary"
	"math"
	"os/exec"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

// The fourth reader of a lone part's truth (voices_truth_test.go): the
// time average of its partials' instantaneous frequencies. A partial's
// phase at the centre of a symmetric window is the phase of the window's
// transform there, wherever in the main lobe the partial lies, so the
// phase advance from one window to the next, unwrapped, is the partial's
// frequency averaged over the hop, and over a note the plain time average
// of its frequency: every moment counts once, however loud, and no period
// or lag is picked (the instantaneous frequency as the phase's derivative:
// B. Boashash, "Estimating and interpreting the instantaneous frequency of
// a signal", Proc. IEEE 80(4), 1992, from memory). YIN-type readers weigh
// a vibrato's moments by their loudness and their lags by the spectrum's
// shape: aubio's yinfft reads an additive saw with ±13 ¢ of vibrato 1.8 ¢
// sharp (measured, voices_mix_test.go's quartet).

// phaseWindow and phaseHop: 4096 samples (93 ms at 44.1 kHz) hold a
// partial of a ±13 ¢ vibrato up to phaseTopHz within the Hann main lobe
// (±2 bins, ±21.5 Hz) all through the window; hops of 256 samples keep a
// partial's phase advance within half a turn of its place up to ±86 Hz.
const (
	phaseWindow, phaseHop = 4096, 256
	phaseTopHz            = 1500.0
	phasePartials         = 8
)

// phaseTrack is the track of one note of x (one channel at rate) from..to
// seconds, its fundamental near near: at each hop the mean over its
// partials 1..8 (up to phaseTopHz, those within 20 dB of the strongest),
// weighted by each one's power over the note, of the pitch its phase
// advance says (its frequency over k). The weights are fixed over the
// note, so the track's mean over a stretch is the weighted mean of the
// partials' time-average pitches there.
func phaseTrack(x []float64, rate, near, from, to float64) []pitchFrame {
	lo, hi := int(from*rate)-phaseWindow/2, int(to*rate)-phaseWindow/2
	lo, hi = max(lo, 0), min(hi, len(x)-phaseWindow)
	if hi <= lo+phaseHop {
		return nil
	}
	win := make([]float64, phaseWindow)
	for i := range win {
		win[i] = 0.5 - 0.5*math.Cos(2*math.Pi*float64(i)/phaseWindow)
	}
	steps := (hi - lo) / phaseHop
	var cents [][]float64 // per partial, per hop
	var power []float64
	for k := 1; k <= phasePartials && float64(k)*near <= phaseTopHz; k++ {
		w := 2 * math.Pi * float64(k) * near / rate
		kr, ki := make([]float64, phaseWindow), make([]float64, phaseWindow)
		for i := range kr {
			s, c := math.Sincos(w * float64(i))
			kr[i], ki[i] = win[i]*c, -win[i]*s
		}
		c := make([]float64, steps)
		prev, p := 0.0, 0.0
		for s := 0; s <= steps; s++ {
			pos := lo + s*phaseHop
			var re, im float64
			for i, v := range x[pos : pos+phaseWindow] {
				re += v * kr[i]
				im += v * ki[i]
			}
			p += re*re + im*im
			// The phase against the frequency k·near at absolute time.
			ph := math.Atan2(im, re) - math.Mod(w*float64(pos), 2*math.Pi)
			if s > 0 {
				d := ph - prev
				d -= 2 * math.Pi * math.Round(d/(2*math.Pi))
				hz := float64(k)*near + d*rate/(2*math.Pi*phaseHop)
				c[s-1] = testsignal.Cents(hz/float64(k), near)
			}
			prev = ph
		}
		cents, power = append(cents, c), append(power, p)
	}
	strongest := 0.0
	for _, p := range power {
		strongest = math.Max(strongest, p)
	}
	for _, c := range cents {
		bridgeJumps(c, rate)
	}
	var track []pitchFrame
	for s := range steps {
		sum, weight := 0.0, 0.0
		for k, p := range power {
			if p >= strongest/100 {
				sum += p * cents[k][s]
				weight += p
			}
		}
		at := (float64(lo+s*phaseHop+phaseHop/2) + phaseWindow/2) / rate
		track = append(track, pitchFrame{at, near * math.Exp2(sum/weight/1200)})
	}
	return track
}

// jumpCents and jumpSpan: a sample's loop whose ends do not meet in phase
// puts a step into every partial's phase where it wraps (FluidR3's cello
// D3: a hop read 75 ¢ flat, twice in 2 s, measured), which a time average
// of the phase's advance counts as frequency. A hop further than jumpCents
// from the median of the hops within jumpSpan either side (a vibrato of
// ±16 ¢ lies within it) is such a step; every hop whose window holds it is
// bridged by a straight line between the hops either side.
const (
	jumpCents = 30.0
	jumpSpan  = 0.1 // s
)

// bridgeJumps bridges a partial's track of cents per hop over its phase
// steps.
func bridgeJumps(c []float64, rate float64) {
	reach := int(jumpSpan * rate / phaseHop)
	bad := make([]bool, len(c))
	for s := range c {
		near := append([]float64(nil), c[max(s-reach, 0):min(s+reach+1, len(c))]...)
		slices.Sort(near)
		if math.Abs(c[s]-near[len(near)/2]) > jumpCents {
			// The window straddling the step: every hop it spans.
			for j := max(s-phaseWindow/phaseHop/2, 0); j < min(s+phaseWindow/phaseHop/2+1, len(c)); j++ {
				bad[j] = true
			}
		}
	}
	for s := 0; s < len(c); {
		if !bad[s] {
			s++
			continue
		}
		e := s
		for e < len(c) && bad[e] {
			e++
		}
		a, b := math.NaN(), math.NaN()
		if s > 0 {
			a = c[s-1]
		}
		if e < len(c) {
			b = c[e]
		}
		for j := s; j < e; j++ {
			switch {
			case !math.IsNaN(a) && !math.IsNaN(b):
				c[j] = a + (b-a)*float64(j-s+1)/float64(e-s+1)
			case !math.IsNaN(a):
				c[j] = a
			case !math.IsNaN(b):
				c[j] = b
			}
		}
		s = e
	}
}

// monoSamples reads a one-channel file as sox decodes it, at 44.1 kHz.
func monoSamples(t *testing.T, wav string) []float64 {
	t.Helper()
	out, err := exec.Command("sox", "-R", wav, "-r", "44100", "-c", "1", "-L", "-t", "raw", "-e", "floating-point", "-b", "32", "-").Output()
	if err != nil {
		t.Fatalf("sox %s: %v", wav, err)
	}
	x := make([]float64, len(out)/4)
	for i := range x {
		x[i] = float64(math.Float32frombits(binary.LittleEndian.Uint32(out[4*i:])))
	}
	return x
}

// The phase reader reads a saw (1/k partials) with a sinusoidal vibrato at
// its centre: the log-frequency mean over whole cycles is the centre
// exactly (testsignal.Vibrato), and the hertz mean lies 0.02 ¢ above it
// for ±13 ¢ (the mean of e^(a·sin) is I0(a) ≈ 1 + a²/4: common practice).
func TestPhaseReaderReadsAVibratoAtItsCentre(t *testing.T) {
	t.Parallel()
	const rate = 44100.0
	for _, c := range []struct {
		hz, width, vibrato float64
	}{{146.83, 26, 5.5}, {220, 26, 5.5}, {587.33, 26, 6}, {98, 0, 0}, {261.63, 32, 5}} {
		x := testsignal.Tone(rate, int(3*rate), testsignal.Saw, 0.5, testsignal.Vibrato(c.hz, c.width, c.vibrato))
		from := 0.3
		to := wholeCycles(from, 2.7, c.vibrato)
		got, ok := meanNear(phaseTrack(x, rate, c.hz*math.Exp2(7.0/1200), 0.1, 2.9), from, to, c.hz)
		if !ok || math.Abs(testsignal.Cents(got, c.hz)) > 0.1 {
			t.Errorf("saw at %g Hz, vibrato %g ¢ at %g Hz: read %+.3f ¢ (want within 0.1)", c.hz, c.width, c.vibrato, testsignal.Cents(got, c.hz))
			continue
		}
		t.Logf("saw at %g Hz, vibrato %g ¢ at %g Hz: read %+.3f ¢", c.hz, c.width, c.vibrato, testsignal.Cents(got, c.hz))
	}
}
