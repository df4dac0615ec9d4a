package pitchdetect

import "math"

// spectra transforms the two frames and fills the power spectrum.
func (d *Detector) spectra(frameA, frameB []float64) {
	if d.haveB && d.hop == d.lag {
		// This frame's A is the previous frame's B: reuse its spectrum.
		d.specA, d.specB = d.specB, d.specA
	} else {
		d.spectrum(frameA, d.specA)
	}
	d.spectrum(frameB, d.specB)
	d.haveB = true
	d.powerSpectrum()
}

// spectrum windows x and transforms it into dst.
func (d *Detector) spectrum(x []float64, dst []complex128) {
	for i, v := range x {
		d.wx[i] = v * d.win[i]
	}
	d.fftWin.Coefficients(dst, d.wx)
}

// powerSpectrum fills d.power from frame B and sets the partial floor.
func (d *Detector) powerSpectrum() {
	peak := 0.0
	for i, z := range d.specB {
		p := real(z)*real(z) + imag(z)*imag(z)
		d.power[i] = p
		if p > peak {
			peak = p
		}
	}
	d.peak = peak
	copy(d.scratch, d.power)
	d.floor = max(peak*math.Pow(10, floorDB/10), floorMedian*median(d.scratch))
}

// median returns the median of x, reordering x (Hoare's quickselect).
func median(x []float64) float64 {
	k := len(x) / 2
	lo, hi := 0, len(x)-1
	for lo < hi {
		p := x[(lo+hi)/2]
		i, j := lo, hi
		for i <= j {
			for x[i] < p {
				i++
			}
			for x[j] > p {
				j--
			}
			if i <= j {
				x[i], x[j] = x[j], x[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return x[k]
		}
	}
	return x[k]
}
