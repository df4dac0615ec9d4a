package multipitch

import "math"

// carryCents: a voice read within this of a lower voice's 2nd or 4th
// partial may be its doubling rather than a voice one
// microphone can part from it. The brass quartet's doublings lie 1.7 to
// 3.1 ¢ from the partial (voices_unseen2_test.go); a voice heard apart
// from a partial lies 14 ¢ and more off it (the trumpet's C5 15 ¢ under a
// trombone's F3's 3rd partial: ownpeaks.go).
const carryCents = 6.0

// carryGain is how far, in power, a lower voice's partials at the multiples
// of m stand out of the envelope through its other partials once the
// voice on its m-th partial is taken as its own: 10 dB. One instrument's
// partial read as a voice leaves, so taken back, that instrument's own
// profile. Measured once on FluidR3 (carried_test.go's chord, windows a
// quarter window apart): the horn's B♭3 with the trumpet's B♭4 read on its
// 2nd partial 15.3 to 24.5 dB in 7 frames of 8 (3.5 dB in one); its even
// partials' envelopeExcess without B♭4 −11.5 to +12.0 dB, median −2 dB,
// and lone timbres' up to 8.9 dB (doubleGain). Two octaves up, the
// trumpet's G4 over the tuba's G2 (1.7 ¢ apart, a beat of 2.6 s) swung
// G2's 4th partial from −8 to +7 dB, and is not marked so.
const carryGain = 10.0

// carriesVoice reports whether a voice of the frame lies on voice v's 2nd
// or 4th partial (m), within carryCents, and its partials, taken as v's
// at the multiples of m, stand carryGain out of v's envelope through its
// other partials (carriedExcess): the frame reads a voice that sounds with
// v an octave or two above, which one microphone cannot part from v's own
// partials, and the tracker folds it into v as such (cmd/fifthline:
// foldOctave, onPartials, surfaced). Where that voice is kept in the frame
// v's partials under it are shared with it, so envelopeExcess cannot weigh
// them: in the brass quartet the trumpet's B♭4 was a voice in 24 of the
// horn's B♭3's 27 frames, which then showed no doubling in 23. A twelfth
// (m = 3) is not judged so: a lone clarinet's own 3rd partial stands far
// out of its weak 2nd and 4th (FluidR3's on C5, read as a voice, marked its
// note in 10 of 15 frames: doubled_real_test.go), and the horn's C4 on the
// tuba's F2 stood only 3 to 10 dB out of F2's envelope (the brass
// quartet's F major rendered alone, measured once).
func (e *Estimator) carriesVoice(v int) bool {
	for u, hz := range e.f0 {
		m := math.Round(hz / e.f0[v])
		if u == v || m != 2 && m != 4 || math.Abs(cents(hz, m*e.f0[v])) > carryCents {
			continue
		}
		if e.carriedExcess(v, u, int(m)) > carryGain {
			return true
		}
	}
	return false
}

// carriedExcess is the lower median (at least two to weigh) of voice v's
// partials m, 2m, … up to the 21st, each with voice u's partial on it
// added, over the envelope through v's nearest own audible partials either
// side that are not multiples of m (within 5; overEnvelope), or 0.
// Partials within 1.5 bins of a voice other than u are left out, as
// partialPowers' shared ones.
func (e *Estimator) carriedExcess(v, u, m int) float64 {
	const top = 21
	var amp [top + 2]complex128
	copy(amp[:], e.partialAmps(v))
	for j, a := range e.partialAmps(u) {
		if m*j < len(amp) && j > 0 {
			amp[m*j] += a
		}
	}
	var pow [top + 2]float64
	for k, a := range amp {
		pow[k] = real(a)*real(a) + imag(a)*imag(a)
	}
	half := float64(e.window) / 2
	other := func(k int) bool { return e.sharedBesides(v, k, u) }
	own := func(k int) bool {
		return k%m != 0 && k < len(pow) && !other(k) && pow[k]*half*half > 30*e.floor
	}
	var buf [top]float64
	r := buf[:0]
	for k := m; k <= top; k += m {
		if other(k) {
			continue
		}
		a, b := k-1, k+1
		for a >= max(k-5, 1) && !own(a) {
			a--
		}
		for b <= min(k+5, top+1) && !own(b) {
			b++
		}
		if a < max(k-5, 1) || b > min(k+5, top+1) {
			continue
		}
		r = append(r, overEnvelope(pow[:], k, a, b))
	}
	return lowerMedian(r, 2)
}
