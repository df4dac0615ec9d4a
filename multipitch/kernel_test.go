package multipitch

import (
	"math"
	"testing"
)

// The tabulated kernel agrees with the closed form, and the closed form with
// the window's DFT summed directly (Harris 1978's definition of the
// transform): W(x) = Σ w[m]·cos(2π·x·m/n) over the centred window.
func TestHannKernel(t *testing.T) {
	const n = 1024
	h := newHannKernel(n, support+1)
	for _, x := range []float64{0, 0.25, -0.5, 1, 1.37, -2.9, 4.001, 7.75, -8.5} {
		direct := 0.0
		for m := -n / 2; m < n/2; m++ {
			direct += (0.5 + 0.5*math.Cos(2*math.Pi*float64(m)/n)) * math.Cos(2*math.Pi*x*float64(m)/n)
		}
		w, dw := h.value(x)
		e, de := h.exact(x)
		if math.Abs(e-direct) > 1e-9*n || math.Abs(w-e) > 1e-9*n || math.Abs(dw-de) > 1e-5*n {
			t.Errorf("W(%g): table %g, closed form %g, direct %g; slope %g vs %g", x, w, e, direct, dw, de)
		}
	}
}
