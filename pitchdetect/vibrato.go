package pitchdetect

// Vibrato: a least-squares sinusoid fit to the steady part's pitch track in
// cents. The rate is the peak of the track's periodogram over 3–9 Hz (the
// range of sung and bowed vibrato, common practice); the centre is the mean
// of the track over the largest whole number of cycles, so a part-cycle at
// either end does not pull it (a wide vibrato fitted robustly: the fit's
// own, see fitRobust); the width is the fitted peak-to-peak swing,
// corrected for the smoothing of the detector's analysis window.

import (
	"math"
	"slices"
)

const (
	vibratoMinRate  = 3.0
	vibratoMaxRate  = 9.0
	vibratoCoarse   = 0.25 // Hz steps of the first periodogram scan
	vibratoStep     = 0.02 // and of the second
	vibratoMinWidth = 3.0  // cents peak to peak; smaller swings count as steady
	vibratoMinFit   = 0.5  // share of the track's variance the sinusoid explains
	vibratoMinCycle = 2.0  // whole cycles needed
	vibratoWide     = 20.0 // cents peak to peak, a vibrato fitted robustly (fitRobust)
	robustPerCycle  = 8.0  // and the frames a cycle it needs
)

type vibrato struct {
	rate, width, centre float64
	ok                  bool
}

// findVibrato looks for vibrato in the track c (cents) at times t; window
// is the analysis window in seconds, used to undo its smoothing of width.
func findVibrato(t, c []float64, window float64) vibrato {
	n := len(t)
	if n < 8 {
		return vibrato{}
	}
	dur := t[n-1] - t[0]
	mean, sd := meanStd(c)
	if sd == 0 || dur*vibratoMaxRate < vibratoMinCycle {
		return vibrato{}
	}
	best := vibratoRate(t, c, mean)
	if dur*best < vibratoMinCycle {
		return vibrato{}
	}
	a, b, _, fit := fitSinusoid(t, c, best)
	width := 2 * math.Hypot(a, b) / windowGain(best, window)
	if width < vibratoMinWidth {
		return vibrato{}
	}
	if fit >= vibratoMinFit {
		return vibrato{rate: best, width: width, centre: wholeCycleMean(t, c, best), ok: true}
	}
	// A wide vibrato whose frames partly follow another group of partials
	// (fitRobust) is fitted without them, where the frames are dense
	// enough to tell which lie off its cycle: the voices of one
	// microphone, read 85–93 ms apart (two frames a cycle), fitted so read
	// an absurd width and their notes 0.5 ¢ further from their truths (a
	// cello's A3 in 31-EDO: measured).
	if float64(n-1) < robustPerCycle*dur*best {
		return vibrato{}
	}
	a, b, m, fit := fitRobust(t, c, best)
	if width = 2 * math.Hypot(a, b) / windowGain(best, window); width < vibratoWide || fit < vibratoMinFit {
		return vibrato{}
	}
	return vibrato{rate: best, width: width, centre: m, ok: true}
}

// vibratoRate is the peak over vibratoMinRate–vibratoMaxRate of the
// periodogram of the track c (cents, its mean given) at times t: a coarse
// scan, then a fine one around its best, then a parabola.
func vibratoRate(t, c []float64, mean float64) float64 {
	power := func(r float64) float64 {
		var re, im float64
		var ph phasor
		for i := range t {
			co, s := ph.at(t, i, r)
			re += (c[i] - mean) * co
			im += (c[i] - mean) * s
		}
		return re*re + im*im
	}
	best, bestP := 0.0, -1.0
	for r := vibratoMinRate; r <= vibratoMaxRate+1e-9; r += vibratoCoarse {
		if p := power(r); p > bestP {
			best, bestP = r, p
		}
	}
	lo := best - vibratoCoarse
	for r := lo; r <= lo+2*vibratoCoarse+1e-9; r += vibratoStep {
		if p := power(r); p > bestP {
			best, bestP = r, p
		}
	}
	prevP, nextP := power(best-vibratoStep), power(best+vibratoStep)
	if den := prevP - 2*bestP + nextP; den < 0 {
		best += vibratoStep * 0.5 * (prevP - nextP) / den
	}
	return best
}

// vibratoLate is how long after a steady part's start its vibrato may
// settle.
const vibratoLate = 0.25

// lateVibrato finds a vibrato that settles after the steady part's first
// frames: a vibrato whose centre still rises from the attack (FluidR3's
// bassoon G2 and G3 glide some 10 ¢ up into theirs over 0.2 s: measured)
// fits no one sinusoid over the whole track, and a glide moving both ways
// is no glide to the segmenter, so the note read 1 ¢ lower where its
// first frames were voiced than where they were not. The fit starts at the
// first frame, up to vibratoLate seconds in, from which it holds, the
// frames before it moving one way by glideCents or more (a glide, as
// glide has it); it returns that fit and frame. Frames that wiggle less
// are no glide: a viola's C4 (FluidR3, a string quartet's), wavering
// 11 ¢ at 4.3 Hz in no one sinusoid's shape, fitted one from its 7th
// frame on, past a rise of 0.23 ¢, where a frame lost to a neighbour's
// bleed had its steady part begin, and read 0.86 ¢ under its frames'
// mean, 1.1 ¢ from the part alone (measured). A steady track (sd under
// that of the narrowest vibrato) has none to find.
func (s *Segmenter) lateVibrato(t, c []float64) (vibrato, int) {
	if _, sd := meanStd(c); sd < vibratoMinWidth/(2*math.Sqrt2) {
		return vibrato{}, 0
	}
	up, down := true, true // c[:k+1] only rises, only falls
	for k := 1; k < len(t) && t[k]-t[0] <= vibratoLate; k++ {
		step := c[k] - c[k-1]
		if up, down = up && step >= -glideSlack, down && step <= glideSlack; !up && !down {
			break // the first frames move both ways: no glide into it
		}
		if k%2 == 0 && math.Abs(c[k]-c[0]) >= glideCents {
			if v := findVibrato(t[k:], c[k:], s.Window); v.ok {
				return v, k
			}
		}
	}
	return vibrato{}, 0
}

// phasor walks cos and sin of 2πr(t[i]−t[0]) along a track: where the
// spacing repeats (frames come a hop apart) one complex multiplication
// steps it, and it is computed afresh where the spacing changes and every
// 64 points, so rounding cannot build up. It makes the periodogram scan,
// which runs several times a second on a held note, about 5× cheaper than
// a Sincos per point.
type phasor struct {
	re, im     float64 // at the last point
	stRe, stIm float64 // one step of spacing dt
	dt         float64
}

func (p *phasor) at(t []float64, i int, r float64) (cos, sin float64) {
	if i > 0 && i%64 != 0 {
		d := t[i] - t[i-1]
		if math.Abs(d-p.dt) < 1e-9 {
			p.re, p.im = p.re*p.stRe-p.im*p.stIm, p.re*p.stIm+p.im*p.stRe
			return p.re, p.im
		}
		p.dt = d
		p.stIm, p.stRe = math.Sincos(2 * math.Pi * r * d)
	}
	p.im, p.re = math.Sincos(2 * math.Pi * r * (t[i] - t[0]))
	return p.re, p.im
}

// fitSinusoid fits c ≈ m + a·cos + b·sin at rate r by least squares and
// returns the share of variance explained.
func fitSinusoid(t, c []float64, r float64) (a, b, m, explained float64) {
	f := sinusoidFit{t: t, r: r} // cos and sin on the fly: no allocation per frame
	return f.fit(c, nil)
}

// robustTuning is Tukey's biweight's cut, in robust standard deviations
// of the residuals (the median absolute deviation × 1.4826).
const robustTuning = 6.0

// fitRobust is fitSinusoid by iteratively reweighted least squares with
// Tukey's biweight (Beaton and Tukey 1974, Technometrics 16(2)): frames
// read off the cycle the others follow weigh less, those beyond
// robustTuning robust deviations nothing. FluidR3's violin sounds two
// groups of partials some 25 ¢ apart near a wide vibrato's turns, and the
// detector follows one or the other for a few frames by where the hop
// falls (stray.go): its B3 in C minor, a plain fit explaining under half
// the track's variance at seven phases of the hop in eight, read with no
// vibrato at those, 4.14 ¢ apart over the eight; fitted so at all eight,
// 1.67 ¢ (measured). Its m is then the centre, the weighted frames' own,
// so a part-cycle at either end does not pull it. Only a vibrato the plain
// fit misses is fitted so: as every vibrato's centre it put 20 of 105
// FluidR3 vibrato notes more than 1.5 ¢ from aubio's yin and yinfft on
// average over the phases, where the mean over whole cycles puts 13, and
// it found narrow ones (a flute's, a bassoon's waver) where none is
// (measured).
func fitRobust(t, c []float64, r float64) (a, b, m, explained float64) {
	f := sinusoidFit{t: t, r: r}
	f.basis()
	w := make([]float64, len(t))
	dev := make([]float64, len(t))
	for i := range w {
		w[i] = 1
	}
	for range 10 {
		a, b, m, explained = f.fit(c, w)
		for i := range c {
			co, sn := f.at(i)
			dev[i] = c[i] - (m + a*co + b*sn)
		}
		sigma := 1.4826 * medianAbsDev(dev)
		if sigma == 0 {
			break
		}
		for i, e := range dev {
			u := e / (robustTuning * sigma)
			w[i] = max(0, 1-u*u) * max(0, 1-u*u)
		}
	}
	return a, b, m, explained
}

// sinusoidFit is a sinusoid at rate r along a track's times t: cos and
// sin of 2πr(t−t[0]), worked out at each use, or once (basis) where a fit
// is repeated (fitRobust).
type sinusoidFit struct {
	t      []float64
	r      float64
	co, sn []float64
}

func (f *sinusoidFit) basis() {
	co, sn := make([]float64, len(f.t)), make([]float64, len(f.t))
	for i := range f.t {
		co[i], sn[i] = f.at(i)
	}
	f.co, f.sn = co, sn
}

func (f *sinusoidFit) at(i int) (co, sn float64) {
	if f.co != nil {
		return f.co[i], f.sn[i]
	}
	sn, co = math.Sincos(2 * math.Pi * f.r * (f.t[i] - f.t[0]))
	return co, sn
}

// fit solves c ≈ m + a·cos + b·sin by least squares, each point weighed
// by w (nil: alike), and returns the share of the weighted variance
// explained.
func (f *sinusoidFit) fit(c, w []float64) (a, b, m, explained float64) {
	weight := func(i int) float64 {
		if w == nil {
			return 1
		}
		return w[i]
	}
	// Normal equations for [m a b], 3×3, solved by Cramer's rule.
	var s1, sc, ss, scc, sss, ssc, y, yc, ys float64
	for i, ci := range c {
		wi := weight(i)
		co, sn := f.at(i)
		s1 += wi
		sc += wi * co
		ss += wi * sn
		scc += wi * co * co
		sss += wi * sn * sn
		ssc += wi * sn * co
		y += wi * ci
		yc += wi * ci * co
		ys += wi * ci * sn
	}
	det3 := func(a11, a12, a13, a21, a22, a23, a31, a32, a33 float64) float64 {
		return a11*(a22*a33-a23*a32) - a12*(a21*a33-a23*a31) + a13*(a21*a32-a22*a31)
	}
	D := det3(s1, sc, ss, sc, scc, ssc, ss, ssc, sss)
	if D == 0 {
		return 0, 0, 0, 0
	}
	m = det3(y, sc, ss, yc, scc, ssc, ys, ssc, sss) / D
	a = det3(s1, y, ss, sc, yc, ssc, ss, ys, sss) / D
	b = det3(s1, sc, y, sc, scc, yc, ss, ssc, ys) / D
	var res, tot float64
	mean := y / s1
	for i, ci := range c {
		co, sn := f.at(i)
		e := ci - (m + a*co + b*sn)
		res += weight(i) * e * e
		tot += weight(i) * (ci - mean) * (ci - mean)
	}
	return a, b, m, 1 - res/tot
}

// medianAbsDev is the median of |x − median(x)| (median's, the upper of
// two middles).
func medianAbsDev(x []float64) float64 {
	y := slices.Clone(x)
	med := median(y)
	for i, v := range x {
		y[i] = math.Abs(v - med)
	}
	return median(y)
}

// wholeCycleMean is the time average of the linearly interpolated track over
// the largest whole number of cycles at rate r, centred in the track.
func wholeCycleMean(t, c []float64, r float64) float64 {
	dur := t[len(t)-1] - t[0]
	span := math.Floor(dur*r) / r
	t0 := t[0] + (dur-span)/2
	return spanMean(t, c, t0, t0+span)
}

// spanMean is the time average of the linearly interpolated track over
// [t0, t1], which lies within it.
func spanMean(t, c []float64, t0, t1 float64) float64 {
	at := func(x float64) float64 { // linear interpolation
		i := 1
		for i < len(t)-1 && t[i] < x {
			i++
		}
		u := (x - t[i-1]) / (t[i] - t[i-1])
		return c[i-1] + u*(c[i]-c[i-1])
	}
	sum, prevT, prevC := 0.0, t0, at(t0)
	for i, ti := range t {
		if ti <= t0 {
			continue
		}
		if ti >= t1 {
			break
		}
		sum += 0.5 * (prevC + c[i]) * (ti - prevT)
		prevT, prevC = ti, c[i]
	}
	sum += 0.5 * (prevC + at(t1)) * (t1 - prevT)
	return sum / (t1 - t0)
}

// windowGain is the response at rate r of the detector's smoothing of the
// pitch track: the average of the instantaneous frequency weighted by the
// squared Blackman–Harris window over the analysis window (an
// approximation; the tests check the corrected width against the truth).
func windowGain(r, window float64) float64 {
	const n = 64
	var re, im, sum float64
	for i := range n {
		x := (float64(i) + 0.5) / n
		w := 0.35875 - 0.48829*math.Cos(2*math.Pi*x) + 0.14128*math.Cos(4*math.Pi*x) - 0.01168*math.Cos(6*math.Pi*x)
		w *= w
		s, co := math.Sincos(2 * math.Pi * r * (x - 0.5) * window)
		re += w * co
		im += w * s
		sum += w
	}
	return math.Hypot(re, im) / sum
}
