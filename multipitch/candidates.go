package multipitch

import (
	"math"
	"math/bits"
)

// Candidates: Klapuri's iterative estimation and cancellation over a
// whitened magnitude spectrum (ISMIR 2006; IEEE TSAP 2003).

// Constants of the method. α and β weight partial k of fundamental f by
// (f+α)/(k·f+β) (Klapuri 2006, the values for 93 ms frames, from memory); ν
// is the whitening's compression (same paper, from memory).
const (
	alpha   = 52.0
	beta    = 320.0
	nu      = 0.33
	gridCts = 10.0 // candidate grid step, cents
	// minSalience: a further candidate must reach this share of the first
	// one's salience to be tried in the fit at all.
	minSalience = 0.12
)

// searcher holds the whitened spectrum and the candidate grid.
type searcher struct {
	binHz  float64
	ceilHz float64
	grid   []float64 // candidate fundamentals, Hz
	spans  [][]span  // per grid point, where its partials are looked for
	white  []float64 // whitened magnitude spectrum
	resid  []float64 // what cancellation has left of it
	prefix []float64 // prefix sums of power, for whitening
	top    int       // the highest bin a search reads (whiten's last)
	// runMax[j][b] is the residual's largest value over bins b to
	// b+2^j−1 (runMax[0] is resid): a span's peak in two looks, not one
	// per bin, at every grid point for every candidate.
	runMax [][]float64
	amps   []float64 // partial amplitudes of the voice being cancelled
	peaks  []int
	// admitted[i]: grid point i is a fundamental the caller accepts, asked
	// once a frame (admit), not at every candidate's search: the caller's
	// test (the key's spelling window) cost a quarter of a frame so.
	admitted []bool
}

func newSearcher(bins int, binHz, ceilHz, lo, hi float64) *searcher {
	s := &searcher{binHz: binHz, ceilHz: ceilHz}
	for f := lo; f <= hi; f *= math.Exp2(gridCts / 1200) {
		s.grid = append(s.grid, f)
	}
	s.white = make([]float64, bins)
	s.resid = make([]float64, bins)
	s.prefix = make([]float64, bins+1)
	s.runMax = [][]float64{s.resid}
	// Partials are looked for below ceilHz, each within the grid's
	// uncertainty (bins), and cancelled two bins each side of its peak.
	pos := ceilHz / binHz
	s.top = min(bins-1, int(math.Ceil(pos+math.Max(1, pos*halfWidth)))+2)
	for _, f := range s.grid {
		var sp []span
		for k := 1; float64(k)*f < ceilHz && k <= salienceParts; k++ {
			lo, hi, ok := s.bins(float64(k) * f)
			if !ok {
				break
			}
			sp = append(sp, span{lo, hi, bits.Len(uint(hi-lo+1)) - 1, (f + alpha) / (float64(k)*f + beta)})
			for len(s.runMax) <= sp[len(sp)-1].level {
				s.runMax = append(s.runMax, make([]float64, bins))
			}
		}
		s.spans = append(s.spans, sp)
	}
	return s
}

// whiten compresses the spectrum's envelope: each bin is divided by the
// local RMS over about a third of an octave raised to 1−ν, so loud low
// partials do not drown quiet high voices (Klapuri 2006 uses ERB bands; a
// third of an octave is close to them above 500 Hz).
func (s *searcher) whiten(spec []complex128) {
	for b, z := range spec {
		s.prefix[b+1] = s.prefix[b] + real(z)*real(z) + imag(z)*imag(z)
	}
	// The local power is held no lower than quietest of the frame's
	// mean: where the spectrum is nearly silent (a synthetic chord's
	// dither, 140 dB down), dividing by it would lift a partial's far
	// window leakage to the partial's own height, and what is read would
	// hang on the level over the dither, not on the music.
	least := s.prefix[s.top+1] / float64(s.top+1) * quietest
	for b, z := range spec[:s.top+1] { // (the bins above are never read)
		lo := max(1, int(float64(b)/1.12))
		hi := min(len(spec)-1, max(int(float64(b)*1.12), lo+2))
		ms := max((s.prefix[hi+1]-s.prefix[lo])/float64(hi-lo+1), least, 1e-300)
		s.white[b] = math.Hypot(real(z), imag(z)) * math.Pow(ms, (nu-1)/2)
	}
	copy(s.resid, s.white)
}

// span is one partial's bins in the salience of a grid point, and its
// weight.
type span struct {
	lo, hi int
	level  int // of runMax: the widest power of two within the span
	w      float64
}

// salienceParts: partials above the 40th weigh little and cost most of the
// time (at 20 a low brass voice's candidate loses to its octave).
const salienceParts = 40

// halfWidth is the grid's uncertainty as a share of frequency.
var halfWidth = math.Exp2(gridCts/2400) - 1

// salience is the weighted sum of the residual's largest value near each
// partial of f.
func (s *searcher) salience(f float64) float64 {
	sum := 0.0
	for k := 1; float64(k)*f < s.ceilHz && k <= salienceParts; k++ {
		b, _ := s.peak(float64(k) * f)
		if b < 0 {
			break
		}
		sum += (f + alpha) / (float64(k)*f + beta) * s.resid[b]
	}
	return sum
}

// gridSalience is salience at grid point i, from its planned spans.
func (s *searcher) gridSalience(i int) float64 {
	sum := 0.0
	for _, sp := range s.spans[i] {
		p := s.runMax[sp.level]
		sum += sp.w * max(p[sp.lo], p[sp.hi+1-1<<sp.level])
	}
	return sum
}

// tabulate fills runMax from the residual, up to the highest bin read.
func (s *searcher) tabulate() {
	for j := 1; j < len(s.runMax); j++ {
		lo, hi, h := s.runMax[j-1], s.runMax[j], 1<<(j-1)
		for b := range max(0, s.top+2-2*h) {
			hi[b] = max(lo[b], lo[b+h])
		}
	}
}

// bins is where the grid's uncertainty about hz lies.
func (s *searcher) bins(hz float64) (lo, hi int, ok bool) {
	pos := hz / s.binHz
	half := math.Max(1, pos*halfWidth)
	lo, hi = int(math.Floor(pos-half)), int(math.Ceil(pos+half))
	return lo, hi, lo >= 1 && hi < len(s.resid)
}

// peak finds the largest residual bin within the grid's uncertainty of hz.
func (s *searcher) peak(hz float64) (int, float64) {
	lo, hi, ok := s.bins(hz)
	if !ok {
		return -1, 0
	}
	best := lo
	for b := lo + 1; b <= hi; b++ {
		if s.resid[b] > s.resid[best] {
			best = b
		}
	}
	return best, s.resid[best]
}

// admit asks accept (nil: all) which grid points this frame's candidates
// may lie on.
func (s *searcher) admit(accept func(float64) bool) {
	s.admitted = grow(s.admitted, len(s.grid))
	for i, f := range s.grid {
		s.admitted[i] = accept == nil || accept(f)
	}
}

// next returns the most salient fundamental admitted (0 when none) and its
// salience, refined to a tenth of the grid step.
func (s *searcher) next() (float64, float64) {
	best, bs := 0.0, 0.0
	s.tabulate()
	for i, f := range s.grid {
		if !s.admitted[i] {
			continue
		}
		if v := s.gridSalience(i); v > bs {
			best, bs = f, v
		}
	}
	if best == 0 {
		return 0, 0
	}
	for d := -gridCts / 2; d <= gridCts/2; d += gridCts / 10 {
		f := best * math.Exp2(d/1200)
		if v := s.salience(f); v > bs {
			best, bs = f, v
		}
	}
	return best, bs
}

// cancel removes the partials of f from the residual, each no further than
// a smooth envelope through its neighbours allows: a partial standing above
// that envelope is likely shared with another voice, which keeps the rest
// (Klapuri 2003's spectral smoothness).
//
// The neighbours' median for their mean, or an even partial barred by its
// odd neighbours alone, moved the string quartet's median 0.69 → 1.12 and
// 0.97 ¢ (measured; not kept).
func (s *searcher) cancel(f float64) {
	s.amps, s.peaks = s.amps[:0], s.peaks[:0]
	for k := 1; float64(k)*f < s.ceilHz; k++ {
		b, a := s.peak(float64(k) * f)
		if b < 0 {
			break
		}
		s.peaks = append(s.peaks, b)
		s.amps = append(s.amps, a)
	}
	for i, b := range s.peaks {
		a := s.amps[i]
		if a <= 0 {
			continue
		}
		// The envelope at k is its neighbours' mean, two each side so that
		// odd-only spectra have some (the partial itself left out, so a
		// shared one cannot raise its own bar).
		smooth, count := 0.0, 0
		for _, j := range []int{i - 2, i - 1, i + 1, i + 2} {
			if j >= 0 && j < len(s.amps) {
				smooth += s.amps[j]
				count++
			}
		}
		if count == 0 {
			smooth, count = a, 1
		}
		keep := 1 - math.Min(a, smooth/float64(count))/a
		for j := max(b-2, 1); j <= min(b+2, len(s.resid)-1); j++ {
			s.resid[j] *= keep
		}
	}
}

// clear removes the partials of f from the residual entirely.
func (s *searcher) clear(f float64) {
	for k := 1; float64(k)*f < s.ceilHz; k++ {
		b, _ := s.peak(float64(k) * f)
		if b < 0 {
			break
		}
		clear(s.resid[max(b-2, 1):min(b+3, len(s.resid))])
	}
}
