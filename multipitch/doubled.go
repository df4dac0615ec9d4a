package multipitch

import (
	"math"
	"slices"
)

// doubleGain is how far, in power, a voice's even partials must stand
// above the smooth spectral envelope through its odd ones (A. Klapuri,
// "Multiple fundamental frequency estimation based on harmonicity and
// spectral smoothness", IEEE TSAP 11(6), 2003) to say another voice doubles
// it an octave above: 3 dB. A sawtooth doubled by one of equal level lifts
// its partial 2j from 1/2j to |1/2j + e^iφ/j|, +0 to +9.5 dB with the
// phase (+9.5 dB for sox's sawtooths, which start in phase), and an
// odd-only timbre doubled lifts every second even partial, 2, 6, 10, …, by
// +6 dB (from the definitions). Measured with envelopeExcess at 40 dB SNR
// (doubled_real_test.go): FluidR3's lone clarinet on D3 to E5 at most
// 0.4 dB, lone sawtooths 0 dB; doubled sawtooths of unrelated phases
// (testsignal's) 3.2 dB, doubled odd-only tones 6 dB. A timbre whose even
// partials dominate by nature (a brass's strong second partial: FluidR3's
// lone trombone loops, measured once, up to 8.9 dB) passes this margin, and
// oddsHold tells it from a double; a unison double leaves no mark and is
// not reported.
const doubleGain = 2.0

// quadGain is how far, in power, a voice's partials 4, 8, 12, … must stand
// out of the envelope through its other partials (quadrupleExcess) to say
// another voice doubles it two octaves above: 6 dB. A sawtooth doubled so by
// one of equal level lifts its partial 4j from 1/4j to |1/4j + e^iφ/j|,
// +9.5 to +14 dB with the phase (+14 dB for sox's sawtooths started in
// phase: from the definitions; measured the same, doubledtwo_test.go).
// Lone FluidR3 instruments (clarinet, trombone, bassoon, horn, tuba, cello,
// violin, flute, oboe, trumpet, choir aahs, alto sax, piano; General MIDI
// programs 72, 58, 71, 61, 59, 43, 41, 74, 69, 57, 53, 66, 1) on MIDI keys
// 40 to 72, at 40 dB SNR, measured once, half a window apart: over 6 dB
// in one frame of fifteen only (cello on G3, 6.1 dB; a note is marked where
// more than half its frames are), and the church organ (20), whose stops
// sound octaves above its note, up to 11.8 dB. An odd-partial timbre's own
// 2nd, 6th, … lie far under the envelope, so a clarinet doubled two octaves
// up is not marked (FluidR3's, on G2: G4 read in 4 frames of 17).
const quadGain = 4.0

// envelopeExcess is how far voice v's own even partials, 2 to 20, stand
// above the envelope through its own odd partials, as a power ratio, from
// the last solve: the joint fit has handed each voice its share of a partial
// near another voice's, and a partial within 1.5 bins of another voice's
// (which the fit can only split evenly) is left out, as an even partial and
// as an anchor. That still hears the octave a chord's other voices hide: in
// G3 B♭3 D4 (just) every even partial of G3 has D4's or B♭3's on an odd
// neighbour, but G3's 5th, 7th, 11th and 13th are its own. The envelope at
// k runs straight in log power over log k (a power law: exact for a
// sawtooth's 1/k) between the nearest own audible odd partials within 5 of
// it either side; the fundamental counts as no weaker than the partial
// above it, since one far below partials 2..5 (bassoon, low brass) is the
// timbre, not a double. The measure is the lower median of the even
// partials' ratios to the envelope (a formant's peak or a clarinet's upper
// even partials do not decide alone), or, where larger, of those at 2, 6,
// 10, …, where a double's odd partials lie (a double of odd partials only
// leaves 4, 8, … empty). Too few to weigh (three, or two at 2, 6, …) give
// 0.
func (e *Estimator) envelopeExcess(v int) float64 {
	var allBuf, oddBuf [10]float64
	all, odd := allBuf[:0], oddBuf[:0] // ratios at every even partial, and at 2, 6, 10, …
	for _, r := range e.evenRatios(v) {
		all = append(all, r.ratio)
		if r.k%4 == 2 {
			odd = append(odd, r.ratio)
		}
	}
	return max(lowerMedian(all, 3), lowerMedian(odd, 2))
}

// partialRatio is partial k's power over the envelope through the voice's
// own partials of the other parity around it.
type partialRatio struct {
	k     int
	ratio float64
}

// evenRatios gives voice v's even partials, 2 to 20, that have own odd
// neighbours to weigh against, each with its ratio to the envelope there
// (envelopeExcess says how).
func (e *Estimator) evenRatios(v int) []partialRatio { return e.parityRatios(v, 2) }

// parityRatios gives voice v's partials first, first+2, … up to the 21st
// against the envelope through their neighbours of the other parity, in
// the estimator's scratch, good until the next call.
func (e *Estimator) parityRatios(v, first int) []partialRatio {
	p := e.partialPowers(v)
	pow := p.pow
	own := func(k int) bool { return k < len(pow) && !p.shared(k) && p.audible(k) }
	out := e.ratios[:0]
	for k := first; k <= 21 && k+1 < len(pow); k += 2 {
		if p.shared(k) {
			continue
		}
		a, b := k-1, k+1
		for a >= max(k-5, 1) && !own(a) {
			a -= 2
		}
		for b <= k+5 && !own(b) {
			b += 2
		}
		if a < max(k-5, 1) || b > k+5 {
			continue
		}
		out = append(out, partialRatio{k, overEnvelope(pow, k, a, b)})
	}
	e.ratios = out
	return out
}

// overEnvelope is partial k's power over the envelope through partials a
// and b either side of it, straight in log power over log k; the
// fundamental counts as no weaker than b, since one far below the partials
// above it (bassoon, low brass) is the timbre, not a double.
func overEnvelope(pow []float64, k, a, b int) float64 {
	pa := pow[a]
	if a == 1 {
		pa = max(pa, pow[b])
	}
	t := math.Log(float64(k)/float64(a)) / math.Log(float64(b)/float64(a))
	return pow[k] / math.Exp((1-t)*math.Log(pa)+t*math.Log(pow[b]))
}

// oddsHold reports whether voice v's own odd partials, 3 to 21, sink
// less than half as far under the envelope through its even ones (lower
// median, as envelopeExcess; at least three to weigh) as its even
// partials stand, ex, over the odd envelope. A double lifts the even
// partials and leaves the odd ones where they were, so they sink about as
// far as the evens stand out (sox's sawtooths doubled in phase +9.5 and
// −9.5 dB, of unrelated phases +4.1 and −2.5 dB); a timbre's own strong
// even partials sit in a formant with odd ones beside them (measured,
// evenprofile_test.go, medians over a held note at 40 dB SNR: FluidR3's
// lone bassoon on F3 +8.0 and −2.5 dB, lone trombone on B♭3 +5.7 and
// −1.9 dB; each doubled by itself an octave above −9.0 and −12.4 dB).
// weighed says whether v had the three odd partials to weigh.
func (e *Estimator) oddsHold(v int, ex float64) (hold, weighed bool) {
	var buf [10]float64
	r := buf[:0]
	for _, o := range e.parityRatios(v, 3) {
		r = append(r, o.ratio)
	}
	return lowerMedian(r, 3)*math.Sqrt(ex) > 1, len(r) >= 3
}

// oddsSink reports whether voice v's odd partials do not hold (oddsHold)
// against its even ones standing ex over them, as a double leaves them;
// where neither they nor the phases can be weighed (too few partials), only
// an excess past carryGain, beyond any lone timbre measured, says so.
func (e *Estimator) oddsSink(v int, ex float64) bool {
	hold, weighed := e.oddsHold(v, ex)
	return !hold && (weighed || e.phasesWeighed(v) || ex > carryGain)
}

// lowerMedian is the lower median of the ratios r, or 0 if they are fewer
// than least.
func lowerMedian(r []float64, least int) float64 {
	if len(r) < least {
		return 0
	}
	slices.Sort(r)
	return r[(len(r)-1)/2]
}

// doubled reports whether voice v carries an octave double: its even
// partials stand above its odd partials' envelope (envelopeExcess), its
// odd partials sink under its even ones' (not oddsHold), and over its recent
// frames its partials do not move together as one instrument's
// (oneInstrument, lock.go: a bassoon's formant lifts its even partials as a
// double does, but they keep their phases to its odd ones), or, where too few
// even partials have two clean neighbours to say so, a candidate an octave
// above it was dropped in prune as explaining nothing it did not, and one of
// its even partials stands alone, both odd neighbours silent (loneEven).
//
// A voice an octave above another in a chord lays every partial on the
// lower one's even partials, and the other voices often take the odd ones
// around them: tones of four sine partials on E3, B3, E4 and G♯4 leave
// E3's 3rd and 6th on B3's 2nd and 4th and its 5th and 7th silent, so
// envelopeExcess has no partial to weigh and E4 was dropped unmarked. How much
// E4 adds to E3's 2nd and 4th depends on their phases (it may take away);
// its 4th, E3's 8th between silence, is there whatever the phases.
//
// A voice two octaves above lifts only the lower one's partials 4, 8, 12, …
// (quadrupleExcess), so the even partials' median may not move and the odd
// ones sink under an envelope through 2, 6, 10, … as far as they do under
// a timbre's; it is judged on its own, with the same phase test.
//
// Where too few partials sound to weigh either the odd ones' sinking or the
// phases (neither oddsHold nor lockedTo has three of each), the even
// partials must stand carryGain out, past any lone timbre measured: the
// tuba's D3 in the brass quartet (voices_unseen2_test.go) has 2nd and 4th
// partials 6 dB over its fundamental and 3rd, its 5th and 7th too weak to
// weigh, alone as under a chord (carried_test.go). A voice of the frame on
// v's 2nd or 4th partial is judged as v's (carriesVoice).
func (e *Estimator) doubled(v int) bool {
	if e.carriesVoice(v) {
		return true
	}
	ex := e.envelopeExcess(v)
	if ex > doubleGain && e.oddsSink(v, ex) || e.quadrupleExcess(v) > quadGain {
		return !e.oneInstrument(v)
	}
	if ex > doubleGain {
		return false
	}
	folded := slices.ContainsFunc(e.drop, func(hz float64) bool { return OctaveAbove(hz, e.f0[v]) })
	return folded && e.loneEven(v)
}

// loneEven reports whether an even partial of voice v up to the 20th, its
// own (no other voice's partial within 1.5 bins), stands doubleGain above
// the silence bar where the spectrum is silent at both odd neighbours:
// nothing of a smooth spectral envelope puts it there, and an octave voice
// reaching past the lower one's last partial does. Silent is below 15 dB
// over the noise floor and 30 dB under the voice's strongest partial (a
// synthetic chord's floor lies far below the window's leakage).
func (e *Estimator) loneEven(v int) bool {
	p := e.partialPowers(v)
	pow := p.pow
	half := float64(e.window) / 2
	bar := max(30*e.floor, 1e-3*slices.Max(pow)*half*half) // spectrum power
	silent := func(k int) bool {
		b := int(math.Round(float64(k) * e.f0[v] / e.fitter.binHz))
		for j := max(b-1, 0); j <= b+1 && j < len(e.spec); j++ {
			if r := e.spec[j]; real(r)*real(r)+imag(r)*imag(r) > bar {
				return false
			}
		}
		return true
	}
	for k := 2; k <= 20 && k+1 < len(pow); k += 2 {
		if !p.shared(k) && pow[k]*half*half > doubleGain*bar && silent(k-1) && silent(k+1) {
			return true
		}
	}
	return false
}

// partialPowers gives voice v's fitted partial powers from the last solve
// (index k), whether partial k lies within 1.5 bins of another voice's
// partial (the fit splits such a partial's power between the voices), and
// whether it stands 15 dB above the noise floor at the kernel's peak, n/2.
// The powers are the estimator's scratch (as partialAmps'), good until the
// next call: this runs for every voice of every frame.
func (e *Estimator) partialPowers(v int) voicePartials {
	return e.powersOf(v, e.partialAmps(v))
}

// powersOf is partialPowers for voice v's partial amplitudes amp, already
// taken from the last solve (partialAmps).
func (e *Estimator) powersOf(v int, amp []complex128) voicePartials {
	e.pows = grow(e.pows, len(amp))
	for k, a := range amp {
		e.pows[k] = real(a)*real(a) + imag(a)*imag(a)
	}
	return voicePartials{e: e, v: v, pow: e.pows}
}

// voicePartials is one voice's partial powers from the last solve, with
// what partialPowers tells of each partial (a value, not closures, so that
// nothing is allocated per call).
type voicePartials struct {
	e   *Estimator
	v   int
	pow []float64
}

// shared: partial k lies within 1.5 bins of another voice's partial.
func (p voicePartials) shared(k int) bool { return p.e.sharedBesides(p.v, k, p.v) }

// sharedBesides reports whether voice v's partial k lies within 1.5 bins
// of a partial of a voice other than v and u.
func (e *Estimator) sharedBesides(v, k, u int) bool {
	hz := float64(k) * e.f0[v]
	for w, g := range e.f0 {
		if w != v && w != u && math.Abs(hz-g*math.Round(hz/g)) < 1.5*e.fitter.binHz {
			return true
		}
	}
	return false
}

// audible: partial k stands 15 dB above the noise floor.
func (p voicePartials) audible(k int) bool {
	half := float64(p.e.window) / 2
	return p.pow[k]*half*half > 30*p.e.floor
}

// quadrupleExcess is how far voice v's own partials 4, 8, 12, … stand
// above the envelope through its own odd partials (lower median, at least
// two) beyond the furthest any of its partials 2, 6, 10, … stands (at least
// one to weigh; none counted under the envelope), or 0. A voice two octaves
// above lays its partials on the lower one's 4th, 8th, … alone and leaves
// the 2nd, 6th, … where the lower voice's timbre puts them; a formant lifts
// even partials of both kinds.
func (e *Estimator) quadrupleExcess(v int) float64 {
	var fourBuf, twoBuf [10]float64
	four, two := fourBuf[:0], twoBuf[:0]
	for _, r := range e.evenRatios(v) {
		if r.k%4 == 0 {
			four = append(four, r.ratio)
		} else {
			two = append(two, r.ratio)
		}
	}
	if len(two) == 0 {
		return 0
	}
	return lowerMedian(four, 2) / max(1, slices.Max(two), 1/slices.Min(two))
}
