package multipitch

import "math"

// Partials of two voices that lie within a short window's main lobe of
// each other (timeavg.go): which of them steer a sub-window fit.

// collides reports whether partial k of voice v lies within apart bins of
// a partial of another voice in f0: any other voice's, or (not any) a
// lower voice's where v does not own the larger part of the power there
// (split). Only lower voices count then: a voice above one that lies on a
// lower voice's harmonic lies on the middle one's own harmonics in turn
// (the octave and twelfth a vibrato's partials pass for), and there the
// middle one's claim stands.
func (f *fitter) collides(f0 []float64, v, k int, any bool) bool {
	if !any {
		own, other, near := f.split(f0, v, k)
		return near && own < other
	}
	hz := float64(k) * f0[v]
	for u, g := range f0 {
		if u != v && math.Abs(hz-math.Max(1, math.Round(hz/g))*g) < f.apart*f.binHz {
			return true
		}
	}
	return false
}

// split divides the long window's power at partial k of voice v between v
// and the lower voices with a partial within apart bins of it (near: any
// has). Two estimates of the division must agree that v has the larger
// part. The long fit's own amplitudes: where they give the lower voices
// more, v owns nothing there; but for partials a bin or less apart, nearly
// one column to that fit, they can swing far apart with opposite phases,
// so v's part is then the pair's summed power less what the lower voices'
// spectral envelopes predict there, the mean power of each one's
// neighbouring partials (Klapuri 2003's spectral smoothness; a formant, a
// bassoon's strong 6th partial, defeats that estimate alone). Within
// oneColumnBins of the long window that estimate alone divides it, for a
// voice on a lower voice's partial up to envelopeTop.
func (f *fitter) split(f0 []float64, v, k int) (own, other float64, near bool) {
	hz := float64(k) * f0[v]
	sum, theirs, oneColumn := f.longAmp(v, k), 0.0, false
	for u, g := range f0 {
		j := int(math.Max(1, math.Round(hz/g)))
		d := math.Abs(hz - float64(j)*g)
		if u == v || g > f0[v] || d >= f.apart*f.binHz {
			continue
		}
		near, oneColumn = true, oneColumn || (d < oneColumnBins*f.longBinHz && lowPartial(f0[v], g))
		sum += f.longAmp(u, j)
		theirs += power(f.longAmp(u, j))
		other += (power(f.longAmp(u, j-1)) + power(f.longAmp(u, j+1))) / 2
	}
	if !near {
		return power(sum), 0, false
	}
	if theirs > power(f.longAmp(v, k)) && !oneColumn {
		return 0, other, true
	}
	return math.Max(0, power(sum)-other), other, true
}

// oneColumnBins: partials of two voices nearer than this in the long
// window's bins are nearly one column to its fit, which hands their power
// to either as the beat between them turns. A flute's G4 14 ¢ over a bowed
// cello's C3's 3rd partial (1.2 bins), its vibrato's troughs on it, was
// given a quarter of its power in those frames' long fits, so owned
// nothing there and was read 8 to 14 ¢ sharp of its lone render's readers
// (cmd/fifthline voices_unseen2_test.go; its chord's fifth read 4.55 ¢
// from what the truths make, 2.47 so; 3.64 with one bin, measured).
const oneColumnBins = 1.5

// envelopeTop: the highest partial of a lower voice whose power its
// neighbours' envelope is trusted to predict for a voice on it (the
// envelope alone, oneColumnBins; read by its own partials, timeavg.go). A
// double reed's formant lifts its 5th and 6th partials over their
// neighbours: so trusted for the trio's flute G5 on the bassoon's C3's 6th
// partial and its B4 on G2's 5th, the trio read median 0.48 ¢, worst 1.06
// (G5 −1.06 ¢, B4 +0.86; before 0.16 and 0.61 ¢: voices_mix_test.go).
const envelopeTop = 4

// longAmp is partial k of voice v in the long window's fit (0: not fitted).
func (f *fitter) longAmp(v, k int) complex128 {
	if v >= len(f.long) || k < 1 || k >= len(f.long[v]) {
		return 0
	}
	return f.long[v][k]
}

func power(a complex128) float64 { return real(a)*real(a) + imag(a)*imag(a) }

// onHarmonic reports whether voice v lies so near a harmonic of a lower
// voice that each of its partials (of those build fits) lies within apart
// bins of one of that voice's: a violin's D5 over a cello's G2.
func (f *fitter) onHarmonic(f0 []float64, v int) bool {
	hz, top := f0[v], 0.0
	for k := 1.0; k*hz <= f.ceilHz && k*hz/f.binHz+support < float64(len(f.spec)-1) && k <= float64(f.maxK); k++ {
		top = k
	}
	for _, g := range f0 {
		if m := math.Round(hz / g); g < hz && top*math.Abs(hz-m*g) < f.apart*f.binHz {
			return true
		}
	}
	return false
}

// ownShare is the share of voice v's own power (split) held by the
// partials that steer it loosely (those where it owns the larger part).
func (f *fitter) ownShare(f0 []float64, v int) float64 {
	if v >= len(f.long) {
		return 0
	}
	steer, all := 0.0, 0.0
	for k := 1; k < len(f.long[v]); k++ {
		own, other, _ := f.split(f0, v, k)
		all += own
		if own >= other {
			steer += own
		}
	}
	return steer / math.Max(all, 1e-300)
}

// besidePartial reports whether voice v's fundamental lies on a lower
// voice's partial 3, 4, 5 or 6 (PartialCents) within apart bins of it, but
// at least parted hertz from it.
func (f *fitter) besidePartial(f0 []float64, v int, parted float64) bool {
	for _, g := range f0 {
		c, ok := PartialCents(f0[v], g)
		if d := math.Abs(f0[v] - f0[v]*math.Exp2(-c/1200)); ok && g < f0[v] && d < f.apart*f.binHz && d >= parted {
			return true
		}
	}
	return false
}

// freeShare is the share of voice v's power in the long window's fit held
// by its partials that lie apart from every other voice's (collides): those
// that steer it on a sub-window.
func (f *fitter) freeShare(f0 []float64, v int) float64 {
	if v >= len(f.long) {
		return 1
	}
	free, all := 0.0, 0.0
	for k := 1; k < len(f.long[v]); k++ {
		p := power(f.long[v][k])
		all += p
		if !f.collides(f0, v, k, true) {
			free += p
		}
	}
	if all == 0 {
		return 1
	}
	return free / all
}

// onLowPartial reports whether voice v's fundamental lies within
// oneColumnBins of the long window of a lower voice's partial 3 up to
// envelopeTop, where the long fit cannot part them.
func (f *fitter) onLowPartial(f0 []float64, v int) bool {
	for _, g := range f0 {
		if lowPartial(f0[v], g) && math.Abs(f0[v]-math.Round(f0[v]/g)*g) < oneColumnBins*f.longBinHz {
			return true
		}
	}
	return false
}

// lowPartial: hz lies on lo's partial 3 up to envelopeTop (OnPartial).
func lowPartial(hz, lo float64) bool { return OnPartial(hz, lo) && math.Round(hz/lo) <= envelopeTop }
