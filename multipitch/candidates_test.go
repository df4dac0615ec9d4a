package multipitch

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// A grid point's salience is the weighted sum of the residual's peak in
// each of its partials' spans (Klapuri 2006): read through runMax, as
// taken bin by bin.
func TestGridSalienceIsTheSpansPeaks(t *testing.T) {
	s := newSearcher(8193, 44100.0/16384, ceilingHz, 55, 2100)
	rng := rand.New(rand.NewPCG(5, 9))
	for b := range s.resid {
		s.resid[b] = rng.ExpFloat64()
	}
	s.tabulate()
	for i := range s.grid {
		want := 0.0
		for _, sp := range s.spans[i] {
			want += sp.w * slices.Max(s.resid[sp.lo:sp.hi+1])
		}
		if got := s.gridSalience(i); got != want {
			t.Fatalf("grid point %d (%.2f Hz): %g, bin by bin %g", i, s.grid[i], got, want)
		}
	}
}
