package drone

import "math"

// MaxVoices is how many voices a Mixer sounds at once: a drone, a reference
// tone, and each of them fading out while its successor fades in.
const MaxVoices = 6

// Mixer sums voices and passes them through a Limiter. It belongs to the
// audio callback's goroutine and never allocates after NewMixer.
type Mixer struct {
	voices  [MaxVoices]*Voice
	scratch []float64
	lim     Limiter
}

// mixBlock is the longest stretch mixed at once; longer buffers are done in
// pieces, so the scratch space is fixed.
const mixBlock = 1024

// NewMixer makes a mixer whose output peak never exceeds ceiling (linear).
func NewMixer(rate, ceiling float64) *Mixer {
	return &Mixer{scratch: make([]float64, mixBlock), lim: NewLimiter(rate, ceiling)}
}

// Add starts a voice; with every place taken, the oldest voice is dropped
// (it is cut, not faded: give voices time to finish). It reports whether a
// voice had to be cut.
func (m *Mixer) Add(v *Voice) (cut bool) {
	for i, u := range m.voices {
		if u == nil {
			m.voices[i] = v
			return false
		}
	}
	copy(m.voices[:], m.voices[1:])
	m.voices[MaxVoices-1] = v
	return true
}

// ReleaseAll fades every voice out.
func (m *Mixer) ReleaseAll() {
	for _, v := range m.voices {
		if v != nil {
			v.Release()
		}
	}
}

// Silent reports whether no voice is sounding.
func (m *Mixer) Silent() bool {
	for _, v := range m.voices {
		if v != nil {
			return false
		}
	}
	return true
}

// Render writes the next frames into out, interleaved over channels with
// every channel the same, and drops the voices that have finished.
func (m *Mixer) Render(out []float32, channels int) {
	channels = max(channels, 1)
	for len(out) > 0 {
		n := min(len(out)/channels, len(m.scratch))
		if n == 0 {
			clear(out)
			return
		}
		buf := m.scratch[:n]
		clear(buf)
		for i, v := range m.voices {
			if v == nil {
				continue
			}
			v.AddTo(buf)
			if v.Done() {
				m.voices[i] = nil
			}
		}
		m.lim.Process(buf)
		for i, x := range buf {
			s := m.lim.clamp32(x)
			for c := range channels {
				out[i*channels+c] = s
			}
		}
		out = out[n*channels:]
	}
}

// Limiter is a peak limiter with instant attack and a slow release: when a
// sample would exceed the ceiling its gain drops at once to exactly what
// brings it to the ceiling, then recovers over about releaseTime. Without
// look-ahead it can bend the first peaks of an overload, but it guarantees
// |output| ≤ ceiling for any input, and the drone's own levels are set so
// that it never has to act.
type Limiter struct {
	ceiling   float64
	ceiling32 float32 // the largest float32 not above ceiling
	gain      float64
	recover   float64 // per-sample fraction of the way back to gain 1
}

const releaseTime = 0.3 // seconds

// NewLimiter limits to ceiling (linear, > 0).
func NewLimiter(rate, ceiling float64) Limiter {
	c32 := float32(ceiling)
	if float64(c32) > ceiling {
		c32 = math.Nextafter32(c32, 0)
	}
	return Limiter{ceiling: ceiling, ceiling32: c32, gain: 1, recover: 1 - math.Exp(-1/(releaseTime*rate))}
}

// Process limits buf in place.
func (l *Limiter) Process(buf []float64) {
	for i, x := range buf {
		l.gain += (1 - l.gain) * l.recover
		if a := math.Abs(x) * l.gain; a > l.ceiling {
			l.gain = l.ceiling / math.Abs(x)
		}
		buf[i] = x * l.gain
	}
}

// Gain is the limiter's present gain: 1 when it is not acting.
func (l *Limiter) Gain() float64 { return l.gain }

// clamp32 converts to float32 without rounding past the ceiling, and turns
// anything not a number into silence.
func (l *Limiter) clamp32(x float64) float32 {
	s := float32(x)
	switch {
	case s > l.ceiling32:
		return l.ceiling32
	case s < -l.ceiling32:
		return -l.ceiling32
	case s != s:
		return 0
	}
	return s
}
