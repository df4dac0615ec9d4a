package pitchdetect

import "math"

// A pitch that moves inside the span (a wide vibrato's crest, a sample
// loop's seam) is read differently by the two stages: the NSDF's period is
// an average over the whole span, the comb's partials are weighted to its
// middle by the window. At the crest of a violin's ±25 ¢ vibrato the two
// differ by 10 ¢ (FluidR3 violin G4 and C6, measured), and a comb seeded
// from the NSDF (or, while tracking, from the last frame) loses the partials
// it should find. So a tracked comb that finds too little is reseeded from
// its strongest partial, and a comb that disagrees with the whole span's NSDF
// is held to the NSDF of the span's middle half instead, which weights the
// span as the comb's windows do. Narrow-band noise, which the agreement test
// is for, still disagrees with both.

// strongestPartial is the fundamental that the strongest spectral peak near
// one of the first partials of f says, from that peak's own phase advance,
// when it lies within three times tolCents of its place; 0 if none does.
func (d *Detector) strongestPartial(f, tolCents float64) float64 {
	best, hz := 0.0, 0.0
	reach := min(2, int(f/(3*d.binHz)))
	for k := 1; k <= 8 && float64(k)*f < d.ceilHz; k++ {
		pred := float64(k) * f
		c := int(pred/d.binHz + 0.5)
		for j := max(c-reach, 1); j <= c+reach && j < len(d.power)-1; j++ {
			pj := d.power[j]
			if pj <= best || pj < d.power[j-1] || pj < d.power[j+1] || d.specA[j] == 0 {
				continue
			}
			if fk := d.advanceHz(j, pred); math.Abs(fk-pred) <= 3*pred*tolCents/centsPerUnit {
				best, hz = pj, fk/float64(k)
			}
		}
	}
	return hz
}

// centreApart is how far, in cents, hz lies from the period the middle half
// of the span repeats at (the NSDF peak nearest hz's period): the part of
// the span the comb's windows weight most. ok is false when the middle half
// holds fewer than four periods.
func (d *Detector) centreApart(hz float64) (cents float64, ok bool) {
	period := d.fs / hz
	half := d.window / 2
	if float64(half) < 4*period {
		return 0, false
	}
	from := (d.span - half) / 2
	d.nsdf(d.lin[from : from+half])
	d.nsdfFresh = true
	p := d.refineLag(period)
	d.nsdfFresh = false // nsdfOut no longer holds the span's
	return math.Abs(1200 * math.Log2(hz*p/d.fs)), true
}

// swept reports whether a wide vibrato (sweptCents) sweeps a fundamental
// of hz across more than a bin within the window (from about 810 Hz at
// 48 kHz).
func (d *Detector) swept(hz float64) bool { return hz*sweptCents/centsPerUnit > d.binHz }
