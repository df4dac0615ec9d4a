package ensemble

import (
	"math"
	"math/cmplx"
)

// Which lag of a pair's correlation is the delay. The evidence sits at the
// partials of the other player's pitches, and one pitch's partials fit
// delays a whole period apart equally well: a flute's B5 heard on the
// bassoon's channel fits 5.6 ms and every 1.02 ms from it. Notes at other
// pitches tell them apart, but a take may give few. The two directions
// of a pair of microphones settle it: sound crosses the same distance
// between two players either way, less each close microphone's short
// distance to its own player, so channel c hears d about as late as d
// hears c (common practice of close miking: a metre or two between
// players, a few tenths of one between a player and their microphone).
// The direction heard at lower pitches (the bassoon's, whose period is
// longer than any delay) has one peak, and the other direction takes the
// near-tie nearest to it.

// nearTie is how high, against a correlation's highest peak, another peak
// may stand and still be the delay: one pitch's partials give peaks a
// period apart within a few per cent of each other (measured on FluidR3
// takes: 0.96–1.00), and a second pitch brings the wrong ones well
// below. Only such a near-tie is settled by the other direction: where the
// two directions' delays differ by more than reciprocalMs (takes mixed
// with every pair's delay drawn on its own), a peak standing 0.8–0.95 of
// the highest, nearer the other direction's delay, was taken over the
// highest, the true delay (the brass take's trumpet on the tuba's
// channel, heard 1.2 ms late, taken 5.8 ms late).
const nearTie = 0.95

// reciprocalMs is how far apart the two directions' delays may lie: the
// difference of the two players' distances to their own microphones, a
// few tenths of a metre (common practice of close miking), at the speed
// of sound, 343 m/s (handbook value).
const reciprocalMs = 1.0

// lagPeak is a candidate delay, in samples, and its correlation.
type lagPeak struct{ lag, height float64 }

// estimate turns each pair's evidence into a gain and delay, the two
// directions of each pair of microphones together.
func (m *bleedModel) estimate(fs float64) {
	maxLag := min(int(maxBleedMs/1000*fs), m.n/2-2)
	for c := range m.k {
		for d := c + 1; d < m.k; d++ {
			p, q := m.pair(c, d), m.pair(d, c)
			// Evidence that only faded since the last estimate gives the
			// same gain and delay (numerator and denominator fade alike).
			if !p.fresh && !q.fresh {
				continue
			}
			m.peaks[0] = m.candidates(m.peaks[0][:0], p, maxLag)
			m.peaks[1] = m.candidates(m.peaks[1][:0], q, maxLag)
			i, j := reciprocal(m.peaks[0], m.peaks[1], reciprocalMs/1000*fs)
			if i >= 0 {
				m.settle(p, m.peaks[0][i].lag)
				p.ties = len(m.peaks[0])
			}
			if j >= 0 {
				m.settle(q, m.peaks[1][j].lag)
				q.ties = len(m.peaks[1])
			}

		}
	}
}

// candidates appends the peaks of p's correlation over lags 0 … maxLag
// that stand within nearTie of its highest, each placed between whole
// lags by a parabola through it and its neighbours; none when p has too
// little evidence.
func (m *bleedModel) candidates(dst []lagPeak, p *pairBleed, maxLag int) []lagPeak {
	if p.frames < minBleedFrames || p.b < minBleedPower {
		return dst
	}
	// corr[τ] = Σ_b w_b·a_b·e^{+iω_bτ}: the inverse transform of a, each
	// bin weighed by 1/√|a_b| (between the plain cross-correlation and
	// its phase transform, Knapp & Carter 1976), so that the many weak
	// upper partials, where delays a period apart part, count beside the
	// few strong low ones, where they do not; wholly whitened, the bins at
	// a partial's skirts count as much as its centre and a tuba's delay
	// split in two peaks 0.3 ms apart (measured, the brass take).
	for b, a := range p.a {
		m.spec[b] = 0
		if r := cmplx.Abs(a); r > 0 {
			m.spec[b] = a / complex(math.Sqrt(r), 0)
		}
	}
	m.ifft.Sequence(m.corr, m.spec)
	corr := m.corr
	top := corr[0]
	for lag := 1; lag <= maxLag; lag++ {
		top = math.Max(top, corr[lag])
	}
	if !(top > 0) {
		return dst
	}
	for lag := 0; lag <= maxLag; lag++ {
		c := corr[lag]
		if c < nearTie*top || lag > 0 && c < corr[lag-1] || c < corr[lag+1] {
			continue // not a peak, or too low
		}
		frac := 0.0
		if lag > 0 {
			l, r := corr[lag-1], corr[lag+1]
			if den := l - 2*c + r; den < 0 {
				frac = 0.5 * (l - r) / den // within ±½: c is the highest of the three
			}
		}
		dst = append(dst, lagPeak{float64(lag) + frac, c / top})
	}
	return dst
}

// reciprocal chooses one candidate of each direction (an index, −1 for a
// direction without any): of the pairs of candidates within reciprocalLag
// of each other, the highest together, less a little for the distance
// between them (so that of two equally high, the nearer wins); with no
// such pair, or one direction without candidates, each direction's
// highest.
func reciprocal(a, b []lagPeak, reciprocalLag float64) (i, j int) {
	i, j = highest(a), highest(b)
	if i < 0 || j < 0 {
		return i, j
	}
	best := math.Inf(-1)
	for x, pa := range a {
		for y, pb := range b {
			gap := math.Abs(pa.lag - pb.lag)
			if gap > reciprocalLag {
				continue
			}
			if s := pa.height + pb.height - (1-nearTie)*gap/reciprocalLag; s > best {
				best, i, j = s, x, y
			}
		}
	}
	return i, j
}

func highest(peaks []lagPeak) int {
	best := -1
	for k, p := range peaks {
		if best < 0 || p.height > peaks[best].height {
			best = k
		}
	}
	return best
}

// settle sets p's delay from a candidate lag, polished, and its gain from
// the evidence at that delay; a delay the evidence does not agree on
// (incoherent, or a gain no bleed has) leaves p without bleed.
func (m *bleedModel) settle(p *pairBleed, lag float64) {
	p.fresh, p.weighed = false, true
	delay := refineDelay(p.a, m.n, lag)
	var sum complex128
	mag := 0.0
	for b, a := range p.a {
		if a == 0 {
			continue // no evidence at this bin: adds nothing
		}
		w := 2 * math.Pi * float64(b) / float64(m.n)
		sum += a * cmplx.Rect(1, w*delay)
		mag += cmplx.Abs(a)
	}
	gain := real(sum) / p.b
	if mag == 0 || cmplx.Abs(sum)/mag < minCoherence || gain < minBleedGain || gain > maxBleedGain {
		p.gain = 0
		return
	}
	p.gain, p.delay = gain, delay
}

// refineDelay polishes the delay between whole lags by Newton's method on
// the correlation's real part, Re Σ a_b·e^{iω_bτ}, which peaks at the
// delay: the parabola through three lags is biased when the evidence
// sits on a few partials.
func refineDelay(a []complex128, n int, tau float64) float64 {
	start := tau
	for range 6 {
		var d1, d2 float64
		for b, x := range a {
			if x == 0 {
				continue
			}
			w := 2 * math.Pi * float64(b) / float64(n)
			z := x * cmplx.Rect(1, w*tau)
			d1 -= w * imag(z)
			d2 -= w * w * real(z)
		}
		if d2 >= 0 {
			return start // not at a maximum: keep the lag found
		}
		tau -= d1 / d2
	}
	if math.Abs(tau-start) > 1 {
		return start
	}
	return tau
}
