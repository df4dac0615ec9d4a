package pitchdetect

import "math"

// Stray partials. FluidR3's violin's strongest partials do not follow its
// vibrato all the way: at a crest B3's second partial, and at a quick
// note's start C♯6's first and second, read 15–30 ¢ from the series the
// other partials agree on (each partial demodulated alone, measured). A
// comb seeded from the NSDF, which weighs the strays in, lies between the
// two groups and finds little of the spectrum's power, and a comb that
// leaves the strays out of its share finds little more: the crests and the
// quick notes' first frames were left unvoiced, and the held notes read
// 4 ¢ off where the crests were missing. So a frame the comb leaves
// unvoiced is read again: the comb seeded where the partials agree most,
// weighted as the fit weighs them (power times k²); and while a note holds
// (at a note's start a partial off the series may be another's: the note
// before a slur, another part's bleed, an attack's noise) a partial within
// strayCents of its place counts as the note's in the comb's share and in
// its blend, the pitch the NSDF should agree with, though not in the fit.

// strayCents is how far a partial's reading may lie from its place on the
// comb and still be the note's.
const strayCents = 35.0

// maxCandidates caps the partials consensus weighs: the first ones hold
// the power.
const maxCandidates = 16

// consensus returns the fundamental that the partials near the comb of f0
// (within strayCents) agree on within tolCents: of the groups that agree,
// the one with the most weight (power times k²), its weighted mean.
func (d *Detector) consensus(f0, tolCents float64) float64 {
	var r, w [maxCandidates]float64
	n := 0
	reach := min(2, int(f0/(3*d.binHz)))
	for k := 1; k <= maxCandidates && float64(k)*f0 < d.ceilHz; k++ {
		pred := float64(k) * f0
		b := d.peakAround(pred, reach)
		if b < 0 || d.specA[b] == 0 {
			continue
		}
		fk := d.advanceHz(b, pred)
		if math.Abs(fk-pred) > pred*strayCents/centsPerUnit {
			continue
		}
		r[n], w[n] = fk/float64(k), d.power[b]*float64(k*k)
		n++
	}
	if n == 0 {
		return f0
	}
	hz, _ := agreeing(r[:n], w[:n], tolCents)
	return hz
}

// peakAround is the strongest local maximum of the power spectrum within
// reach bins of f above the frame's floor, or -1.
func (d *Detector) peakAround(f float64, reach int) int {
	c := int(f/d.binHz + 0.5)
	b, pb := -1, 0.0
	for j := max(c-reach, 1); j <= c+reach && j < len(d.power)-1; j++ {
		pj := d.power[j]
		if pj > pb && pj >= d.power[j-1] && pj >= d.power[j+1] {
			b, pb = j, pj
		}
	}
	if b < 0 || pb < d.floor {
		return -1
	}
	return b
}
