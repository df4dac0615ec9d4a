package multipitch

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// The joint fit: every voice's harmonic series at once, amplitudes by linear
// least squares and fundamentals by Gauss–Newton (Christensen & Jakobsson,
// 2009; variable projection with Kaufman's Jacobian).

// support is how many bins each side of a partial its column covers: the
// Hann kernel is 64 dB down 8 bins out, below the noise of any recording.
const support = 8

// ridge keeps the amplitude solve defined when two partials coincide
// exactly (a just interval's shared partial): the amplitude splits evenly
// between them and the fundamentals still see the partial's position.
const ridge = 1e-4

// column is one partial of one voice: the kernel over its bins, or (broad)
// the kernel's curvature there.
type column struct {
	voice, k int
	lo       int // first bin
	broad    bool
	w, dw    [2*support + 1]float64
}

// fitter holds the spectrum and scratch for the fit; it is reused frame to
// frame.
type fitter struct {
	kern   *hannKernel
	binHz  float64
	ceilHz float64 // highest partial fitted
	maxK   int
	broad  bool // partials widen (broadened): while deciding which voices stand
	// judged (-1: none) is the voice being judged while broad: the even
	// partials of a voice an octave below it may also move (shifted).
	judged int
	// apart (bins; 0: none): a partial this near another voice's partial
	// does not steer the fundamentals (timeavg.go); steer says which
	// voices kept a partial that does, in the last build.
	apart float64
	// loose (per voice; nil: none): a voice steered by the partials it owns
	// the larger part of even where they lie near a lower voice's
	// (collide.go), judged from the long window's fit (long: per voice,
	// per partial).
	loose []bool
	long  [][]complex128
	// longBinHz is the bin of the window long was fitted on.
	longBinHz float64
	steer     []bool
	spec      []complex128 // the frame's spectrum, bins 0..n/2

	cols  []column
	chol  bandChol     // the columns' Gram matrix, then its Cholesky factor
	rhs   []float64    // right-hand sides: real and imaginary parts, or projections
	amp   []complex128 // fitted complex amplitude per column
	model []complex128 // per bin; only bins in used are meaningful
	mark  []int        // generation stamp per bin
	gen   int
	used  []int
	jac   [][]complex128 // per voice, per bin
	// The step's normal equations, nv × nv and nv: kept, as every fit of
	// every frame takes several steps.
	normal, grad []float64
}

func newFitter(n int, binHz, ceilHz float64, maxK int) *fitter {
	f := &fitter{kern: newHannKernel(n, support+1), binHz: binHz, ceilHz: ceilHz, maxK: maxK, judged: -1}
	f.model = make([]complex128, n/2+1)
	f.mark = make([]int, n/2+1)
	return f
}

// sibling is a fitter of the same spectrum, kernel and range, with a state
// of its own.
func (f *fitter) sibling() *fitter {
	s := &fitter{kern: f.kern, binHz: f.binHz, ceilHz: f.ceilHz, maxK: f.maxK, judged: -1, spec: f.spec}
	s.model = make([]complex128, len(f.model))
	s.mark = make([]int, len(f.mark))
	return s
}

// build lays out the columns for the fundamentals f0, partials up to kcap
// (and the ceiling), voice skip left out of the model but not its bins.
func (f *fitter) build(f0 []float64, kcap int, skip int) {
	f.cols = f.cols[:0]
	f.gen++
	f.used = f.used[:0]
	top := len(f.spec) - 1
	f.steer = f.steer[:0]
	for v, hz := range f0 {
		f.steer = append(f.steer, false)
		loose := v < len(f.loose) && f.loose[v]
		under := f.judged >= 0 && f.judged != v && OctaveAbove(f0[f.judged], hz)
		for k := 1; k <= min(kcap, f.maxK); k++ {
			pos := float64(k) * hz / f.binHz
			if float64(k)*hz > f.ceilHz || pos+support >= float64(top) {
				break
			}
			c := column{voice: v, k: k, lo: int(math.Round(pos)) - support}
			for j := range c.w {
				b := c.lo + j
				if b < 1 {
					continue
				}
				c.w[j], c.dw[j] = f.kern.value(float64(b) - pos)
				if f.mark[b] != f.gen {
					f.mark[b] = f.gen
					f.used = append(f.used, b)
				}
			}
			if f.apart > 0 && f.collides(f0, v, k, !loose) {
				c.dw = [2*support + 1]float64{}
			} else {
				f.steer[v] = true
			}
			if v != skip { // its bins still count, so residuals compare
				f.cols = append(f.cols, c)
				if f.broad {
					f.cols = append(f.cols, f.broadened(&c, pos))
				}
				if under && k%2 == 0 {
					f.cols = append(f.cols, shifted(&c))
				}
			}
		}
	}
}

// broadened is the column beside partial c (at pos bins) that lets it
// widen: the kernel's second derivative, with its own free amplitude. A
// partial whose frequency moves within the window — a linear chirp, a
// wandering or vibrato pitch — has, to second order in the movement, its
// kernel plus a multiple of the kernel's second derivative (the transform
// of t²·window: the harmonic chirp model's quadratic phase, Y. Doweck,
// A. Amar and I. Cohen, "Joint model order selection and parameter
// estimation of chirps with harmonic components", IEEE Trans. Signal
// Processing 63(7), 2015, from memory; here its first-order Taylor term,
// linear in the columns). Without it a moving
// voice leaves its smeared upper partials to the fit as the partials of
// another "voice" an octave or a twelfth up. Even about the partial, it
// takes nothing from the odd slope the fundamental is measured by, and it
// does not steer the Gauss–Newton step (dw zero).
func (f *fitter) broadened(c *column, pos float64) column {
	b := column{voice: c.voice, k: c.k, lo: c.lo, broad: true}
	for j := range b.w {
		if bin := c.lo + j; bin >= 1 {
			b.w[j] = f.kern.curvature(float64(bin) - pos)
		}
	}
	return b
}

// shifted is the column beside partial c that lets it move on its own:
// the kernel's slope, with its own free amplitude (to first order, a
// partial δ bins off its place is its kernel less δ times the slope). A
// voice with vibrato holds each partial where its movement over the window
// puts it, which the series' one fundamental cannot, and what it leaves at
// its even partials passes for a voice an octave up (a violin's C5 read
// C6 too). It is given only while a voice an octave above is judged, and
// only to the partials that voice lies on: given to every partial it takes
// from real voices whose partials lie near (a rendered choir lost three of
// its eight notes), and at the twelfth it drops a real one (a clarinet's D4
// over a tuba's G2 in 1 % of the frames). Like broadened, it does not
// steer the Gauss–Newton step.
func shifted(c *column) column {
	return column{voice: c.voice, k: c.k, lo: c.lo, broad: true, w: c.dw}
}

// octaveCents: a voice this close to the octave of another lies on its
// even partials.
const octaveCents = 35.0

// OctaveAbove reports whether hz lies within 35 ¢ of lo's octave, where a
// voice lies on the even partials of the one below: from one channel, an
// octave doubling and a lower voice's moving even partials are one.
func OctaveAbove(hz, lo float64) bool { return math.Abs(cents(hz, 2*lo)) < octaveCents }

// steers reports whether voice v kept a partial that steers its
// fundamental in the last build.
func (f *fitter) steers(v int) bool { return v < len(f.steer) && f.steer[v] }

// partials counts the columns that are partials, not their broadening.
func (f *fitter) partials() int {
	n := 0
	for i := range f.cols {
		if !f.cols[i].broad {
			n++
		}
	}
	return n
}

// overlap returns the bin range two columns share.
func overlap(a, b *column) (lo, hi int) {
	return max(a.lo, b.lo), min(a.lo, b.lo) + 2*support
}

// solve fits the complex amplitudes of the current columns and returns the
// residual energy over the used bins.
func (f *fitter) solve() float64 {
	p := len(f.cols)
	f.amp = f.amp[:0]
	if p == 0 {
		return f.energy(nil)
	}
	f.chol.order(f.cols)
	f.rhs = grow(f.rhs, 2*p)
	for i := range f.cols {
		a := &f.cols[i]
		var re, im float64
		for j, w := range a.w {
			if b := a.lo + j; b >= 1 {
				re += w * real(f.spec[b])
				im += w * imag(f.spec[b])
			}
		}
		f.rhs[2*i], f.rhs[2*i+1] = re, im
	}
	diag := 0.0
	for r, i := range f.chol.ord {
		for q := f.chol.first[r]; q <= r; q++ {
			*f.chol.at(r, q) = f.dot(&f.cols[i], &f.cols[f.chol.ord[q]])
		}
		diag = max(diag, *f.chol.at(r, r))
	}
	for r := range p {
		*f.chol.at(r, r) += ridge * diag
	}
	if !f.chol.factor() {
		return math.Inf(1)
	}
	f.chol.solve(f.rhs, 2)
	for i := range p {
		f.amp = append(f.amp, complex(f.rhs[2*i], f.rhs[2*i+1]))
	}
	return f.energy(f.amp)
}

// dot is the inner product of two columns' kernels over their shared bins.
func (f *fitter) dot(a, b *column) float64 {
	lo, hi := overlap(a, b)
	s := 0.0
	for bin := max(lo, 1); bin <= hi; bin++ {
		s += a.w[bin-a.lo] * b.w[bin-b.lo]
	}
	return s
}

// energy fills the model with the columns at amplitudes amp (nil: none) and
// returns the residual energy over the used bins.
func (f *fitter) energy(amp []complex128) float64 {
	for _, b := range f.used {
		f.model[b] = 0
	}
	for i, a := range amp {
		c := &f.cols[i]
		for j, w := range c.w {
			if b := c.lo + j; b >= 1 {
				f.model[b] += a * complex(w, 0)
			}
		}
	}
	e := 0.0
	for _, b := range f.used {
		r := f.spec[b] - f.model[b]
		e += real(r)*real(r) + imag(r)*imag(r)
	}
	return e
}

// step takes one Gauss–Newton step on the fundamentals from the current
// amplitudes (solve must have run); it moves no fundamental by more than
// maxStep Hz.
func (f *fitter) step(f0 []float64, maxStep float64) {
	nv := len(f0)
	for len(f.jac) < nv {
		f.jac = append(f.jac, make([]complex128, len(f.model)))
	}
	for v := range nv {
		for _, b := range f.used {
			f.jac[v][b] = 0
		}
	}
	// ∂model/∂f0_v: each partial k moves k times as fast; the kernel is a
	// function of bin − k·f0/binHz.
	for i, a := range f.amp {
		c := &f.cols[i]
		g := -float64(c.k) / f.binHz
		for j, dw := range c.dw {
			if b := c.lo + j; b >= 1 {
				f.jac[c.voice][b] += a * complex(g*dw, 0)
			}
		}
	}
	// Project each voice's direction off the amplitudes' span (what the
	// amplitudes can absorb is not evidence of a pitch change).
	p, w2 := len(f.cols), 2*nv
	f.rhs = grow(f.rhs, p*w2)
	for i := range f.cols {
		c := &f.cols[i]
		for v := range nv {
			var sr, si float64
			for j, w := range c.w {
				if b := c.lo + j; b >= 1 {
					sr += w * real(f.jac[v][b])
					si += w * imag(f.jac[v][b])
				}
			}
			f.rhs[i*w2+2*v], f.rhs[i*w2+2*v+1] = sr, si
		}
	}
	f.chol.solve(f.rhs, w2)
	for i := range f.cols {
		c := &f.cols[i]
		for v := range nv {
			y := complex(f.rhs[i*w2+2*v], f.rhs[i*w2+2*v+1])
			for j, w := range c.w {
				if b := c.lo + j; b >= 1 {
					f.jac[v][b] -= y * complex(w, 0)
				}
			}
		}
	}
	// The normal equations of the step, nv × nv.
	// (One pass over the bins, each sum still taken in the bins' order.)
	f.normal, f.grad = grow(f.normal, nv*nv), grow(f.grad, nv)
	h, g := f.normal, f.grad
	clear(h)
	clear(g)
	for _, b := range f.used {
		r := f.spec[b] - f.model[b]
		for u := range nv {
			ju := f.jac[u][b]
			g[u] += real(ju)*real(r) + imag(ju)*imag(r)
			for v := u; v < nv; v++ {
				jv := f.jac[v][b]
				h[u*nv+v] += real(ju)*real(jv) + imag(ju)*imag(jv)
			}
		}
	}
	for u := range nv {
		if h[u*nv+u] == 0 { // a voice left out: it has no direction to move in
			h[u*nv+u] = 1
		}
		h[u*nv+u] *= 1 + 1e-9
	}
	t, ok := lapack64.Potrf(blas64.Symmetric{Uplo: blas.Upper, N: nv, Stride: nv, Data: h})
	if !ok {
		return
	}
	lapack64.Potrs(t, blas64.General{Rows: nv, Cols: 1, Stride: 1, Data: g})
	for v := range nv {
		f0[v] += math.Max(-maxStep, math.Min(maxStep, g[v]))
	}
}

// grow returns s resized to n, reusing its memory when it can.
func grow[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	return s[:n]
}

// fit refines the fundamentals f0 in place: the comb grows from the lowest
// partials (where a candidate's error is still inside each partial's main
// lobe) to all of them. Voice skip (-1: none) is left out of the model but
// its bins are counted, so that fits with and without it compare. It
// returns the final residual energy.
func (f *fitter) fit(f0 []float64, skip int) float64 { return f.refine(f0, skip, coldSteps) }

// The comb's growth for a fit from candidates, and the two steps enough
// for fundamentals already fitted (after a voice is dropped).
var coldSteps, warmSteps = []int{3, 6, 12, 24, 0, 0, 0}, []int{0, 0}

// refine is fit with the given partial caps, one Gauss–Newton step each (0:
// all partials).
func (f *fitter) refine(f0 []float64, skip int, caps []int) float64 {
	for _, kcap := range caps {
		if kcap == 0 {
			kcap = f.maxK
		}
		f.build(f0, kcap, skip)
		if math.IsInf(f.solve(), 1) {
			break
		}
		f.step(f0, 0.5*f.binHz/float64(min(kcap, 6)))
	}
	f.build(f0, f.maxK, skip)
	return f.solve()
}
