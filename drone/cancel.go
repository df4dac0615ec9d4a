package drone

import (
	"math"
	"math/cmplx"
	"slices"
	"sync/atomic"

	"fifthline/source"
)

// Canceller is a source.Source that removes known sinusoids (the drone's partials,
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
// to Memory (2 s by default). While the drone fades in or out the memory is
// held short and the fit renewed every 64 samples, so the fade is followed
// without lag. Only the player knows when it fades (Sounder.Fading): a
// guess from the fitted level would take a loud note's onset, leaking into
// the fit, for a fade, shorten the memory, and let the fit swallow the note. With memory τ the removal acts as a notch about 1/(2πτ) Hz
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
	src     source.Source
	rate    float64
	memory  float64 // samples, once settled
	age     float64 // samples since the set of partials last changed
	parts   []partial
	pending atomic.Pointer[[]float64]
	follow  Sounder
	current []float64
	fit     lsq
	quiet   int // samples still to be silenced while the first fit locks on
	read    int // samples read so far
	// Residual power (what is left for the detector), over about one chunk
	// and over about a quarter second: a sharp fall is a player's note
	// ending.
	fast, slow float64
}

// Sounder is what plays the drone, as the canceller follows it: the
// partials sounding now (hertz), and whether any is fading in or out.
type Sounder interface {
	Partials() []float64
	Fading() bool
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
	// chunk is the most samples between two solutions of the fit.
	chunk = 256
	// shortChunk is the chunk while the memory is below shortMemory samples
	// (in a fade): holding a fit for a whole chunk is a lag of its own.
	shortChunk  = 64
	shortMemory = 2048.0
	// noteEnded is the fall of the residual power, against its last
	// quarter second, that counts as a note ending (−10 dB); relockMemory
	// is the memory the fit restarts from then, and relockTime how long the
	// output stays silent meanwhile, in seconds.
	noteEnded    = 0.1
	relockMemory = 0.02
	relockTime   = 0.06
	// noteFloor is the residual power (−70 dBFS) below which there is no
	// note to end: the drone's own leftovers, a quiet room.
	noteFloor = 1e-7
	// streamRamp is how long the start of the input is followed as a fade,
	// in seconds.
	streamRamp = 0.6
	// lockTime is how long the output is silent at the start: the first
	// fits are rough, and their leftovers would be read as a note.
	lockTime = 0.15
)

// Cancel removes the partials (hertz) from src. Partials at or above 0.45
// of src's sample rate are ignored.
func Cancel(src source.Source, partials []float64) *Canceller {
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

// Follow makes the canceller ask s for the partials before each Read, and
// whether they fade, for a player whose drone changes. s is called on the
// reading goroutine.
func (c *Canceller) Follow(s Sounder) *Canceller {
	c.follow = s
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
	fading := false
	if c.follow != nil {
		if hz := c.follow.Partials(); !slices.Equal(hz, c.current) {
			c.apply(hz)
		}
		fading = c.follow.Fading()
	}
	// A new input stream is faded in by the sound server (PulseAudio ramps
	// it over about half a second): the drone's level moves as in a fade.
	fading = fading || c.read < int(streamRamp*c.rate)
	c.read += len(p)
	n, err := c.src.Read(p)
	for q := p[:n]; len(q) > 0; {
		k := min(len(q), chunk)
		if c.age/growth < shortMemory {
			k = min(k, shortChunk) // a short memory must be refitted often
		}
		if fading {
			// Keep the memory short while the level moves: the fit
			// follows the fade exactly, at the price of a wide notch
			// for the fade's fraction of a second.
			c.age = 0
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
	residual := 0.0
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
		residual += (x - y) * (x - y)
		if c.quiet > 0 {
			p[i], c.quiet = 0, c.quiet-1
		}
	}
	c.age += float64(len(p))
	c.watchResidual(residual/float64(len(p)), len(p))
	for k := range c.parts {
		t := &c.parts[k]
		t.ph /= complex(cmplx.Abs(t.ph), 0) // rounding would slowly change its length
	}
	c.fit.update(c.parts, lambda, len(p))
	c.fit.solve(c.parts, memory)
	if c.dropLeft(len(p)) {
		c.restart()
	}
}

// watchResidual relocks the fit quickly when a player's note ends. While a
// loud note sounds, a little of each of its partials leaks into the fit of
// any drone partial a few hertz away (about 1/(2π·Δf·memory) of it); the
// leak decays with the memory once the note stops, and meanwhile its
// leftovers at the drone's frequencies would be read as a note of their
// own. A short memory after the note cannot take a note that has ended for
// the drone, so the fit may follow the drone alone at once; while it
// relocks (relockTime) the output is silent, as at the start, so the tail of
// the leak is not read either. A note played straight after pays that in its
// first reading.
func (c *Canceller) watchResidual(e float64, n int) {
	c.fast += (e - c.fast) * 0.5
	c.slow += (e - c.slow) * float64(n) / (0.25 * c.rate)
	if c.fast < c.slow*noteEnded && c.slow > noteFloor {
		c.age = min(c.age, relockMemory*c.rate*growth)
		c.quiet = max(c.quiet, int(relockTime*c.rate))
	}
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
