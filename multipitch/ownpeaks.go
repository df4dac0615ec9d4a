package multipitch

import (
	"math"
	"slices"
)

// A voice lying near a lower voice's partial s, but not on it, is a voice:
// its partials k lie k times as many hertz from the lower voice's partials
// sk, so a few cents' detuning that one window's main lobes cannot part at
// the fundamental parts them a few partials up (a trumpet's C5 15 ¢ under a
// trombone's F3's 3rd partial: 1.7 bins at C5, 5 at its 3rd partial, with a
// 16384-sample window at 44.1 kHz). A harmonic instrument's own partial
// makes one peak there, and a voice read a few cents off it (the joint fit
// shares the partials of two voices so related, and its reading wanders)
// finds only that peak's flank. So the spectrum is asked for a peak of the
// voice's own beside the lower voice's, the valley between them deep.

// ownPeakBins is how far, in bins, a voice's partial must lie from the
// lower voice's for the two to be parted: a Hann window's main lobe spans
// ±2 bins (from the window's definition), one more so a valley lies between.
const ownPeakBins = 3.0

// ownPeakDip is how far, in power, a voice's own partial must stand above
// the lowest bin between it and the lower voice's partial: 6 dB.
const ownPeakDip = 4.0

// ownValley is how far, in power, that valley must lie under the taller of
// the two partials: 15 dB.
const ownValley = 30.0

// ownPeakPartials is how many of a voice's lowest partials are asked.
const ownPeakPartials = 8

// ownPeakMin: partials of its own that make a voice.
const ownPeakMin = 2

// ownPeaks counts the partials k of hi (k ≤ ownPeakPartials) that lie
// ownPeakBins or more from partial s·k of lo and make a peak of their own
// on e.spec (peakBeside), 15 dB above the noise floor, on no third voice's
// partial and with none as tall mirrored across the lower partial. It is 0
// where none is an odd k: a voice an octave above hi owns hi's even
// partials (a flute's B5 14 ¢ over a trombone's E3's 6th partial was read
// an octave low, as B4 beside E3's 3rd, its peaks at k = 4, 6, 8 only).
func (e *Estimator) ownPeaks(hi, lo, s float64, vs []Voice) int {
	bin := e.fitter.binHz
	n, odd := 0, false
	for k := 1; k <= ownPeakPartials && float64(k)*hi < e.fitter.ceilHz; k++ {
		a, b := float64(k)*hi/bin, s*float64(k)*lo/bin
		if math.Abs(a-b) < ownPeakBins || int(a)+2 >= len(e.spec) {
			continue
		}
		if slices.ContainsFunc(vs, func(v Voice) bool {
			m := math.Round(a * bin / v.Hz)
			return v.Hz != hi && v.Hz != lo && m >= 1 && math.Abs(a-m*v.Hz/bin) < ownPeakBins
		}) {
			continue
		}
		m := 2*b - a // a's mirror image across the lower partial
		if int(m)+2 >= len(e.spec) || m < 2 {
			continue
		}
		pa, ok := e.peakBeside(a, b)
		if !ok || pa < 30*e.floor {
			continue
		}
		// A vibrato spreads the lower partial into a lobe with a peak at
		// each end of its swing, a frequency modulation's spectrum: a
		// peak mirrored across it within 12 dB makes this one that lobe's.
		if pm, ok := e.peakBeside(m, b); ok && pm*ownPeakDip*ownPeakDip > pa {
			continue
		}
		n++
		if k%2 == 1 {
			odd = true
		}
	}
	if !odd {
		return 0
	}
	return n
}

// peakBeside returns the power of the spectrum's local maximum within a bin
// of bin a, and whether the valley between it and bin b (the lower voice's
// partial) lies ownPeakDip under it and ownValley under the taller of the
// two: a peak of its own, not b's flank nor a ripple of a lobe a vibrato
// spread (a frequency modulation's sidebands rise and fall across it).
func (e *Estimator) peakBeside(a, b float64) (float64, bool) {
	pw := func(j int) float64 { return power(e.spec[j]) }
	top := func(c float64) int {
		p := int(math.Round(c))
		for _, j := range []int{p - 1, p + 1} {
			if pw(j) > pw(p) {
				p = j
			}
		}
		return p
	}
	p, q := top(a), top(b)
	if pw(p) < pw(p-1) || pw(p) < pw(p+1) {
		return 0, false
	}
	valley := pw(p)
	for j := min(p, q); j <= max(p, q); j++ {
		valley = math.Min(valley, pw(j))
	}
	return pw(p), pw(p) >= ownPeakDip*valley && max(pw(p), pw(q)) >= ownValley*valley
}
