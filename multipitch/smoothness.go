package multipitch

import (
	"math"
	"slices"
)

// A voice a twelfth above another lies on that one's partials 3, 6, 9, …
// (two octaves above, on 4, 8, …; a major seventeenth, on 5, 10, …), and
// from one window's spectrum it may be a voice of its own or those partials
// standing out: FluidR3's bassoon's 3rd partial, its strongest, 18 dB above
// its fundamental, is read as a voice a twelfth up. The joint fit cannot say
// which. The spectral envelope can: a harmonic series has a smooth one (A.
// Klapuri, "Multiple fundamental frequency estimation based on harmonicity
// and spectral smoothness", IEEE TSAP 11(6), 2003), so where another voice
// lies on the partials sk they stand out of it, and where none does they
// do not. Only the odd k, the upper voice's own odd partials, are asked: its
// even ones may be a voice an octave above it (a flute's G5 over a
// bassoon's C3 made a G4 of the bassoon's 3rd partial and the flute's own).
// The voice is only marked (Voice.OnPartials), not dropped, and the other
// voices' readings stay as the fit made them: one frame may be wrong
// either way, and a note is judged on most of its frames
// (cmd/fifthline/voicetrack.go). The octave is not judged here: a voice an
// octave above is reported once, marked doubled (prune.go).

// partialGain is how far, in power, the lower voice's partials sk (k odd)
// must stand above their neighbours sk±1 (the lower median over k of each
// one's power over its neighbours' geometric mean) for a voice lying on
// them to be a voice: 6 dB. A sawtooth on partial s of one of equal level
// adds 10·log10(1+s²) dB there, 10 dB a twelfth up (its partial k on the
// lower one's sk, s times as strong: 1/k against 1/sk, unrelated phases;
// from the definition). Measured with --voices on FluidR3 renders (the
// rendered scenes of cmd/fifthline/voices_mix_test.go): the lone bassoon's
// C3, F3 and G2 stand -11 to +7.8 dB out over their 3rd partials, at or
// above 6 dB in 16 of 199 frames (its 3rd partial, a formant's peak, 5 to
// 9 dB out of its neighbours, its 9th 0 to 8 dB below them); the
// clarinet's D4 on the bassoon's G2 stands 12 to 24 dB out.
const partialGain = 4.0

// partialSteps are the partials of a lower voice a voice is judged on.
var partialSteps = [...]float64{3, 4, 5, 6}

// OnPartial reports whether hz lies within 35 ¢ of partial 3, 4, 5 or 6 of
// lo (partialSteps), where a voice may be that one's partial.
func OnPartial(hz, lo float64) bool {
	_, ok := PartialCents(hz, lo)
	return ok
}

// PartialCents is how far hz lies from the nearest of lo's partials 3, 4,
// 5 and 6, in cents, where it lies within 35 ¢ of one (OnPartial).
func PartialCents(hz, lo float64) (float64, bool) {
	for _, s := range partialSteps {
		if c := cents(hz, s*lo); math.Abs(c) < octaveCents {
			return c, true
		}
	}
	return 0, false
}

// markPartials marks each voice of vs (one frame's, read on e.spec) that
// lies on partial s of a voice below it (s in partialSteps) whose partials
// sk stand less than partialGain out of its envelope.
// A voice on partials no envelope could be read for is marked Unjudged.
func (e *Estimator) markPartials(vs []Voice) {
	for i := range vs {
		on, judged := false, false
		for _, lo := range vs {
			for _, s := range partialSteps {
				if lo.Hz >= vs[i].Hz || math.Abs(cents(vs[i].Hz, s*lo.Hz)) >= octaveCents {
					continue
				}
				x := e.partialsExcess(lo.Hz, s, vs)
				on, judged = true, judged || !math.IsInf(x, 1)
				if x < partialGain && e.ownPeaks(vs[i].Hz, lo.Hz, s, vs) < ownPeakMin {
					vs[i].OnPartials = true
				}
			}
		}
		vs[i].Unjudged = on && !judged
	}
}

// partialsExcess is the lower median over odd k of the power at partial
// step·k of f over its neighbours' geometric mean, read on the spectrum
// (what the voices there make together), over those partials on no third
// voice's partial, with the neighbours that stand 15 dB above the noise
// floor and lie on none either. Fewer than two such partials: +Inf (no
// evidence against a voice).
func (e *Estimator) partialsExcess(f, step float64, vs []Voice) float64 {
	bin := e.fitter.binHz
	// peak is the strongest bin within two of partial n: a vibrato or a
	// voice a few cents off the partial moves the peak a bin or so.
	peak := func(n int) float64 {
		b := int(math.Round(float64(n) * f / bin))
		p := 0.0
		for j := max(b-2, 1); j <= b+2 && j < len(e.spec); j++ {
			p = math.Max(p, real(e.spec[j])*real(e.spec[j])+imag(e.spec[j])*imag(e.spec[j]))
		}
		return p
	}
	// others: partial n of f lies on a partial of a third voice, neither
	// f nor one on its partial step.
	others := func(n int) bool {
		hz := float64(n) * f
		return slices.ContainsFunc(vs, func(v Voice) bool {
			k := math.Round(hz / v.Hz)
			return k >= 1 && math.Abs(hz-k*v.Hz) < 3*bin && v.Hz != f && math.Abs(cents(v.Hz, step*f)) >= octaveCents
		})
	}
	var ratios []float64
	for n := int(step); float64(n+1)*f < e.fitter.ceilHz && n <= 33; n += 2 * int(step) {
		if others(n) {
			continue
		}
		// The neighbours heard above the noise and on no other voice's
		// partial: one will do.
		env, m := 1.0, 0
		for _, nb := range []int{n - 1, n + 1} {
			if p := peak(nb); !others(nb) && p > 30*e.floor {
				env *= p
				m++
			}
		}
		if m == 0 {
			continue
		}
		ratios = append(ratios, peak(n)/math.Pow(env, 1/float64(m)))
	}
	if len(ratios) < 2 {
		return math.Inf(1)
	}
	slices.Sort(ratios)
	return ratios[(len(ratios)-1)/2]
}
