package multipitch

import "math"

// hannKernel is the transform of the periodic Hann window of length n,
// centred on the frame's middle sample so that it is real: a partial of
// complex amplitude c at x bins from bin b puts c·value(x) into bin b. With
// D(θ) = sin((n−1)θ/2)/sin(θ/2), the Dirichlet kernel of the symmetric
// rectangle, the Hann window 0.5 + 0.5·cos(2πm/n) gives
// W(θ) = 0.5·D(θ) + 0.25·D(θ−2π/n) + 0.25·D(θ+2π/n) (Harris, "On the use of
// windows for harmonic analysis with the discrete Fourier transform",
// Proc. IEEE 66(1), 1978).
type hannKernel struct{ n float64 }

// value and slope return W and dW/dx at x bins from the partial.
func (h hannKernel) value(x float64) (w, dw float64) {
	step := 2 * math.Pi / h.n
	th := step * x
	d0, s0 := h.dirichlet(th)
	d1, s1 := h.dirichlet(th - step)
	d2, s2 := h.dirichlet(th + step)
	return 0.5*d0 + 0.25*(d1+d2), step * (0.5*s0 + 0.25*(s1+s2))
}

// dirichlet returns D(θ) and dD/dθ.
func (h hannKernel) dirichlet(th float64) (d, slope float64) {
	m := h.n - 1
	s, c := math.Sincos(th / 2)
	if math.Abs(s) < 1e-12 {
		return m, 0 // the peak (θ = 0 mod 2π, even n), where the slope vanishes
	}
	sm, cm := math.Sincos(m * th / 2)
	return sm / s, (m/2*cm*s - 0.5*sm*c) / (s * s)
}
