package ensemble

import "math"

// A delay learned from the partials of one pitch is known only to a whole
// period of that pitch (delay.go): every lag a period apart fits them
// alike. Subtracting that pitch at any of those lags is right, so a pair
// whose evidence holds one pitch so far is still subtracted while the
// neighbour holds it (or its octaves); but a new pitch of the neighbour's
// is out of phase at the wrong lag, and the channel, its own note broken
// by that, reads nothing and so gathers no evidence to correct it (an
// oboe's F4 and a flute's A5 on a clarinet's channel taken 2.74 ms and
// 1.68 ms late for 5.60 and 3.93; under their B♭4 and G5 the clarinet's
// held pianissimo D4 broke in two). So a pair whose delay one pitch alone
// settled, among near-tie lags, is not subtracted while the neighbour
// sounds an unrelated pitch: the channel hears that bleed as it is until
// the new pitch's evidence has chosen among the lags. One pitch that gave
// a single clear lag (a bassoon's, whose period is longer than most
// delays) is trusted: holding its subtraction back let a bassoon's new G2
// cover the clarinet's D4, its third harmonic, for 0.15 s.

// heardAt notes that p's evidence this frame was gathered at pitch hz.
func (p *pairBleed) heardAt(hz float64) {
	switch {
	case p.pitch == 0:
		p.pitch = hz
	case !harmonicallyRelated(hz, p.pitch):
		p.pitches = 2
	}
}

// periodAmbiguous tells whether the delay of what c hears of d was
// chosen among near-ties from one pitch alone, of which d's pitch now is
// none of the multiples or partials: that delay may be a whole period of
// the old pitch off, out of phase for the new one.
func (m *bleedModel) periodAmbiguous(c, d int) bool {
	p, now := m.pair(c, d), m.sounding[d]
	return p.pitches < 2 && p.ties > 1 && now > 0 && p.pitch > 0 && !harmonicallyRelated(now, p.pitch)
}

// harmonicallyRelated tells whether one of a and b lies within
// partialCents of a whole multiple of the other: their partials share the
// lower's period, so a delay a period of it off fits both.
func harmonicallyRelated(a, b float64) bool {
	lo, hi := min(a, b), max(a, b)
	k := math.Round(hi / lo)
	return k >= 1 && math.Abs(1200*math.Log2(hi/(k*lo))) < partialCents
}
