package ensemble

import "math"

// partialCents is how near a pitch must lie to a whole multiple of
// another's to be possibly one of its partials (a bleed read an octave
// or a twelfth high is still that player's bleed).
const partialCents = 30

// sharedHarmonics marks (bit k−1) the harmonics k of hz, up to
// ownHarmonics, that fall on a partial of another channel's own pitch
// this frame (pitches, indexed by channel, 0 for none; channel c's own is
// skipped). Those harmonics sound loudest on that player's channel because
// they are that player's note, so they say nothing of who plays hz: a
// choir's bass entering softly under a tenor on its third harmonic is
// still the bass's. A pitch that could itself be a partial of the other
// pitch is not masked by it: then it may be that player's bleed.
// "Falls on" is within ownBins and two more bins (the window's main lobe
// leaks that far into the bins Power sums) of binHz.
func sharedHarmonics(c int, hz float64, pitches []float64, binHz float64) (mask uint16) {
	near := float64(ownBins+2) * binHz
	for d, p := range pitches {
		if d == c || !(p > 0) {
			continue
		}
		if k := math.Round(hz / p); k >= 1 && math.Abs(1200*math.Log2(hz/(k*p))) < partialCents {
			continue
		}
		for k := 1; k <= ownHarmonics; k++ {
			f := float64(k) * hz
			if j := math.Max(math.Round(f/p), 1); math.Abs(f-j*p) < near {
				mask |= 1 << (k - 1)
			}
		}
	}
	if mask == 1<<ownHarmonics-1 {
		return 0 // every harmonic shared: weigh them all rather than none
	}
	return mask
}
