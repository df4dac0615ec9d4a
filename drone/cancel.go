package drone

import (
	"math"
	"math/cmplx"
	"slices"
	"sync/atomic"
)

// Source is a mono stream of samples, the same shape as capture.Source, so
// any capture source can be wrapped and the wrapper can be read as one.
type Source interface {
	SampleRate() float64
	Read(p []float32) (n int, err error)
}

// Canceller is a Source that removes known sinusoids (the drone's partials,
// heard back through the microphone) from another Source, so that the pitch
// detector hears the player alone.
//
// Each partial is heterodyned: a unit phasor turning at its frequency,
// whose products with the input are summed with exponential forgetting,
// which is a least-squares fit of every partial's complex amplitude (its
// level and phase as the microphone hears it) to the recent input. All
// partials are fitted jointly, so close ones (a tempered fifth's 3rd and
// 2nd harmonics, 0.66 Hz apart at G3–D4) are told apart exactly; the fit is
// subtracted sample by sample (an adaptive sinusoid canceller, after
// Widrow et al., "Adaptive noise cancelling", Proc. IEEE 1975, from memory,
// solved by recursive least squares instead of LMS).
//
// The memory starts short, so the canceller locks on within a fraction of a
// second (it delivers the first 0.15 s as silence), and lengthens with age
// to Memory (2 s by default); while the drone's fitted level keeps moving
// one way (a fade in or out, an input stream's own start) the memory is
// held short and the fit renewed every 64 samples, so the fade is followed
// without lag. With memory τ the removal acts as a notch about 1/(2πτ) Hz
// wide on each side of each partial (0.08 Hz at 2 s): a player's note a few
// cents away from a drone partial, or moving through it, is left alone.
// What the player sounds within that notch and holds for longer than τ is
// taken for the drone and removed with it. So a player holding the drone's
// own pitch loses the partials that coincide with the drone's: against a
// pure drone the fundamental, and the note is still read from its upper
// partials; a pure sine on the drone's pitch is absorbed within about 2 s.
// Either way no wrong pitch is read, but when such a note stops the
// canceller must unlearn it, and for about a second the drone's own pitch
// is read (TestPlayerOnTheDronesOwnPitch). The meter can recognise that
// case from the partials: the player is on the drone.
//
// Read it from one goroutine; SetPartials may be called from any.
type Canceller struct {
	src     Source
	rate    float64
	memory  float64 // samples, once settled
	age     float64 // samples since the set of partials last changed
	parts   []partial
	pending atomic.Pointer[[]float64]
	follow  func() []float64
	current []float64
	fit     lsq
	quiet   int     // samples still to be silenced while the first fit locks on
	level   float64 // Σ|a|² at the last fit
	trend   float64 // its relative change per chunk, smoothed
}

// partial is one tracked sinusoid: it is Re(a·ph), ph the unit phasor.
type partial struct {
	hz, w   float64 // hertz, radians per sample
	rot, ph complex128
	a       complex128
	leaving int // samples left to follow a removed partial as it fades, or -1
}

// DefaultMemory is the canceller's time constant once settled, in seconds.
const DefaultMemory = 2.0

const (
	// growth: the memory is the time since the partials changed divided
	// by this, until it reaches Memory.
	growth = 6.0
	// minMemory bounds the memory below, in samples.
	minMemory = 64.0
	// leaveTime is how long a removed partial is still fitted (and so
	// removed) while the drone fades it out, in seconds.
	leaveTime = 1.5
	// fadeRate is the relative change of the drone's amplitude per second
	// above which it counts as fading: a 0.5 s raised-cosine fade changes
	// by up to π per second, and by more than 1 for most of its length.
	fadeRate = 1.0
	// trendWeight smooths the level's change over about eight chunks.
	trendWeight = 1.0 / 8
	// chunk is the most samples between two solutions of the fit.
	chunk = 256
	// shortChunk is the chunk while the memory is below shortMemory samples
	// (in a fade): holding a fit for a whole chunk is a lag of its own.
	shortChunk  = 64
	shortMemory = 2048.0
	// lockTime is how long the output is silent at the start: the first
	// fits are rough, and their leftovers would be read as a note.
	lockTime = 0.15
)

// Cancel removes the partials (hertz) from src. Partials at or above 0.45
// of src's sample rate are ignored.
func Cancel(src Source, partials []float64) *Canceller {
	c := &Canceller{src: src, rate: src.SampleRate(), memory: DefaultMemory * src.SampleRate()}
	c.quiet = int(lockTime * c.rate)
	c.apply(partials)
	return c
}

// SetMemory sets the settled time constant in seconds: longer spares more
// of a player's note near a drone partial, shorter follows a changing drone
// sooner.
func (c *Canceller) SetMemory(seconds float64) { c.memory = math.Max(seconds*c.rate, minMemory) }

// SetPartials replaces the partials to remove, from the next Read on.
// Partials kept from the old set keep their estimates; removed ones are
// still followed for a while, quickly, so a drone fading out is removed as
// it fades.
func (c *Canceller) SetPartials(hz []float64) {
	cp := slices.Clone(hz)
	c.pending.Store(&cp)
}

// Follow makes the canceller ask f for the partials before each Read (f
// runs on the reading goroutine); for a player whose drone changes.
func (c *Canceller) Follow(f func() []float64) *Canceller {
	c.follow = f
	return c
}

// Partials are the frequencies being removed now.
func (c *Canceller) Partials() []float64 { return slices.Clone(c.current) }

// SampleRate is the source's.
func (c *Canceller) SampleRate() float64 { return c.rate }

// Read reads from the source and removes the partials from what it got.
func (c *Canceller) Read(p []float32) (int, error) {
	if hz := c.pending.Swap(nil); hz != nil {
		c.apply(*hz)
	}
	if c.follow != nil {
		if hz := c.follow(); !slices.Equal(hz, c.current) {
			c.apply(hz)
		}
	}
	n, err := c.src.Read(p)
	for q := p[:n]; len(q) > 0; {
		k := min(len(q), chunk)
		if c.age/growth < shortMemory {
			k = min(k, shortChunk) // a short memory must be refitted often
		}
		c.process(q[:k])
		q = q[k:]
	}
	return n, err
}

// apply makes hz the set of partials: shared ones keep their estimates,
// new ones start from nothing, dropped ones are let go. The fit starts
// afresh with a short memory, its last solution as the prior.
func (c *Canceller) apply(hz []float64) {
	c.current = slices.Clone(hz)
	for i := range c.parts {
		t := &c.parts[i]
		if t.leaving < 0 && !slices.ContainsFunc(hz, func(f float64) bool { return sameHz(f, t.hz) }) {
			t.leaving = int(leaveTime * c.rate)
		}
	}
	for _, f := range hz {
		if f <= 0 || f >= maxPartialShare*c.rate {
			continue
		}
		if i := slices.IndexFunc(c.parts, func(t partial) bool { return sameHz(t.hz, f) }); i >= 0 {
			c.parts[i].leaving = -1
			continue
		}
		w := 2 * math.Pi * f / c.rate
		c.parts = append(c.parts, partial{hz: f, w: w, rot: cmplx.Rect(1, w), ph: 1, leaving: -1})
	}
	c.restart()
}

func (c *Canceller) restart() {
	c.age = 0
	c.fit.reset(len(c.parts))
}

// process cancels one chunk in place, then refits.
func (c *Canceller) process(p []float32) {
	if len(c.parts) == 0 {
		return
	}
	memory := math.Min(math.Max(c.age/growth, minMemory), c.memory)
	lambda := 1 - 1/memory
	for i, s := range p {
		x := float64(s)
		y := 0.0
		for k := range c.parts {
			t := &c.parts[k]
			y += real(t.a)*real(t.ph) - imag(t.a)*imag(t.ph)
			c.fit.r[k] = complex(lambda, 0)*c.fit.r[k] + complex(x, 0)*cmplx.Conj(t.ph)
			t.ph *= t.rot
		}
		p[i] = float32(x - y)
		if c.quiet > 0 {
			p[i], c.quiet = 0, c.quiet-1
		}
	}
	c.age += float64(len(p))
	for k := range c.parts {
		t := &c.parts[k]
		t.ph /= complex(cmplx.Abs(t.ph), 0) // rounding would slowly change its length
	}
	c.fit.update(c.parts, lambda, len(p))
	c.fit.solve(c.parts, memory)
	c.watchLevel(len(p))
	if c.dropLeft(len(p)) {
		c.restart()
	}
}

// watchLevel keeps the memory short while the drone's level is changing:
// in a fade (the drone's, or an input stream's own start) a long memory
// would lag behind and leave part of the drone in. A steady drone, with a
// player's note beside it, keeps its level and lets the memory grow.
func (c *Canceller) watchLevel(n int) {
	level := 0.0
	for _, t := range c.parts {
		level += real(t.a)*real(t.a) + imag(t.a)*imag(t.a)
	}
	// A fade moves the level the same way chunk after chunk; a player's
	// note leaking into the fit jostles it both ways, and is averaged out.
	change := (level - c.level) / math.Max(math.Max(level, c.level), 1e-30)
	c.trend += (change - c.trend) * trendWeight
	if math.Abs(c.trend) > 2*fadeRate*float64(n)/c.rate { // level is amplitude squared
		c.age = 0
	}
	c.level = level
}

// dropLeft forgets removed partials whose time is up and says if any went.
func (c *Canceller) dropLeft(n int) bool {
	kept := c.parts[:0]
	for _, t := range c.parts {
		if t.leaving >= 0 {
			if t.leaving -= n; t.leaving < 0 {
				continue
			}
		}
		kept = append(kept, t)
	}
	gone := len(kept) < len(c.parts)
	c.parts = kept
	return gone
}
