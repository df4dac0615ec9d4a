package drone

import (
	"math"
	"math/cmplx"
)

// lsq is the canceller's joint least-squares fit. With regressors Re ph_k
// and Im ph_k and forgetting factor λ, the normal equations need only the
// sums Gm[k,l] = Σ λ^(N−n) ph_k conj(ph_l) and Gp[k,l] = Σ λ^(N−n) ph_k ph_l,
// which are geometric series: each chunk adds its part in closed form, so
// a sample costs O(partials) and the matrix is built once per chunk.
type lsq struct {
	n      int
	r      []complex128 // Σ λ^(N−n) x·conj(ph_k)
	gm, gp []complex128 // n×n
	m      []float64    // 2n×2n normal matrix, then its Cholesky factor
	b      []float64    // right-hand side, then the solution
}

// ridge is the weight pulling each solution towards the last one, as a
// share of the data's weight (about memory/2 per parameter): it carries the
// estimates over a restart, and holds two partials closer than the memory
// resolves to their shares instead of letting them trade large opposite
// amplitudes. Elsewhere it is a lag of a few per cent of one chunk.
const ridge = 0.05

func (f *lsq) reset(n int) {
	f.n = n
	f.r = make([]complex128, n)
	f.gm = make([]complex128, n*n)
	f.gp = make([]complex128, n*n)
	f.m = make([]float64, 4*n*n)
	f.b = make([]float64, 2*n)
}

// update adds a chunk of length b that has just ended; the phasors have
// already turned past it, so ph·conj(rot) is the chunk's last sample.
func (f *lsq) update(ps []partial, lambda float64, b int) {
	lb := math.Pow(lambda, float64(b))
	for k := range ps {
		pk := ps[k].ph * cmplx.Conj(ps[k].rot)
		for l := range ps {
			pl := ps[l].ph * cmplx.Conj(ps[l].rot)
			i := k*f.n + l
			f.gm[i] = complex(lb, 0)*f.gm[i] + pk*cmplx.Conj(pl)*series(lambda, ps[k].w-ps[l].w, b)
			f.gp[i] = complex(lb, 0)*f.gp[i] + pk*pl*series(lambda, ps[k].w+ps[l].w, b)
		}
	}
}

// series is Σ_{j<b} (λ·e^(−iω))^j.
func series(lambda, w float64, b int) complex128 {
	q := complex(lambda, 0) * cmplx.Rect(1, -w)
	if cmplx.Abs(1-q) < 1e-13 {
		return complex(float64(b), 0)
	}
	qb := complex(math.Pow(lambda, float64(b)), 0) * cmplx.Rect(1, -w*float64(b))
	return (1 - qb) / (1 - q)
}

// solve fits the amplitudes (a = c − i·s for the model c·Re ph + s·Im ph).
func (f *lsq) solve(ps []partial, memory float64) {
	ridge := ridge * memory
	n2 := 2 * f.n
	for k := range f.n {
		for l := range f.n {
			gm, gp := f.gm[k*f.n+l], f.gp[k*f.n+l]
			f.m[(2*k)*n2+2*l] = 0.5 * real(gm+gp)
			f.m[(2*k+1)*n2+2*l+1] = 0.5 * real(gm-gp)
			f.m[(2*k)*n2+2*l+1] = 0.5 * imag(gp-gm)
			f.m[(2*k+1)*n2+2*l] = 0.5 * imag(gp+gm) // Im_k·Re_l
		}
		f.b[2*k] = real(f.r[k]) + ridge*real(ps[k].a)
		f.b[2*k+1] = -imag(f.r[k]) - ridge*imag(ps[k].a)
	}
	for i := range n2 {
		f.m[i*n2+i] += ridge
	}
	if !cholesky(f.m, n2) {
		return // keep the last estimates
	}
	cholSolve(f.m, n2, f.b)
	for k := range ps {
		ps[k].a = complex(f.b[2*k], -f.b[2*k+1])
	}
}

// cholesky factors the symmetric positive-definite n×n matrix a in place
// (lower triangle), reporting false if it is not positive definite.
func cholesky(a []float64, n int) bool {
	for j := range n {
		d := a[j*n+j]
		for k := range j {
			d -= a[j*n+k] * a[j*n+k]
		}
		if !(d > 0) {
			return false
		}
		d = math.Sqrt(d)
		a[j*n+j] = d
		for i := j + 1; i < n; i++ {
			s := a[i*n+j]
			for k := range j {
				s -= a[i*n+k] * a[j*n+k]
			}
			a[i*n+j] = s / d
		}
	}
	return true
}

// cholSolve solves L·Lᵀ·x = b in place with the factor from cholesky.
func cholSolve(l []float64, n int, b []float64) {
	for i := range n {
		s := b[i]
		for k := range i {
			s -= l[i*n+k] * b[k]
		}
		b[i] = s / l[i*n+i]
	}
	for i := n - 1; i >= 0; i-- {
		s := b[i]
		for k := i + 1; k < n; k++ {
			s -= l[k*n+i] * b[k]
		}
		b[i] = s / l[i*n+i]
	}
}
