package multipitch

import "math"

// The fit's normal equations are banded once the columns are taken in the
// order of their bins: two columns meet only where their 2·support+1 bins
// overlap, and a stretch that wide holds a partial or two of each voice.
// A dense Cholesky factor of a few hundred columns spent most of a frame's
// time on zeros; the band's costs p·b² for band width b (a dozen or so), and
// computes the same factor (its sums run over the same nonzero terms, in
// another order: results agree to rounding).

// bandChol is the Cholesky factor L (A = L·Lᵀ) of a symmetric positive
// definite matrix over the columns in bin order, kept row by row from each
// row's first nonzero to the diagonal.
type bandChol struct {
	ord   []int     // position → column
	first []int     // per position: the first position its row reaches
	width int       // the most positions a row reaches below the diagonal
	l     []float64 // row r, position q ≥ first[r]: l[r*(width+1)+width-(r-q)]
	merge []int     // scratch for byFirstBin
}

// order lays the positions out for cols (by first bin) and sizes the factor.
func (c *bandChol) order(cols []column) {
	p := len(cols)
	c.ord = c.ord[:0]
	for i := range p {
		c.ord = append(c.ord, i)
	}
	c.byFirstBin(cols)
	c.first = c.first[:0]
	c.width = 0
	q := 0
	for r, i := range c.ord {
		for cols[c.ord[q]].lo < cols[i].lo-2*support { // overlap's reach
			q++
		}
		c.first = append(c.first, q)
		c.width = max(c.width, r-q)
	}
	c.l = grow(c.l, p*(c.width+1))
}

// byFirstBin orders c.ord (the columns' indices) by the columns' first
// bins, ties in index order: a stable sort, so the order is the one any
// stable sort gives. The fit lays each voice's columns out in rising bins,
// so it merges those runs (a natural merge sort) instead of sorting
// afresh; a general stable sort took a tenth of a frame.
func (c *bandChol) byFirstBin(cols []column) {
	a := c.ord
	c.merge = grow(c.merge, len(a))
	b := c.merge
	for runs := 2; runs > 1; a, b = b, a {
		runs = 0
		for i := 0; i < len(a); runs++ {
			j := i + 1 // the first run is a[i:j], the second a[j:k]
			for j < len(a) && cols[a[j-1]].lo <= cols[a[j]].lo {
				j++
			}
			k := min(j+1, len(a))
			for k < len(a) && cols[a[k-1]].lo <= cols[a[k]].lo {
				k++
			}
			out, l, r := i, i, j
			for ; l < j && r < k; out++ {
				if cols[a[r]].lo < cols[a[l]].lo {
					b[out], r = a[r], r+1
				} else {
					b[out], l = a[l], l+1
				}
			}
			out += copy(b[out:], a[l:j])
			copy(b[out:], a[r:k])
			i = k
		}
	}
	// The last pass (one run) copied it whole into what is now a.
	if len(a) > 0 && &a[0] != &c.ord[0] {
		copy(c.ord, a)
	}
}

// at is the element of row r at position q (first[r] ≤ q ≤ r).
func (c *bandChol) at(r, q int) *float64 { return &c.l[r*(c.width+1)+c.width-(r-q)] }

// factor turns the matrix held (rows from first to the diagonal) into its
// factor in place; false when it is not positive definite.
func (c *bandChol) factor() bool {
	for r := range c.ord {
		for q := c.first[r]; q <= r; q++ {
			s := *c.at(r, q)
			for k := max(c.first[r], c.first[q]); k < q; k++ {
				s -= *c.at(r, k) * *c.at(q, k)
			}
			if q < r {
				*c.at(r, q) = s / *c.at(q, q)
				continue
			}
			if s <= 0 || math.IsNaN(s) {
				return false
			}
			*c.at(r, r) = math.Sqrt(s)
		}
	}
	return true
}

// solve overwrites b (a row per column, in the columns' own order, n
// right-hand sides side by side) with the solution of A·x = b.
func (c *bandChol) solve(b []float64, n int) {
	for r, i := range c.ord { // L·y = b
		for k := c.first[r]; k < r; k++ {
			l, j := *c.at(r, k), c.ord[k]
			for s := range n {
				b[i*n+s] -= l * b[j*n+s]
			}
		}
		d := *c.at(r, r)
		for s := range n {
			b[i*n+s] /= d
		}
	}
	for r := len(c.ord) - 1; r >= 0; r-- { // Lᵀ·x = y
		i := c.ord[r]
		d := *c.at(r, r)
		for s := range n {
			b[i*n+s] /= d
		}
		for k := c.first[r]; k < r; k++ {
			l, j := *c.at(r, k), c.ord[k]
			for s := range n {
				b[j*n+s] -= l * b[i*n+s]
			}
		}
	}
}
