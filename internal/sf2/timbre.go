package sf2

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"

	"gonum.org/v1/gonum/dsp/fourier"

	"fifthline/internal/testsignal"
)

// Timbre is the harmonic profile of one sample's loop: each partial's
// amplitude and phase, averaged over the loop. Played by an additive
// synthesiser (testsignal.Tone) along any pitch track, it sounds that
// instrument's spectrum with an exact instantaneous fundamental, which a
// sample of a bowed string or a voice, whose loops hold their own vibrato
// and no whole number of cycles, never has.
type Timbre struct {
	Instrument, Sample string
	Hz                 float64 // the loop's mean fundamental: which sample lies nearest a pitch
	Spectrum           testsignal.Spectrum
}

// quietest is the weakest partial a profile keeps, against its strongest
// (−60 dB): below it lie the sample's noise floor and partials no test
// signal at 35–45 dB SNR could show.
const quietest = 1e-3

// Timbres returns the profile of every loop (left channel or mono, 64 to
// maxFrames frames, without a click at its seam, not in FlawedLoops) of the
// instruments named whose partials hold at least half its energy.
func (f *Font) Timbres(names []string, maxFrames int) ([]Timbre, error) {
	var out []Timbre
	for _, in := range f.Instruments {
		want := false
		for _, n := range names {
			want = want || strings.EqualFold(in.Name, n)
		}
		seen := map[int]bool{}
		for _, z := range in.Zones {
			s := f.Samples[z.Sample]
			l := int(s.LoopEnd) - int(s.LoopStart)
			if !want || seen[z.Sample] || strings.HasSuffix(s.Name, "(R)") || l < 64 || l > maxFrames || s.Rate == 0 || FlawedLoops[s.Name] {
				continue
			}
			seen[z.Sample] = true
			frames, err := f.Frames(s.LoopStart, s.LoopEnd)
			if err != nil {
				return nil, fmt.Errorf("sf2: %s: %w", s.Name, err)
			}
			if !Seamless(frames) {
				continue
			}
			c := fourier.NewFFT(l).Coefficients(nil, frames)
			k := combCycles(c, float64(l)*f.NominalHz(z)/float64(s.Rate))
			if combShare(c, k) < 0.5 {
				continue
			}
			sp := profile(c, k)
			sp.Name = in.Name + " " + s.Name
			out = append(out, Timbre{in.Name, s.Name, float64(k) * float64(s.Rate) / float64(l), sp})
		}
	}
	return out, nil
}

// combCycles is the number of cycles near nominal (the header's pitch
// times the loop's length, which a sample tuned by ear misses by up to some
// 40 ¢: a cycle or two in a long loop) whose harmonic comb holds the most
// of the loop's energy. Within 3 % of nominal, no candidate divides
// another, so the comb of a divisor (which holds every harmonic of k)
// cannot win.
func combCycles(c []complex128, nominal float64) int {
	k0 := max(1, int(math.Round(nominal)))
	d := int(math.Round(0.03 * float64(k0)))
	best := k0
	for k := k0 - d; k <= k0+d; k++ {
		if combShare(c, k) > combShare(c, best) {
			best = k
		}
	}
	return best
}

// profile measures partial j as the energy of the loop's DFT bins within a
// quarter of the partial spacing of bin j·k (a partial the loop's own
// vibrato spreads over neighbouring bins keeps its energy) and the phase of
// bin j·k, for every partial below the loop's Nyquist frequency.
func profile(c []complex128, k int) testsignal.Spectrum {
	var s testsignal.Spectrum
	w := k / 4
	for j := 1; j*k+w < len(c); j++ {
		p := 0.0
		for b := j*k - w; b <= j*k+w; b++ {
			p += real(c[b])*real(c[b]) + imag(c[b])*imag(c[b])
		}
		s.Amps = append(s.Amps, math.Sqrt(p))
		// A cosine bin's phase; Tone plays sines, a quarter cycle behind.
		s.Phases = append(s.Phases, cmplx.Phase(c[j*k])+math.Pi/2)
	}
	top := 0.0
	for _, a := range s.Amps {
		top = max(top, a)
	}
	for j, a := range s.Amps {
		if a < quietest*top {
			s.Amps[j] = 0
		}
	}
	return s
}

// Play renders n samples of the timbre whose instantaneous fundamental is
// exactly hz(t) (testsignal.Tone's phase accumulator), peak-normalised to
// level, its first and last seconds shaped by raised-cosine attack and
// release ramps as a played note's are.
func (t Timbre) Play(rate float64, n int, level float64, hz func(float64) float64, attack, release float64) []float64 {
	x := testsignal.Tone(rate, n, t.Spectrum, level, hz)
	testsignal.FadeIn(x, rate, attack)
	testsignal.FadeOut(x, rate, release)
	return x
}
