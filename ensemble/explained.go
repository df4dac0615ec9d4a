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

// beyondBleed tells whether the harmonics of hz on channel c, less those
// marked in skip, hold more than the bleed of every channel they sound
// ownDB louder on can make, as m has learned it. A pair not yet weighed (live, the first notes) could
// be anything, so the frame stays that neighbour's; a pair weighed with
// no bleed found hears less than minBleedGain.
func (o *Owner) beyondBleed(c int, hz float64, skip uint16, ownDB float64, m *bleedModel) bool {
	mine := o.power(c, hz, skip)
	louder := false
	for d := range o.spec {
		if d == c || !o.have[d] {
			continue
		}
		theirs := o.power(d, hz, skip)
		if !(theirs > mine*math.Pow(10, ownDB/10)) {
			continue
		}
		if p := m.pair(c, d); !p.weighed || mine <= ownOverBleed*sqr(max(p.gain, minBleedGain))*theirs {
			return false
		}
		louder = true
	}
	return louder
}
