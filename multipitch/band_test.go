package multipitch

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// The band's solution of the fit's normal equations is the dense one's
// (gonum's LAPACK Cholesky, Potrf and Potrs) to rounding, for columns laid
// out as build lays them, voice by voice, with overlapping bins.
func TestBandCholeskySolvesAsDenseCholesky(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 14))
	f := newFitter(16384, 44100.0/16384, ceilingHz, maxPartials)
	for _, hz := range []float64{98, 123.47, 146.83, 174.61} {
		for k := 1; float64(k)*hz < 1500; k++ {
			pos := float64(k)*hz/f.binHz + 0.3*rng.Float64()
			c := column{voice: 0, k: k, lo: int(math.Round(pos)) - support}
			for j := range c.w {
				c.w[j], c.dw[j] = f.kern.value(float64(c.lo+j) - pos)
			}
			f.cols = append(f.cols, c, f.broadened(&c, pos))
		}
	}
	p := len(f.cols)
	dense := make([]float64, p*p)
	for i := range p {
		for q := range p {
			dense[i*p+q] = f.dot(&f.cols[i], &f.cols[q])
		}
		dense[i*p+i] += 1e-4
	}
	const n = 3
	b := make([]float64, p*n)
	for i := range b {
		b[i] = rng.NormFloat64()
	}
	want := append([]float64(nil), b...)
	fac, ok := lapack64.Potrf(blas64.Symmetric{Uplo: blas.Upper, N: p, Stride: p, Data: append([]float64(nil), dense...)})
	if !ok {
		t.Fatal("dense Cholesky failed")
	}
	lapack64.Potrs(fac, blas64.General{Rows: p, Cols: n, Stride: n, Data: want})

	c := &f.chol
	c.order(f.cols)
	if c.width >= p/4 {
		t.Errorf("band width %d of %d columns: not banded", c.width, p)
	}
	for r, i := range c.ord {
		for q := c.first[r]; q <= r; q++ {
			*c.at(r, q) = dense[i*p+c.ord[q]]
		}
	}
	if !c.factor() {
		t.Fatal("band Cholesky failed")
	}
	c.solve(b, n)
	for i := range b {
		if math.Abs(b[i]-want[i]) > 1e-9*(1+math.Abs(want[i])) {
			t.Fatalf("solution %d: band %g, dense %g", i, b[i], want[i])
		}
	}
}

// A matrix that is not positive definite is refused, as Potrf refuses it.
func TestBandCholeskyRefusesIndefinite(t *testing.T) {
	var c bandChol
	cols := []column{{lo: 10}, {lo: 12}}
	c.order(cols)
	*c.at(0, 0), *c.at(1, 0), *c.at(1, 1) = 1, 2, 1 // eigenvalues 3 and -1
	if c.factor() {
		t.Error("factored an indefinite matrix")
	}
}

// The columns' order is a stable sort's by first bin (ties in the order
// build laid them out), whatever runs they come in: voices' runs as build
// lays them, runs with ties, one column, none, and columns in no order.
func TestColumnsAreOrderedAsAStableSortOrdersThem(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 9))
	for trial := range 200 {
		var cols []column
		switch n := rng.IntN(120); trial % 3 {
		case 0: // voices' runs rising, with ties (broadened columns share a partial's bins)
			for range 1 + rng.IntN(5) {
				lo := rng.IntN(40)
				for range n / 4 {
					lo += rng.IntN(12)
					cols = append(cols, column{lo: lo})
				}
			}
		case 1: // no order at all, many ties
			for range n {
				cols = append(cols, column{lo: rng.IntN(30)})
			}
		default: // at most one column
			for range n % 2 {
				cols = append(cols, column{lo: rng.IntN(30)})
			}
		}
		var c bandChol
		c.order(cols)
		want := make([]int, len(cols))
		for i := range want {
			want[i] = i
		}
		slices.SortStableFunc(want, func(i, j int) int { return cmp.Compare(cols[i].lo, cols[j].lo) })
		if !slices.Equal(c.ord, want) {
			t.Fatalf("trial %d: order %v, a stable sort's %v", trial, c.ord, want)
		}
	}
}
