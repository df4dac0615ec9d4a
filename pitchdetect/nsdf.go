package pitchdetect

// The coarse stage: McLeod & Wyvill's normalised square difference function
// ("A smarter way to find pitch", ICMC 2005),
//
//	n(τ) = 2·r(τ) / m(τ),  r(τ) = Σ x[j]·x[j+τ],  m(τ) = Σ x[j]² + x[j+τ]²,
//
// with r computed as the inverse FFT of the zero-padded power spectrum and m
// by a running sum. The pick is the first "key maximum" (the highest point of
// each positive lobe after the first negative-going zero crossing) within
// nsdfPickRatio of the highest key maximum, as in the paper.

import "math"

// nsdfPickRatio is the paper's k constant: lower values prefer shorter
// periods (risking octave-high picks); the spectral guard corrects both ways.
const nsdfPickRatio = 0.9

// nsdf computes n(τ) for τ in [0, len(d.nsdfOut)) from frame x (len N).
func (d *Detector) nsdf(x []float64) []float64 {
	pad := d.padBuf
	copy(pad, x)
	clear(pad[len(x):])
	c := d.fftPad.Coefficients(d.padSpec, pad)
	for i, v := range c {
		c[i] = complex(real(v)*real(v)+imag(v)*imag(v), 0)
	}
	r := d.fftPad.Sequence(pad, c)
	scale := 1 / float64(len(pad)) // gonum's inverse is unnormalised
	out := d.nsdfOut
	m := 2 * r[0] * scale
	n := len(x)
	for tau := range out {
		if tau > 0 {
			a, b := x[tau-1], x[n-tau]
			m -= a*a + b*b
		}
		if m <= 1e-12*r[0]*scale {
			out[tau] = 0
			continue
		}
		out[tau] = 2 * r[tau] * scale / m
	}
	return out
}

// pickPeriod returns the period in samples (parabolically interpolated) and
// the NSDF value there (McLeod's "clarity"). ok is false when no positive
// lobe lies within [minLag, len(n)).
func pickPeriod(n []float64, minLag int) (period, clarity float64, ok bool) {
	// Skip the lobe around τ = 0.
	i := 1
	for i < len(n) && n[i] > 0 {
		i++
	}
	best := 0.0
	// First pass: the highest key maximum.
	for j, inLobe, lobeMax := i, false, 0.0; j < len(n); j++ {
		switch {
		case n[j] > 0:
			inLobe = true
			if j >= minLag && n[j] > lobeMax {
				lobeMax = n[j]
			}
		case inLobe:
			best = math.Max(best, lobeMax)
			inLobe, lobeMax = false, 0
		}
		if j == len(n)-1 && inLobe {
			best = math.Max(best, lobeMax)
		}
	}
	if best <= 0 {
		return 0, 0, false
	}
	// Second pass: the first key maximum above the pick ratio.
	thr := nsdfPickRatio * best
	for j := i; j < len(n); j++ {
		if n[j] <= 0 || j < minLag {
			continue
		}
		// Walk to the top of this lobe.
		k := j
		for j < len(n) && n[j] > 0 {
			if n[j] > n[k] {
				k = j
			}
			j++
		}
		if n[k] < thr {
			continue
		}
		p, v := parabolicPeak(n, k)
		return p, math.Min(v, 1), true
	}
	return 0, 0, false
}

// parabolicPeak interpolates the top of the peak at index k of y by the
// parabola through its neighbours (exact for a parabola; a coarse step only).
func parabolicPeak(y []float64, k int) (pos, val float64) {
	pos, val = float64(k), y[k]
	if k < 1 || k+1 >= len(y) {
		return pos, val
	}
	a, b, c := y[k-1], y[k], y[k+1]
	if b < a || b < c {
		return pos, val // not a peak: leave it on the sample
	}
	if den := a - 2*b + c; den < 0 {
		delta := 0.5 * (a - c) / den
		pos += delta
		val = b - 0.25*(a-c)*delta
	}
	return pos, val
}
