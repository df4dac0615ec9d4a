package multipitch

import (
	"math"
	"slices"
)

// A voice far under another can take what a vibrato smears of the other's
// partials: a lone violin's D5 swinging ±13 ¢ over the window leaves its
// trough's partials beside the crest's the fit reads, and a voice a tenth
// of the trough (B♭1, its 10th, 20th, … partials on them) explains them
// better than the bar asks, while the twin of the trough would merge with
// the crest (measured on FluidR3's violin at 48 kHz: it explained 31 % of
// the window's energy where the bar asked 19 %). Its partials under the
// voice above hold next to nothing of it (0.01 to 0.4 % of its fitted
// power; a real voice's, the violin's C5 under a voice read on its 4th
// partial, 94 %): it
// sounds nothing a higher voice does not explain, though its fundamental
// can make a faint peak of its own (21 dB over the median bin, a peak to
// ownPartialPeaks, so the power is asked, not the peaks). Klapuri's iterative
// estimation prefers the higher candidate there, since its salience weighs
// a candidate's partial k by (f+α)/(k·f+β) and the subharmonic's lie at
// high k (A. Klapuri, "Multiple fundamental frequency estimation by summing
// harmonic amplitudes", ISMIR 2006, from memory); the joint fit weighs all
// partials alike, so the prune asks the spectrum instead.

// hollowMin is how many of a voice's partials must lie under the voice
// above it for their silence to tell: a voice that far under another is
// judged (a close voice above leaves too little of it its own).
const hollowMin = 3

// hollowShare is the share of a voice's fitted power its partials under
// the voice above must hold for it to be a voice: a hundredth (20 dB),
// over twice the phantoms' most, far under a real voice's.
const hollowShare = 0.01

// hollowSlack is how far (50 ¢) a partial may lie under the voice above
// and still count as under it: a vibrato moves both.
const hollowSlack = 1.03

// hollow reports whether voice v lies hollowMin partials or more under the
// lowest voice above it and its partials below that voice hold under
// hollowShare of its fitted power: it sounds nothing a higher voice does
// not explain. A real low voice sounds its fundamental or its low partials
// (a bassoon's weak fundamental has its 2nd to 5th partials).
func (e *Estimator) hollow(v int) bool {
	hz := e.f0[v]
	above := math.Inf(1)
	for _, g := range e.f0 {
		if g > hz && math.Abs(cents(g, hz)) >= twinCents {
			above = min(above, g)
		}
	}
	if math.IsInf(above, 1) || above < hollowMin*hz*hollowSlack {
		return false
	}
	own, all := 0.0, 0.0
	for k, a := range e.partialAmps(v) {
		all += power(a)
		if float64(k)*hz < above/hollowSlack {
			own += power(a)
		}
	}
	return own < hollowShare*all
}

// dropHollow drops the hollow voices, the lowest first and one at a time
// (the next is judged without it), and fits the rest afresh.
func (e *Estimator) dropHollow() {
	dropped := false
	for {
		low := -1
		for v, hz := range e.f0 {
			if (low < 0 || hz < e.f0[low]) && e.hollow(v) && !e.heldOwn(hz) {
				low = v
			}
		}
		if low < 0 {
			break
		}
		e.remove(low)
		dropped = true
	}
	if dropped {
		e.settle()
		e.fitter.build(e.f0, e.fitter.maxK, -1)
		e.fitter.solve()
	}
}

// A lone voice can be read an octave low on a sample whose waveform
// repeats only every second period: FluidR3's tuba (General MIDI program
// 59, 0-based 58) sounds faint lines at the odd multiples of half its
// fundamental, sharp peaks 23 to 44 dB over the noise floor, which make
// its octave below a voice to the search and to the follow (follow.go)
// once an onset's half window has read it so. Together those odd partials
// hold 36 to 43 dB less power than the even ones, the tuba's own partials
// (the first eight, measured on B♭2, D3 and F3): the voice is its
// octave's, nothing of its own sounds. A real low voice's odd partials
// carry a share of its power (a bassoon's 3rd and 5th partials are among
// its strongest).

// subOctaveShare is the share of a voice's fitted power its own odd
// partials, those on no other voice's, must hold for it to be a voice and
// not its octave's subharmonic: a thousandth (30 dB), 6 dB over the
// tuba's subharmonic lines at their most.
const subOctaveShare = 0.001

// subOctaveOdd is how many of the lowest voice's first odd partials (1,
// 3, 5, 7) must be its own, on no other voice's, for their silence to
// tell: in a chord the other voices take a real low voice's odd partials
// (a cello's G2 under D3, a bassoon's under its formant's voice), and what
// it keeps of its own then is its faint high partials (raised so, the
// rendered trio lost a note and the string quartet's median rose from 0.69
// to 1.06 ¢: measured).
const subOctaveOdd = 4

// subOctave reports whether voice v, the lowest, its first subOctaveOdd
// odd partials its own and no voice an octave above it, holds under
// subOctaveShare of its fitted power in its own odd partials.
func (e *Estimator) subOctave(v int) bool {
	hz := e.f0[v]
	if hz > slices.Min(e.f0) || slices.ContainsFunc(e.f0, near(2*hz)) {
		return false
	}
	own, all := 0.0, 0.0
	for k, a := range e.partialAmps(v) {
		all += power(a)
		shared := k%2 == 0 || e.sharedPartial(float64(k)*hz, hz) // follow.go
		if k%2 == 1 && k < 2*subOctaveOdd && (a == 0 || shared) {
			return false
		}
		if !shared {
			own += power(a)
		}
	}
	return own < subOctaveShare*all
}

// raiseSubOctaves moves each voice heard an octave under its own (subOctave)
// up to it, and fits the voices afresh.
func (e *Estimator) raiseSubOctaves() {
	raised := false
	for v := range e.f0 {
		if e.subOctave(v) {
			e.f0[v] *= 2
			raised = true
		}
	}
	if raised {
		e.settle()
	}
}
