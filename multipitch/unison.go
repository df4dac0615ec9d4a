package multipitch

import "math"

// A chorused section is several singers on one note a few cents apart,
// each with a vibrato of its own: each of its partials is a cluster of
// theirs, wider than a window's main lobe where they spread most, and the
// fit may read the cluster's halves as two voices 30 to 55 ¢ apart, each
// taking half of every partial, just wider than the prune's twinCents. A
// section spread ±15 ¢ so read two voices on its note in 17 of 138
// frames, ±20 ¢ in 89, its frames 9.9 and 22.0 ¢ RMS from the singers' mean
// pitch (TestASectionIsOneVoice, measured; FluidR3's choir aahs E3 alone
// showed such pairs 28 to 31 ¢ apart in its frames). So two voices the prune
// kept within unisonCents are one voice, started at the mean of their
// pitches weighted by their fitted energy (the pitch a listener assigns a
// unison is its members' mean: common practice, from memory) for the final
// fit: none then, 4.1 and 6.2 ¢ RMS.
//
// Not during the prune itself (twinCents there): dropping the weaker of
// candidates within 60 ¢ there moved the rendered string quartet's readings
// (its median 0.99 → 1.07 ¢, voices_mix_test.go; the candidates' pairs
// around a violin's vibrato), measured.

// unisonCents: voices the prune kept this close are one voice. No interval
// a chord is made of is this small (the smallest, a semitone, is 100 ¢).
const unisonCents = 60.0

// mergeUnisons joins the voices kept within unisonCents of each other, two
// at a time; the final fit follows.
func (e *Estimator) mergeUnisons() {
	f := e.fitter
	for {
		i, j, ok := e.within(unisonCents)
		if !ok {
			return
		}
		f.build(e.f0, f.maxK, -1)
		f.solve()
		ei, ej := e.energyOf(i), e.energyOf(j)
		if ei+ej > 0 {
			e.f0[i] = math.Exp2((ei*math.Log2(e.f0[i]) + ej*math.Log2(e.f0[j])) / (ei + ej))
		}
		e.remove(j)
	}
}

// within finds two voices whose fundamentals lie within width cents.
func (e *Estimator) within(width float64) (int, int, bool) {
	for i := range e.f0 {
		for j := i + 1; j < len(e.f0); j++ {
			if math.Abs(cents(e.f0[i], e.f0[j])) < width {
				return i, j, true
			}
		}
	}
	return 0, 0, false
}
