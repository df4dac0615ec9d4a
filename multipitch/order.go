package multipitch

import "math"

// The joint fit can have two optima where an upper voice lies beside a
// lower voice's partial (a near-pure C4 and G4 beside C3's 2nd and 3rd):
// the lower voice pulled onto those partials, where the upper voices add
// nothing and the prune drops them, or both voices near their truths.
// From the candidates the fit reaches the first. So the two readings are
// put side by side and judged by a model-order criterion, as Christensen &
// Jakobsson (Multi-Pitch Estimation, 2009, ch. 2) choose a model's order:
// the residual's log-likelihood with a penalty per real parameter (the MAP
// rule's form; BIC-like), and the prune starts from the winner.

// besideBins: an upper candidate within this many bins of a lower one's
// partial 2 to 6 lies beside it (C4 22 ¢ over C3's 2nd: 1.3 bins).
const besideBins = 3.0

// seatBins: the upper candidate moves to the largest peak this near it.
const seatBins = 2

// restartOdd is the highest odd partial the lower voice is restarted from.
const restartOdd = 15

// reseat compares, for each voice the prune dropped beside a kept voice's
// partial, two readings of the same voices: the kept voices' fit with the
// dropped candidate as found (hypothesis A), and that candidate seated on
// its own spectral peak with the kept voice beneath restarted from its odd
// partials no other voice shares (hypothesis B), each fitted; where B wins
// by the criterion it replaces the voices, and reports so (the prune then
// runs again from it).
func (e *Estimator) reseat() bool {
	f := e.fitter
	kept := append([]float64(nil), e.f0...)
	var a, best []float64
	gain := 0.0 // the best B's cost under A's
	for _, d := range e.drop {
		b := append(append([]float64(nil), kept...), d)
		u := len(b) - 1
		l := e.beneath(b, u)
		if l < 0 {
			continue
		}
		up, ok := e.seat(d)
		if !ok {
			continue
		}
		b[u] = up
		lo, ok := e.restart(b, l)
		if !ok {
			continue
		}
		b[l] = lo
		// A: the same voices from the kept voices' fit and the dropped
		// candidate as found, the optimum the prune began in.
		a = append(append(a[:0], kept...), d)
		f.refine(a, -1, warmSteps)
		e.usedA = append(e.usedA[:0], f.used...)
		f.refine(b, -1, warmSteps)
		union := unionBins(e.usedA, f.used)
		if g := e.orderCost(a, union) - e.orderCost(b, union); g > gain {
			gain, best = g, b
		}
	}
	if best == nil {
		return false
	}
	e.f0 = append(e.f0[:0], best...)
	return true
}

// beneath returns the lower voice of f0 on whose partial 2 to 6 voice u's
// 1st or 2nd partial lies within besideBins (-1: none), the nearest such:
// C4 beside C3's 2nd, or C4's 2nd beside F3's 3rd.
func (e *Estimator) beneath(f0 []float64, u int) int {
	best, bd := -1, besideBins*e.fitter.binHz
	for l, hz := range f0 {
		for j := 1.0; j <= 2; j++ {
			k := math.Round(j * f0[u] / hz)
			if l == u || k <= j || k > 6 || (j == 2 && math.Mod(k, 2) == 0) {
				continue
			}
			if d := math.Abs(j*f0[u] - k*hz); d < bd {
				best, bd = l, d
			}
		}
	}
	return best
}

// seat moves hz to the largest spectral peak within seatBins, placed
// between bins by a parabola through the log powers.
func (e *Estimator) seat(hz float64) (float64, bool) {
	c := int(math.Round(hz / e.fitter.binHz))
	best := -1
	for b := c - seatBins; b <= c+seatBins; b++ {
		if b >= 1 && b+1 < len(e.spec) && e.isPeak(b) && (best < 0 || e.power(b) > e.power(best)) {
			best = b
		}
	}
	if best < 0 {
		return 0, false
	}
	return e.peakHz(best), true
}

// restart reads voice l of f0 afresh from its odd partials that lie over
// besideBins from every other voice's partials, each partial's peak over
// its number, weighed by the peak's power; false where none stands 15 dB
// over the floor.
func (e *Estimator) restart(f0 []float64, l int) (float64, bool) {
	var sum, wsum float64
	for k := 1; k <= restartOdd; k += 2 {
		hz := float64(k) * f0[l]
		b := int(math.Round(hz / e.fitter.binHz))
		if hz > e.fitter.ceilHz || b+2 >= len(e.spec) || e.sharedBy(f0, l, hz) {
			continue
		}
		for j := b - 1; j <= b+1; j++ {
			if e.isPeak(j) && e.power(j) > 30*e.floor {
				sum += e.power(j) * e.peakHz(j) / float64(k)
				wsum += e.power(j)
				break
			}
		}
	}
	if wsum == 0 {
		return 0, false
	}
	return sum / wsum, true
}

// sharedBy reports whether hz lies within besideBins of a partial of a
// voice of f0 other than l.
func (e *Estimator) sharedBy(f0 []float64, l int, hz float64) bool {
	for v, g := range f0 {
		if v != l && math.Round(hz/g) >= 1 && math.Abs(hz-g*math.Round(hz/g)) < besideBins*e.fitter.binHz {
			return true
		}
	}
	return false
}

func (e *Estimator) power(b int) float64 {
	return real(e.spec[b])*real(e.spec[b]) + imag(e.spec[b])*imag(e.spec[b])
}

func (e *Estimator) isPeak(b int) bool {
	return b >= 1 && b+1 < len(e.spec) && e.power(b) >= e.power(b-1) && e.power(b) >= e.power(b+1)
}

// peakHz places the peak at bin b between bins: a parabola through the
// log powers (common practice for a Hann window's main lobe).
func (e *Estimator) peakHz(b int) float64 {
	l, c, r := math.Log(e.power(b-1)+1e-300), math.Log(e.power(b)+1e-300), math.Log(e.power(b+1)+1e-300)
	d := 0.0
	if den := l - 2*c + r; den < 0 {
		d = 0.5 * (l - r) / den
	}
	return (float64(b) + d) * e.fitter.binHz
}

// orderCost is the criterion for the voices f0 over the bins given: N
// ln(residual/N) for N real observations, plus ln N for each real
// parameter (two per complex partial amplitude, three per fundamental, as
// the MAP rule counts a frequency), with every partial free to widen.
func (e *Estimator) orderCost(f0 []float64, bins []int) float64 {
	f := e.fitter
	f.broad = true
	f.build(f0, f.maxK, -1)
	f.solve()
	f.broad = false
	r := 0.0
	for _, b := range bins {
		x := f.spec[b]
		if f.mark[b] == f.gen {
			x -= f.model[b]
		}
		r += real(x)*real(x) + imag(x)*imag(x)
	}
	n := float64(2 * len(bins))
	return n*math.Log(r/n+1e-300) + math.Log(n)*float64(2*len(f.cols)+3*len(f0))
}

// unionBins is the bins of a and b, each once.
func unionBins(a, b []int) []int {
	seen := make(map[int]bool, len(a)+len(b))
	var u []int
	for _, s := range [][]int{a, b} {
		for _, x := range s {
			if !seen[x] {
				seen[x] = true
				u = append(u, x)
			}
		}
	}
	return u
}
