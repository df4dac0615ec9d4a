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
type hannKernel struct {
	n      float64
	w, dw  []float64 // tabulated at x = -reach + i/perBin
	reach  float64
	perBin float64
}

// perBin steps to a bin: W is read from a table by cubic Hermite
// interpolation with its exact slope (error of order (1/1024)^4, far below
// a part in 10^9 of the peak) and the slope linearly (a part in 10^6: it
// only steers Gauss–Newton steps, not where they settle).
const perBin = 1024

func newHannKernel(n int, reach float64) *hannKernel {
	h := &hannKernel{n: float64(n), reach: reach, perBin: perBin}
	m := int(2*reach*perBin) + 2
	h.w, h.dw = make([]float64, m), make([]float64, m)
	for i := range m {
		h.w[i], h.dw[i] = h.exact(-reach + float64(i)/perBin)
	}
	return h
}

// value returns W and dW/dx at x bins from the partial (|x| < reach).
func (h *hannKernel) value(x float64) (w, dw float64) {
	u := (x + h.reach) * h.perBin
	i := int(u)
	if i < 0 || i+1 >= len(h.w) {
		return h.exact(x)
	}
	t := u - float64(i)
	step := 1 / h.perBin
	w0, w1, d0, d1 := h.w[i], h.w[i+1], h.dw[i]*step, h.dw[i+1]*step
	t2, t3 := t*t, t*t*t
	w = (2*t3-3*t2+1)*w0 + (t3-2*t2+t)*d0 + (-2*t3+3*t2)*w1 + (t3-t2)*d1
	return w, h.dw[i] + t*(h.dw[i+1]-h.dw[i])
}

// curvature returns d²W/dx² at x bins from the partial, from the slope's
// table (a column shape for a partial's widening: a part in 10^3 is ample).
func (h *hannKernel) curvature(x float64) float64 {
	u := (x + h.reach) * h.perBin
	i := min(max(int(u), 0), len(h.dw)-2)
	return (h.dw[i+1] - h.dw[i]) * h.perBin
}

// exact evaluates W and dW/dx in closed form.
func (h *hannKernel) exact(x float64) (w, dw float64) {
	step := 2 * math.Pi / h.n
	th := step * x
	d0, s0 := h.dirichlet(th)
	d1, s1 := h.dirichlet(th - step)
	d2, s2 := h.dirichlet(th + step)
	return 0.5*d0 + 0.25*(d1+d2), step * (0.5*s0 + 0.25*(s1+s2))
}

// dirichlet returns D(θ) and dD/dθ.
func (h *hannKernel) dirichlet(th float64) (d, slope float64) {
	m := h.n - 1
	s, c := math.Sincos(th / 2)
	if math.Abs(s) < 1e-12 {
		return m, 0 // the peak (θ = 0 mod 2π, even n), where the slope vanishes
	}
	sm, cm := math.Sincos(m * th / 2)
	return sm / s, (m/2*cm*s - 0.5*sm*c) / (s * s)
}
