package ensemble

import "math"

// Cleaning each channel of the others as heard subtracts, with each
// neighbour, what that neighbour's microphone heard of everyone else: the
// channel's own sound again (some 34 dB down, late) and every third
// player's (some 37 dB down, at the wrong delay). Subtracting the
// neighbours' cleaned samples instead leaves none of it: c less
// Σ g·(d cleaned, delayed) is c's own sound when every d cleaned is d's
// own (the model of a gain and a delay per pair, bleed.go, solved for the
// players' own sounds rather than to first order). Measured on the
// rendered harder wind quartet, what remained of the others fell from
// 53–60 dB below full scale to 59–69 dB, and the rest before the
// clarinet's soft attack no longer read F4 and F3 from the chord before
// (nor a choir bass's dip, unvoiced alone, a pitch). It is a
// recursion sample by sample, causal because a delay spans at least two
// samples (a pair closer than that is cleaned of the channel as heard),
// and it converges while each channel's gains sum below maxUnmixGain (the
// mixing less the identity has an ∞-norm below 1).
const maxUnmixGain = 0.9

// cleanAll writes into dst[c] every channel's current block less what it
// hears of the others, each other channel taken as cleaned where the model
// allows it (see above), as heard otherwise.
func (m *bleedModel) cleanAll(h *history, dst [][]float32) {
	n := len(h.buf[0]) - h.keep
	for c := range h.out {
		h.out[c] = append(h.out[c][:h.keep], make([]float64, n)...)
	}
	m.terms = m.terms[:0]
	recursive := m.unmixable()
	for c := range m.k {
		for d := range m.k {
			if p := m.pair(c, d); d != c && p.gain > 0 && !(p.outOfPhase && m.periodAmbiguous(c, d)) {
				m.terms = append(m.terms, m.term(h, c, d, recursive))
			}
		}
	}
	for i := range n {
		t := m.terms
		for c := range m.k {
			s := h.buf[c][h.keep+i]
			for ; len(t) > 0 && t[0].c == c; t = t[1:] {
				if t[0].near {
					s -= t[0].gain * delayed(t[0].src, float64(h.keep+i)-t[0].delay)
					continue
				}
				x := t[0].src[i : i+4 : i+4]
				w := &t[0].w
				s -= t[0].gain * (x[0]*w[0] + x[1]*w[1] + x[2]*w[2] + x[3]*w[3])
			}
			h.out[c][h.keep+i] = s
			dst[c][i] = float32(s)
		}
	}
}

// unmixTerm is what channel c subtracts of channel d in a block: gain
// times the Lagrange interpolation w over src[i:i+4] for the block's
// sample i.
type unmixTerm struct {
	c           int
	gain, delay float64
	src         []float64
	w           lagrange
	near        bool // a delay under two samples: src whole, read by delayed
}

// term plans the pair (c, d)'s subtraction: d's samples at keep+i−delay,
// from the four around it (from keep−whole−2+i, or the one at keep−whole+i
// when the delay is whole). A delay under two samples would need samples
// of d not yet cleaned, so it takes d as heard.
func (m *bleedModel) term(h *history, c, d int, recursive bool) unmixTerm {
	p := m.pair(c, d)
	src := h.buf[d]
	if recursive && p.delay >= 2 {
		src = h.out[d]
	}
	whole := int(math.Floor(p.delay))
	switch {
	case p.delay < 2:
		// The four samples would reach past the block's end.
		return unmixTerm{c: c, gain: p.gain, delay: p.delay, src: src, near: true}
	case float64(whole) == p.delay:
		return unmixTerm{c: c, gain: p.gain, src: src[h.keep-whole-1:], w: lagrange{0, 1, 0, 0}}
	}
	return unmixTerm{c: c, gain: p.gain, src: src[h.keep-whole-2:], w: newLagrange(math.Ceil(p.delay) - p.delay)}
}

// unmixable tells whether every channel's gains sum below maxUnmixGain.
func (m *bleedModel) unmixable() bool {
	for c := range m.k {
		sum := 0.0
		for d := range m.k {
			if d != c {
				sum += m.pair(c, d).gain
			}
		}
		if sum >= maxUnmixGain {
			return false
		}
	}
	return true
}

// delayed is b at position t, interpolated for a fractional t by a cubic
// Lagrange polynomial through the samples around it; where those run past
// either end of b, the nearest sample.
func delayed(b []float64, t float64) float64 {
	i := int(math.Floor(t))
	f := t - float64(i)
	if f == 0 || i < 1 || i+2 >= len(b) {
		if i >= 0 && i < len(b) {
			return b[i]
		}
		return 0
	}
	w := newLagrange(f)
	return b[i-1]*w[0] + b[i]*w[1] + b[i+1]*w[2] + b[i+2]*w[3]
}
