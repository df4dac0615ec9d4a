package ensemble

import (
	"math"
	"math/cmplx"
)

// A delay learned from the partials of one pitch is known only to a whole
// period of that pitch (delay.go): every lag a period apart fits them
// alike. Subtracting that pitch at any of those lags is right, but a new
// pitch of the neighbour's may be subtracted out of phase at the wrong
// one, and the channel, its own note broken by that, gathers no evidence
// to correct it (an oboe's F4 and a flute's A5 on a clarinet's channel
// taken 2.74 ms and 1.67 ms late for 5.60 and 3.93; under their B♭4 and
// G5 the clarinet's held pianissimo D4 broke in two). So while a pair's
// delay is chosen among near-tie lags of one pitch, and the
// neighbour sounds a pitch unrelated to it, each frame judges it at the
// new pitch's partials that the old one does not share (judgePhase); one
// that would leave the channel louder there is not subtracted until a
// frame judges it otherwise or the evidence has chosen one of the lags.
// A frame with no such partial clear of the others' (a low
// voice's own partials lie everywhere) keeps the last judgment: holding
// back every pair it cannot judge broke a choir bass's B♭2 in two live.
// One pitch that gave a single clear lag (a bassoon's, whose period is
// longer than most delays) is trusted, and so is the one lag the
// evidence at both pitches leaves: holding either back let a bassoon's new G2 cover the
// clarinet's D4, its third harmonic, for 0.15 s, and a soprano's F♯4
// entering over the bass's D3 make it D2 for 0.18 s.

// heardAt notes that p's evidence this frame was gathered at pitch hz:
// the first such pitch is the one its near-tie lags lie a period apart of.
func (p *pairBleed) heardAt(hz float64) {
	if p.pitch == 0 {
		p.pitch = hz
	}
}

// periodAmbiguous tells whether the delay of what c hears of d was
// chosen among near-ties, of which d's pitch now is none of the multiples
// or partials of the first pitch: that delay may be a whole period of the
// old pitch off, out of phase for the new one. Evidence at the new pitch
// does not settle it until the estimate has one lag left: the old
// pitch's fades over seconds (bleedMemory), and while both stand the
// near-ties do too (an oboe's F4 then B♭4 on the clarinet's channel, read
// once as live: 0.4 s of evidence at B♭4 before one lag stood, meanwhile
// B♭4 subtracted a period of F4 off and the clarinet's held D4 broke in
// two at three phases of the hop in four).
func (m *bleedModel) periodAmbiguous(c, d int) bool {
	p, now := m.pair(c, d), m.sounding[d]
	return p.ties > 1 && now > 0 && p.pitch > 0 && !harmonicallyRelated(now, p.pitch)
}

// harmonicallyRelated tells whether one of a and b lies within
// partialCents of a whole multiple of the other: their partials share the
// lower's period, so a delay a period of it off fits both.
func harmonicallyRelated(a, b float64) bool {
	lo, hi := min(a, b), max(a, b)
	k := math.Round(hi / lo)
	return k >= 1 && math.Abs(1200*math.Log2(hi/(k*lo))) < partialCents
}

// judgePhase notes whether the pair (c, d), its delay period-ambiguous
// for d's pitch now, subtracts that pitch out of phase (kept from the last
// frame when none of d's partials can judge it): this frame's
// cross-spectrum at d's partials (clear of c's own and of a third
// player's), turned to the pair's delay, is under half the gain times
// d's power there, so subtracting g·d would leave c louder at them, not
// quieter (‖c − g·d_τ‖² < ‖c‖² exactly when Re⟨c, d_τ⟩ > g/2·‖d‖²).
func (m *bleedModel) judgePhase(o *Owner, f *frameReadings, c, d int) {
	p := m.pair(c, d)
	if !m.periodAmbiguous(c, d) {
		p.outOfPhase = false
		return
	}
	binHz := o.fs / float64(m.n)
	own, unread := f.own(c)
	if f.hz[c] == 0 && f.recent[c] > 0 {
		// The player's note, its reading given away this frame: a wrong
		// subtraction leaves the channel at the period the note shares with
		// the bleed (a clarinet's D4 read G1 under a bassoon's G2), whose
		// partials lie on every bin and would leave nothing to judge by.
		own, unread = f.recent[c], false
	}
	if unread && f.level[c] > f.level[d]-quietDB {
		return // c's own attack, not yet read, lies anywhere among d's partials
	}
	pd := f.hz[d]
	var sum complex128
	dd := 0.0
	for h := 1; h <= bleedHarmonics && float64(h)*pd <= maxBleedHz; h++ {
		bin := int(math.Round(float64(h) * pd / binHz))
		if bin+1 >= len(p.a) {
			break
		}
		// A partial the evidence's pitch shares fits the old delay whatever
		// it is (F4's fourth is B♭4's third).
		at := float64(bin) * binHz
		if nearPartial(at, own, clearBins*binHz) || nearPartial(at, p.pitch, clearBins*binHz) || o.othersAudible(at, bin, f.hz, c, d, clearBins*binHz) {
			continue
		}
		for b := bin - 1; b <= bin+1; b++ {
			xd := o.spec[d][b]
			w := 2 * math.Pi * float64(b) / float64(m.n)
			sum += o.spec[c][b] * cmplx.Conj(xd) * cmplx.Rect(1, w*p.delay)
			dd += power(xd)
		}
	}
	if dd > 0 {
		p.outOfPhase = real(sum) < p.gain/2*dd
	}
}
