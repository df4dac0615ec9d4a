package ensemble

import "math"

// A pitch whose harmonics sound louder on a neighbour's channel is that
// neighbour's bleed only if the bleed can make what this channel holds of
// it. Once the pair's bleed is learned, the channel hears the neighbour
// at that gain, so where it holds more than ownOverBleed times the power
// the neighbour's harmonics would give it at that gain, the rest is the
// player's own: a clarinet entering pianissimo on the bassoon's D3's
// second harmonic, D4, whose harmonics all lie on the bassoon's louder
// ones (and so none is left out as shared: a pitch on a partial of the
// other's may be its bleed), read 0.2 s of its 1.7 s note and that 4 ¢
// sharp (FluidR3, velocity 32 under 96).
//
// The rest must stand out at two harmonics or more, each read at its
// main lobe's core (its bin and one either side, so that harmonics a few
// bins apart do not share a partial) and holding a share of the whole
// (minOwnShare): the period the player's note shares
// with a neighbour's bleed holds the note's sound at one of its harmonics
// only (the same clarinet's D4 under the bassoon's G2, read once as live,
// came out as G1, 49 Hz, its sixth harmonic the D4).

// minOwnHarmonics is how many harmonics of a pitch must hold more than
// the bleed can make for the pitch to be the player's own.
const minOwnHarmonics = 2

// minOwnShare is how much of the power at a pitch's harmonics one of them
// must hold to count: 20 dB under the rest is the skirt of a partial a
// few bins away (Blackman–Harris, 4 terms), not a partial of its own.
const minOwnShare = 0.01

// beyondBleed tells whether the harmonics of hz on channel c, less those
// marked in skip, hold more than the bleed of every channel they sound
// ownDB louder on can make, as m has learned it. A pair not yet weighed
// (live, the first notes) could be anything, so the frame stays that
// neighbour's; a pair weighed with no bleed found hears less than
// minBleedGain.
func (o *Owner) beyondBleed(c int, hz float64, skip uint16, ownDB float64, m *bleedModel) bool {
	mine := o.power(c, hz, skip)
	var bleed [ownHarmonics]float64 // the most any louder neighbour's bleed makes at each harmonic's core
	louder := false
	for d := range o.spec {
		if d == c || !o.have[d] {
			continue
		}
		theirs := o.power(d, hz, skip)
		if !(theirs > mine*math.Pow(10, ownDB/10)) {
			continue
		}
		p := m.pair(c, d)
		g2 := sqr(max(p.gain, minBleedGain))
		if !p.weighed || mine <= ownOverBleed*g2*theirs {
			return false
		}
		for k := range bleed {
			bleed[k] = max(bleed[k], g2*o.core(d, float64(k+1)*hz))
		}
		louder = true
	}
	own := 0
	for k, b := range bleed {
		if p := o.core(c, float64(k+1)*hz); skip&(1<<k) == 0 && p > ownOverBleed*b && p > minOwnShare*mine {
			own++
		}
	}
	return louder && own >= minOwnHarmonics
}

// core is the power on channel c at the bin nearest f and one either
// side (0 beyond the spectrum).
func (o *Owner) core(c int, f float64) float64 {
	spec := o.spec[c]
	centre := int(math.Round(f * float64(len(o.win)) / o.fs))
	p := 0.0
	for b := max(centre-1, 0); b <= centre+1 && b < len(spec); b++ {
		p += power(spec[b])
	}
	return p
}
