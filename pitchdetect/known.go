package pitchdetect

// Drone-aware detection: tones the program itself plays (a drone through
// the room into the microphone) have exactly known frequencies but unknown
// amplitude and phase. Before any analysis, each known partial's complex
// amplitude is estimated over the span by a Blackman–Harris weighted
// projection and the sinusoid is subtracted, so the NSDF, the guard and the
// comb see the player alone. A player's partial within a main lobe (about
// 4 bins) of a drone partial is removed with it; the comb then works from
// the player's other partials, and a unison with the drone leaves nothing.

import "math"

// maxKnownPartials caps the work per frame (each partial costs two passes
// over the span).
const maxKnownPartials = 64

// SetKnownTones declares the fundamentals of tones playing alongside the
// player (for example the program's own drone); their harmonic partials up
// to the analysis ceiling are subtracted from every frame. nil or empty
// clears them. It allocates only if more partials are declared than ever
// before.
func (d *Detector) SetKnownTones(hz []float64) {
	d.known = d.known[:0]
	for _, f := range hz {
		if !(f > 0) {
			continue
		}
		for k := 1.0; k*f < d.ceilHz && len(d.known) < maxKnownPartials; k++ {
			d.known = append(d.known, k*f)
		}
	}
	if len(d.known) > 0 && d.spanWin == nil {
		d.spanWin = make([]float64, d.span)
		blackmanHarris(d.spanWin)
		for _, w := range d.spanWin {
			d.spanWinSum += w
		}
	}
	d.haveB = false // the previous spectrum was of an uncleaned frame
}

// removeKnown subtracts the known partials from the span in d.lin.
func (d *Detector) removeKnown() {
	x, w := d.lin, d.spanWin
	for _, f := range d.known {
		step := 2 * math.Pi * f / d.fs
		// Projection onto e^{-iωn} by a rotating phasor, renormalised
		// now and then against drift.
		si, sr := math.Sincos(step)
		cr, ci := 1.0, 0.0
		var re, im float64
		for n, v := range x {
			wv := w[n] * v
			re += wv * cr
			im -= wv * ci
			cr, ci = cr*sr-ci*si, ci*sr+cr*si
			if n&1023 == 1023 {
				s := 1 / math.Hypot(cr, ci)
				cr, ci = cr*s, ci*s
			}
		}
		// The windowed projection of A·cos(ωn+φ) is (A/2)e^{iφ}·Σw.
		ar, ai := 2*re/d.spanWinSum, 2*im/d.spanWinSum
		cr, ci = 1, 0
		for n := range x {
			x[n] -= ar*cr - ai*ci
			cr, ci = cr*sr-ci*si, ci*sr+cr*si
			if n&1023 == 1023 {
				s := 1 / math.Hypot(cr, ci)
				cr, ci = cr*s, ci*s
			}
		}
	}
}
