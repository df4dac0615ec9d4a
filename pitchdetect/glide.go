package pitchdetect

import (
	"math"
	"slices"
)

// A note's attack may glide into its pitch: a trumpet's rises some 20 ¢ over
// its first 0.15 s, an oboe's falls 10 ¢. What the note settles on is what
// a musician hears as its pitch, so the glide is left out of the mean when
// the rest of the note is enough to read it.
const (
	glideCents = 3.0 // a smaller movement is no glide
	glideSlack = 0.3 // cents a glide may step back (the detector's jitter)
	glideRest  = 5   // frames the note needs after its glide (50 ms at the default hop)
)

// glide returns how many of the first frames of a steady-part track c
// (cents) are an attack's glide into the pitch the rest settles on: the
// earliest g such that c[g:] lies within a quarter of its distance (at
// least glideCents) from c[k], c[k:g+1] moves one way only, and the settled
// rest lasts at least half as long as the glide, and the note does not
// hold still on the way (glideRest frames within twice glideSlack). A
// vibrato moves both ways; a steady drift never settles within a quarter
// of its movement for that long; a note that holds a pitch and then moves
// on has already settled, and what it eases into at its end is no pitch
// it settled on after an attack (a quick flute C6 rising through its whole
// length had its last three frames so read, 8 ¢ from its median pitch).
// The glide may start after a wobble of up to wobble frames (k > 0), none
// of them within the range the settled rest spans: the frames of a slurred
// note's steady part begin sooner than those of a note after a rest, and
// the same attack must read the same either way. The wobble may lie on
// either side: a frame whose window holds the onset and a neighbour's
// bleed may read below an attack that then falls from above (FluidR3's
// tuba's G2, overshooting 29 ¢, read 7 ¢ flat on its first frame at some
// phases of the hop with bleed and not at all alone; measured). It returns
// 0 when there is no such glide.
func (s *Segmenter) glide(c []float64, wobble int) int {
	n := len(c)
	if n < glideRest+2 {
		return 0
	}
	s.lohi = slices.Grow(s.lohi[:0], 2*n)[:2*n]
	lo, hi := s.lohi[:n], s.lohi[n:] // of c[i:]
	lo[n-1], hi[n-1] = c[n-1], c[n-1]
	for i := n - 2; i >= 0; i-- {
		lo[i], hi[i] = min(c[i], lo[i+1]), max(c[i], hi[i+1])
	}
	for k := 0; k <= wobble && k < n; k++ {
		if g := glideFrom(c, k, lo, hi); g > 0 {
			return g
		}
	}
	return 0
}

// glideAfter is glide, for a steady part whose frames fr (the same as c's
// first) may begin with an attack's first frames parted from the rest by
// a dropout: where glide finds none, one may start after the last such
// dropout within the wobble. Frames before it are the onset's noise, not
// the note settled: FluidR3's voice oohs' D4, entering after A3, read
// 294.1 and 302.4 Hz over its consonant, then nothing for four frames, then
// fell from 300.6 Hz to the 293.6 Hz it held; with those two frames read
// (at one phase of the hop in eight), the first, lying in the held range,
// left the fall in the note, 1.1 ¢ sharp of the part read at the others
// (measured). Where neither finds a glide, an attack may still scoop or
// swing into the note (scoop.go). out is how much of the g frames a
// reading leaves out: a glide's all, a scoop's as scoop says.
func (s *Segmenter) glideAfter(fr []Estimate, c []float64, wobble int) (g int, out float64) {
	if g := s.glide(c, wobble); g > 0 {
		return g, 1
	}
	p := 0 // the first frame after the wobble's last dropout
	for b := min(wobble, len(fr)-1); b > 0 && p == 0; b-- {
		if fr[b].Time-fr[b-1].Time > 1.5*s.Hop {
			p = b
		}
	}
	if p == 0 {
		return s.scoop(fr, c)
	}
	if g := s.glide(c[p:], wobble-p); g > 0 {
		return p + g, 1
	}
	return s.scoop(fr, c)
}

// glideFrom is glide's test of a glide starting at c[k] after the wobble
// c[:k]; lo and hi are the extremes of c[i:].
func glideFrom(c []float64, k int, lo, hi []float64) int {
	n := len(c)
	up, down := true, true // c[k:g+1] only rises, only falls
	for g := k + 1; n-g >= max(glideRest, (g+1)/2); g++ {
		// Once the glide has reached the range the rest of the note spans,
		// the note's own wavering begins: its steps no longer count.
		if step := c[g] - c[g-1]; c[g-1] < lo[g] || c[g-1] > hi[g] {
			up, down = up && step >= -glideSlack, down && step <= glideSlack
		}
		if !up && !down {
			return 0
		}
		moved := (lo[g]+hi[g])/2 - c[k]
		if math.Abs(moved) >= glideCents && hi[g]-lo[g] <= math.Abs(moved)/4 &&
			(moved > 0 && up || moved < 0 && down) && unsettled(c[:k], lo[g], hi[g]) {
			return g
		}
		// Frame g is the glide's for any later end. Once the note has held
		// still for glideRest frames, what moves after is the note
		// drifting on, not an attack settling.
		if g+1-k >= glideRest && paused(c[g+1-glideRest:g+1]) {
			return 0
		}
	}
	return 0
}

// unsettled reports whether none of the frames w lies within lo..hi.
func unsettled(w []float64, lo, hi float64) bool {
	for _, x := range w {
		if x >= lo && x <= hi {
			return false
		}
	}
	return true
}

// paused reports whether the frames c stay within the detector's jitter
// either way of each other.
func paused(c []float64) bool {
	return slices.Max(c)-slices.Min(c) <= 2*glideSlack
}

// drifts reports whether the pitch of the frames fr moves one way only,
// by glideCents or more from the first, never stepping back more than
// glideSlack from the furthest it has reached: a glide, settled or not,
// and not a vibrato, which turns back.
func drifts(fr []Estimate) bool {
	if len(fr) < 2 {
		return false
	}
	var lo, hi float64 // cents from the first frame
	up, down := true, true
	for _, e := range fr[1:] {
		c := 1200 * math.Log2(e.Hz/fr[0].Hz)
		lo, hi = min(lo, c), max(hi, c)
		up, down = up && c >= hi-glideSlack, down && c <= lo+glideSlack
		if !up && !down {
			return false
		}
	}
	return up && hi >= glideCents || down && lo <= -glideCents
}

// slurredFrom is where the steady part of the note h (frames fr), slurred
// from the last, may begin: half a Window after the last note's last frame
// (see summarise), and for a note held turningSeconds or more, not at its
// own first frame, whose window still holds the slur: where the last
// note's release is lost (to a neighbour's bleed, or to the phase of the
// hop) that frame came in, a trumpet's scoop 25 ¢ flat. A quicker note
// keeps it, a good part of its sound (FluidR3's flute's 0.15 s legato run:
// one note fewer within 2 ¢ of its sound's median without it; measured).
// It tells too whether the note is turning: its frames turn back,
// and it is shorter than turningSeconds. A turning note
// holds part of a vibrato, and its pitch is the centre of what it holds: it
// is read from its first frame, and with a steady part by summarise's rule
// on to its last, with no glide left out (a trough there looks like a glide
// that settled). Setting half a Window aside at either end moved the
// centre further than the neighbours' tails in those frames pull it
// (FluidR3's violin sixteenths and eighths: 133 of 256 within 2 ¢ of their
// sound's median over the hop's eight phases, 162 so; the oboe's 202 and
// 227; measured).
func (s *Segmenter) slurredFrom(fr []Estimate, h Held) (lo float64, turning bool) {
	quick := h.End-h.Start < turningSeconds
	if quick && turns(fr) {
		return h.Start, true
	}
	if lo = s.from.last + s.Window/2; !quick {
		lo = max(lo, h.Start+s.Hop/2)
	}
	return lo, false
}

// turningSeconds: a note shorter than two cycles of a vibrato at its usual
// 5 Hz or more (bowed strings and singers vibrate at about 5–7 Hz: common
// practice, from memory) holds a part of a cycle it cannot be fitted on. A
// longer one under two cycles of the slowest vibrato (vibratoMinRate) may
// be an attack that overshoots and holds: FluidR3's tuba's 0.58 s G2,
// slurred from F2, 29 ¢ over and back, read as turning 2.9 ¢ from its
// reading at other phases of the hop in a four-player take (measured).
const turningSeconds = 0.4

// turnCents: frames that turn back this far either way hold a vibrato's
// crest or trough (FluidR3's violin swings ±12–25 ¢); no glide, and no
// jitter of the detector's, does.
const turnCents = 10.0

// turns reports whether the pitch of the frames fr rises at least
// turnCents to one of them and falls as far after it, or falls and rises.
func turns(fr []Estimate) bool {
	n := len(fr)
	if n < 3 {
		return false
	}
	c, lo, hi := make([]float64, n), make([]float64, n), make([]float64, n) // lo, hi: of c[i:]
	for i, e := range fr {
		c[i] = 1200 * math.Log2(e.Hz/fr[0].Hz)
	}
	lo[n-1], hi[n-1] = c[n-1], c[n-1]
	for i := n - 2; i >= 0; i-- {
		lo[i], hi[i] = min(c[i], lo[i+1]), max(c[i], hi[i+1])
	}
	before := [2]float64{c[0], c[0]} // the lowest and highest of c[:i]
	for i := 1; i+1 < n; i++ {
		if c[i]-before[0] >= turnCents && c[i]-lo[i+1] >= turnCents ||
			before[1]-c[i] >= turnCents && hi[i+1]-c[i] >= turnCents {
			return true
		}
		before = [2]float64{min(before[0], c[i]), max(before[1], c[i])}
	}
	return false
}
