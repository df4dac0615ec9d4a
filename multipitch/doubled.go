package multipitch

import (
	"math"
	"slices"
)

// doubleGain is how far, in power, a voice's even partials must stand
// above their odd neighbours to say another voice doubles it an octave
// above: that voice adds four times a partial's own power to every second
// one of a sawtooth's (its partial k/2 has twice the amplitude), +7 dB on
// average with unrelated phases, where a smooth spectral envelope (Klapuri
// 2003) has them level. Taken as the median over the even partials of each
// one's power over its neighbours' geometric mean, 3 dB. A timbre whose
// even partials dominate by nature (a strong second partial throughout)
// passes for a doubled one; a unison double leaves no mark and is not
// reported.
const doubleGain = 2.0

// evenExcess is that median for voice v, from the last solve, over even
// partials up to the 20th that share neither themselves nor their
// neighbours with another voice (a shared partial's power is split between
// the voices by the fit) and whose neighbours stand above the noise. Fewer
// than three such partials give 0.
func (e *Estimator) evenExcess(v int) float64 {
	pow, shared, audible := e.partialPowers(v)
	var ratios []float64
	for k := 2; k <= 20 && k+1 < len(pow); k += 2 {
		if shared(k-1) || shared(k) || shared(k+1) || !audible(k-1) || !audible(k+1) {
			continue
		}
		ratios = append(ratios, pow[k]/math.Sqrt(pow[k-1]*pow[k+1]))
	}
	if len(ratios) < 3 {
		return 0
	}
	slices.Sort(ratios)
	return ratios[len(ratios)/2]
}

// doubled reports whether voice v carries an octave double: its even
// partials stand above their odd neighbours (evenExcess), or, where too few
// even partials have two clean neighbours to say so, a candidate an octave
// above it was dropped in prune as explaining nothing it did not, and one of
// its even partials stands alone, both odd neighbours silent (loneEven).
//
// A voice an octave above another in a chord lays every partial on the
// lower one's even partials, and the other voices often take the odd ones
// around them: tones of four sine partials on E3, B3, E4 and G♯4 leave
// E3's 3rd and 6th on B3's 2nd and 4th and its 5th and 7th silent, so
// evenExcess has no partial to weigh and E4 was dropped unmarked. How much
// E4 adds to E3's 2nd and 4th depends on their phases (it may take away);
// its 4th, E3's 8th between silence, is there whatever the phases.
func (e *Estimator) doubled(v int) bool {
	if e.evenExcess(v) > doubleGain {
		return true
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
	pow, shared, _ := e.partialPowers(v)
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
		if !shared(k) && pow[k]*half*half > doubleGain*bar && silent(k-1) && silent(k+1) {
			return true
		}
	}
	return false
}

// partialPowers gives voice v's fitted partial powers from the last solve
// (index k), whether partial k lies within 1.5 bins of another voice's
// partial (the fit splits such a partial's power between the voices), and
// whether it stands 15 dB above the noise floor at the kernel's peak, n/2.
func (e *Estimator) partialPowers(v int) (pow []float64, shared, audible func(k int) bool) {
	pow = make([]float64, maxPartials+2)
	for i, a := range e.fitter.amp {
		if c := e.fitter.cols[i]; c.voice == v && !c.broad {
			pow[c.k] = real(a)*real(a) + imag(a)*imag(a)
		}
	}
	shared = func(k int) bool {
		hz := float64(k) * e.f0[v]
		for u, g := range e.f0 {
			if u != v && math.Abs(hz-g*math.Round(hz/g)) < 1.5*e.fitter.binHz {
				return true
			}
		}
		return false
	}
	half := float64(e.window) / 2
	audible = func(k int) bool { return pow[k]*half*half > 30*e.floor }
	return pow, shared, audible
}
