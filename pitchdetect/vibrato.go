package pitchdetect

// Vibrato: a least-squares sinusoid fit to the steady part's pitch track in
// cents. The rate is the peak of the track's periodogram over 3–9 Hz (the
// range of sung and bowed vibrato, common practice); the centre is the mean
// of the track over the largest whole number of cycles, so a part-cycle at
// either end does not pull it; the width is the fitted peak-to-peak swing,
// corrected for the smoothing of the detector's analysis window.

import "math"

const (
	vibratoMinRate  = 3.0
	vibratoMaxRate  = 9.0
	vibratoCoarse   = 0.25 // Hz steps of the first periodogram scan
	vibratoStep     = 0.02 // and of the second
	vibratoMinWidth = 3.0  // cents peak to peak; smaller swings count as steady
	vibratoMinFit   = 0.5  // share of the track's variance the sinusoid explains
	vibratoMinCycle = 2.0  // whole cycles needed
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
	if width < vibratoMinWidth || fit < vibratoMinFit {
		return vibrato{}
	}
	return vibrato{rate: best, width: width, centre: wholeCycleMean(t, c, best), ok: true}
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
	// Normal equations for [m a b], 3×3, solved by Cramer's rule.
	var s1, sc, ss, scc, sss, ssc, y, yc, ys float64
	for i, ti := range t {
		sn, co := math.Sincos(2 * math.Pi * r * (ti - t[0]))
		s1++
		sc += co
		ss += sn
		scc += co * co
		sss += sn * sn
		ssc += sn * co
		y += c[i]
		yc += c[i] * co
		ys += c[i] * sn
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
	mean, _ := meanStd(c)
	for i, ti := range t {
		sn, co := math.Sincos(2 * math.Pi * r * (ti - t[0]))
		e := c[i] - (m + a*co + b*sn)
		res += e * e
		tot += (c[i] - mean) * (c[i] - mean)
	}
	return a, b, m, 1 - res/tot
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
