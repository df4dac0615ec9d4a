package ensemble

import (
	"math"
	"math/cmplx"

	"fifthline/internal/rfft"
)

// Bleed estimation: what channel c hears of player d is modelled as d's own
// channel, scaled and delayed (a close microphone a metre or two from a
// neighbour: a gain and a few milliseconds). At the partials of d's pitch
// that lie clear of c's own partials, c's spectrum is that gain and delay
// times d's, so the cross-spectrum X_c·conj(X_d) accumulated there, turned
// back into a correlation over lags, peaks at the delay (the generalized
// cross-correlation of Knapp & Carter, IEEE TASSP 1976), and its height
// over the power of d gives the gain. Leaving out the bins near c's own
// partials keeps c's own signal, which d's microphone hears too, from
// passing for bleed.
const (
	maxBleedMs        = 12.0  // farther apart than ~4 m is not a close-microphone neighbour
	maxBleedGain      = 0.5   // −6 dB: louder than that is not bleed but a shared microphone
	minBleedGain      = 0.01  // −40 dB: quieter moves no reading, and its delay is noise
	bleedMemory       = 0.999 // per frame: evidence halves in about 700 frames (7 s at the default hop)
	clearBins         = 2     // and none of c's partials within this many bins
	bleedDominates    = 0.1   // a bin −10 dB or more below d's is d's bleed on c
	ownOverBleed      = 4     // or, once learned, up to 6 dB above the bleed
	bleedEvery        = 4     // hops between re-estimates while learning,
	bleedSettle       = 200   // the first 200 hops (about 2 s),
	bleedEverySettled = 32    // and then: the microphones do not move much
	minBleedFrames    = 4     // frames of evidence before subtracting
	minCoherence      = 0.6   // |Σ A·e^{iωτ}| / Σ |A|: the evidence agrees on one delay
	bleedHarmonics    = 48    // partials of d used, up to maxBleedHz: the wider the band, the sharper the delay
	maxBleedHz        = 8000.0
	historyPad        = 8     // samples kept beyond the longest delay
	minBleedPower     = 1e-12 // below this d's partials are too quiet to measure
	thirdUnder        = 0.01  // a third player's partial 20 dB under d's moves d's evidence little
)

// Bleed is what each player's microphone hears of the others, learned
// while listening. Run starts one of its own unless given one: pass the
// same Bleed to a second Run over the same recording to read it with what
// the whole recording taught, from its first note on.
type Bleed struct{ m *bleedModel }

// model is b's estimate for windows of n samples and k players, started
// afresh when b is nil or was learned for another shape.
func (b *Bleed) model(n, k int) *bleedModel {
	if b == nil {
		return newBleedModel(n, k)
	}
	if b.m == nil || b.m.n != n || b.m.k != k {
		b.m = newBleedModel(n, k)
	}
	return b.m
}

// pairBleed is what channel c hears of channel d.
type pairBleed struct {
	a      []complex128 // accumulated X_c·conj(X_d) at d's clear partials
	b      float64      // accumulated |X_d|² there
	frames int
	fresh  bool    // evidence added since the last estimate
	gain   float64 // 0 until estimated
	delay  float64 // samples

	weighed bool // estimated at least once, whatever the gain

	pitch float64 // d's first pitch the evidence was gathered at, Hz (period.go)
	ties  int     // how many near-tie lags the last estimate chose among
	// outOfPhase: at d's pitch now, unrelated to the evidence's first pitch,
	// subtracting would make c louder (period.go)
	outOfPhase bool
}

// bleedModel holds every ordered pair's estimate and the plan for turning
// accumulated cross-spectra into correlations.
type bleedModel struct {
	n, k  int // window length, channels
	pairs []pairBleed
	ifft  *rfft.FFT
	corr  []float64
	spec  []complex128
	hops  int
	peaks [2][]lagPeak // the two directions' candidate delays, reused
	terms []unmixTerm  // cleanAll's plan for the block, reused

	sounding []float64 // each player's pitch at the last evidence frame (0: none)
}

func newBleedModel(n, channels int) *bleedModel {
	m := &bleedModel{n: n, k: channels, pairs: make([]pairBleed, channels*channels),
		ifft: rfft.New(n), corr: make([]float64, n), spec: make([]complex128, n/2+1),
		sounding: make([]float64, channels)}
	for i := range m.pairs {
		m.pairs[i].a = make([]complex128, n/2+1)
	}
	return m
}

func (m *bleedModel) pair(c, d int) *pairBleed { return &m.pairs[c*m.k+d] }

// weighed tells whether what channel c hears of d has been estimated:
// a gain learned (and so subtracted), or none found in the evidence (on
// microphones that hear nothing of each other, a take mixed without
// bleed, there is none to find).
func (m *bleedModel) weighed(c, d int) bool { return m.pair(c, d).weighed }

// observe adds one frame's evidence: f.hz[d] is player d's pitch this
// frame (0 when unvoiced or bleed), f.steady[d] whether d has held it (or
// silence) for a whole window, o the frame's spectra. At d's partials, a
// bin of c where c's own sound dominates is louder on c than on d (d hears
// c 15–25 dB down); a bin where d's bleed dominates is far quieter on c
// than on d. Only the latter are weighed (once a gain is learned, no more
// than 6 dB above it), none near a partial of c's own pitch (where the two
// beat slowly and would not average out) or of a third player's audible
// there (othersAudible), and only
// while c is steady and its own sound known: its pitch read, or silent. So
// c's own partials, attacks and releases do not pass for bleed: a choir's
// soprano A4 heard on the bass's channel read 17 samples late while the
// bass's soft F2, unread, sounded its fifth harmonic under her.
func (m *bleedModel) observe(o *Owner, f *frameReadings) {
	hz, steady := f.hz, f.steady
	copy(m.sounding, hz)
	binHz := o.fs / float64(m.n)
	for d, pd := range hz {
		if pd == 0 || !steady[d] || !o.have[d] {
			continue
		}
		for c := range hz {
			if c != d && o.have[c] {
				m.judgePhase(o, f, c, d)
			}
			own, unread := f.own(c)
			if c == d || !o.have[c] || !steady[c] || unread && f.level[c] > f.level[d]-quietDB {
				continue
			}
			p := m.pair(c, d)
			used := false
			// A bin much louder on c than the bleed learned so far holds
			// c's own sound (a partial of a soft note not yet read).
			dominates := bleedDominates
			if p.gain > 0 {
				dominates = min(dominates, ownOverBleed*p.gain*p.gain)
			}
			for h := 1; h <= bleedHarmonics; h++ {
				bin := int(math.Round(float64(h) * pd / binHz))
				if bin+1 >= len(p.a) || float64(h)*pd > maxBleedHz {
					break
				}
				if at := float64(bin) * binHz; nearPartial(at, own, clearBins*binHz) || o.othersAudible(at, bin, hz, c, d, clearBins*binHz) {
					continue
				}
				for b := bin - 1; b <= bin+1; b++ {
					xc, xd := o.spec[c][b], o.spec[d][b]
					pc, pd := power(xc), power(xd)
					if pd < minBleedPower || pc > dominates*pd {
						continue
					}
					p.a[b] += xc * cmplx.Conj(xd)
					p.b += pd
					used = true
				}
			}
			if used {
				p.frames++
				p.fresh = true
				p.heardAt(pd)
			}
		}
	}
	// Old evidence fades over a few seconds: one steady pitch's partials
	// fit delays a period apart as well as the true one, so the estimate
	// must follow the pitches sounding now rather than those of a minute ago.
	for i := range m.pairs {
		p := &m.pairs[i]
		if p.b > 0 {
			for b := range p.a {
				p.a[b] *= bleedMemory
			}
			p.b *= bleedMemory
		}
	}
	every := bleedEvery
	if m.hops > bleedSettle {
		every = bleedEverySettled
	}
	if m.hops++; m.hops%every == 0 {
		m.estimate(o.fs)
	}
}

// othersAudible tells whether f lies within tol of a partial of a third
// player's pitch that sounds there on its own channel no more than
// 20 dB (thirdUnder) below d's: a third player's partial far quieter than d's
// moves the evidence by little, however its bleed is delayed, and a
// consonant chord puts nearly every partial of an upper voice on some
// partial of a lower one (a trumpet's B♭4 on the tuba's B♭2's fourth), so
// leaving all of those out leaves one pitch's evidence, whose delays a
// period apart cannot be told apart.
func (o *Owner) othersAudible(f float64, bin int, hz []float64, c, d int, tol float64) bool {
	for e, p := range hz {
		if e == c || e == d || !nearPartial(f, p, tol) {
			continue
		}
		pd, pe := 0.0, 0.0
		for b := bin - 1; b <= bin+1; b++ {
			pd += power(o.spec[d][b])
			pe += power(o.spec[e][b])
		}
		if pe > thirdUnder*pd {
			return true
		}
	}
	return false
}

// nearPartial tells whether f lies within tol of a partial of pitch hz.
func nearPartial(f, hz, tol float64) bool {
	if hz == 0 {
		return false
	}
	k := math.Round(f / hz)
	return k >= 1 && math.Abs(f-k*hz) < tol
}

func power(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }

// history keeps each channel's recent raw samples, so a block can be
// cleaned of the others' bleed at their delays, and the cleaned samples
// (unmix.go).
type history struct {
	keep int         // samples kept before the current block
	buf  [][]float64 // per channel: keep samples, then the current block
	out  [][]float64 // per channel: the same, cleaned
}

func newHistory(channels int, fs float64) *history {
	keep := int(maxBleedMs/1000*fs) + historyPad
	h := &history{keep: keep, buf: make([][]float64, channels), out: make([][]float64, channels)}
	for c := range h.buf {
		h.buf[c], h.out[c] = make([]float64, keep), make([]float64, keep)
	}
	return h
}

// push appends each block after its channel's kept samples.
func (h *history) push(blocks [][]float32) {
	for c := range h.buf {
		b := h.buf[c][:h.keep]
		for _, s := range blocks[c] {
			b = append(b, float64(s))
		}
		h.buf[c] = b
	}
}

// shift keeps the last keep samples for the next block.
func (h *history) shift() {
	for _, bufs := range [][][]float64{h.buf, h.out} {
		for c, b := range bufs {
			copy(b, b[len(b)-h.keep:])
			bufs[c] = b[:h.keep]
		}
	}
}

// lagrange is the cubic Lagrange interpolator through four samples at -1,
// 0, 1, 2 evaluated at f in [0, 1): its weights, which depend on the
// fraction alone, so one delay's weights serve a whole block.
type lagrange [4]float64

func newLagrange(f float64) lagrange {
	return lagrange{-f * (f - 1) * (f - 2) / 6, (f + 1) * (f - 1) * (f - 2) / 2, -(f + 1) * f * (f - 2) / 2, (f + 1) * f * (f - 1) / 6}
}
