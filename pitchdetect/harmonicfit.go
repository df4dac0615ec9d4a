package pitchdetect

// The fine stage: a weighted least-squares harmonic-comb fit. Each partial's
// frequency comes from the phase advance of its spectral peak between two
// windowed frames lag samples apart (the phase-vocoder frequency estimate,
// Flanagan & Golden 1966): for a stationary partial the phase of frame B is
// that of frame A plus 2π·f·lag/fs exactly, so with side lobes at -92 dB the
// estimate carries no interpolation bias, unlike a parabola through bins.
// The partials are then fitted to f_k = k·F by least squares weighted by
// partial power (the inverse of each estimate's noise variance), refining F
// partial by partial so that the phase unwrapping of high partials uses the
// best F so far.

import "math"

// maxPartials caps the comb; high partials add most precision (k² weight)
// but real instruments grow noisy and slightly inharmonic up there.
const maxPartials = 48

// priorShare is the coarse estimate's weight in the comb's predictions, as
// a share of the strongest partial's power.
const priorShare = 0.05

// centsPerUnit converts a small relative frequency deviation to cents.
const centsPerUnit = 1200 / math.Ln2

// fit is the outcome of the harmonic-comb fit.
type fit struct {
	hz       float64 // fitted fundamental
	residual float64 // power-weighted RMS deviation of partials from k·hz, cents
	share    float64 // fraction of the spectrum's power within the comb's peaks
	partials int     // partials used
	// blend is the fundamental the partials say weighted as the NSDF
	// weighs them (power times k², strays included; see stray.go).
	blend float64
}

// fitComb fits the comb starting from f0, which is trusted to tolCents:
// a partial whose phase-advance frequency strays further from its place on
// the comb (a noise peak, a neighbour's leakage) is left out rather than
// allowed to drag the comb. lobe is the half-width in bins of the spectral
// peak counted into the comb's share. strays counts the partials that
// stray less than strayCents in the share and the blend (see stray.go),
// below the fundamentals a vibrato sweeps across bins.
func (d *Detector) fitComb(f0, tolCents float64, lobe int, strays bool) fit {
	f := f0
	prior := priorShare * d.peak
	var swk2, swkf, sw float64
	// Residuals are accumulated as (f_k - k·F)/k in Hz about the final F by
	// keeping first and second moments of f_k/k.
	var swr, swr2 float64
	comb := 0.0
	used := 0
	var bk2, bkf float64 // the blend's moments
	strays = strays && !d.swept(f0)
	for k := 1; k <= maxPartials; k++ {
		pred := float64(k) * f
		if pred >= d.ceilHz {
			break
		}
		b := d.peakAround(pred, min(2, int(f/(3*d.binHz))))
		if b < 0 {
			continue
		}
		pb := d.power[b]
		if d.specA[b] == 0 {
			// The older frame is digital silence (a note starting after
			// it): no phase to measure the advance from. (Its angle
			// would come from the signs of zeros, which differ between
			// FFT implementations.)
			continue
		}
		fk := d.advanceHz(b, pred)
		kk := float64(k)
		w := pb
		if off := math.Abs(fk - pred); off > pred*tolCents/centsPerUnit {
			if strays && off <= pred*strayCents/centsPerUnit {
				bk2 += w * kk * kk
				bkf += w * kk * fk
				comb += d.lobePower(b, lobe)
			}
			continue
		}
		bk2 += w * kk * kk
		bkf += w * kk * fk
		swk2 += w * kk * kk
		swkf += w * kk * fk
		sw += w
		r := fk / kk
		swr += w * r
		swr2 += w * r * r
		used++
		comb += d.lobePower(b, lobe)
		// Predict with the coarse estimate as a weak prior so that one
		// weak, noisy partial cannot steer the comb; report without it.
		f = (swkf + prior*f0) / (swk2 + prior)
	}
	if swk2 > 0 {
		f = swkf / swk2
	}
	if used == 0 || sw == 0 {
		return fit{hz: f0, blend: f0}
	}
	mean := swr / sw
	// Spread of the per-partial fundamentals about their weighted mean,
	// relative to F, in cents (1200/ln 2 per unit relative deviation).
	v := math.Max(swr2/sw-mean*mean, 0)
	res := centsPerUnit * math.Sqrt(v) / f
	// The share's denominator leaves out the band below the fundamental's
	// peak, where rumble, a DC step or a loop seam can pile up power that
	// says nothing about whether the note has a pitch.
	total := 0.0
	top := min(int(d.ceilHz/d.binHz)+lobe, len(d.power))
	for _, p := range d.power[max(int(f/d.binHz)-lobe, 1):top] {
		total += p
	}
	share := 0.0
	if total > 0 {
		share = math.Min(comb/total, 1)
	}
	return fit{hz: f, residual: res, share: share, partials: used, blend: bkf / bk2}
}

// lobePower is the power within lobe bins of bin b.
func (d *Detector) lobePower(b, lobe int) float64 {
	sum := 0.0
	for j := max(b-lobe, 1); j <= b+lobe && j < len(d.power); j++ {
		sum += d.power[j]
	}
	return sum
}

// advanceHz is the frequency of the partial at bin b from its phase advance
// between the two frames, unwrapped about pred.
func (d *Detector) advanceHz(b int, pred float64) float64 {
	za, zb := d.specA[b], d.specB[b]
	re := real(zb)*real(za) + imag(zb)*imag(za)
	im := imag(zb)*real(za) - real(zb)*imag(za)
	dev := math.Remainder(math.Atan2(im, re)-2*math.Pi*pred*float64(d.lag)/d.fs, 2*math.Pi)
	return pred + dev*d.fs/(2*math.Pi*float64(d.lag))
}
