package drone

import "math"

// Voice renders a set of partials as one sound with a raised-cosine fade in
// and, once released, a raised-cosine fade out. Each partial keeps its phase
// from block to block, so the output does not depend on how it is cut into
// blocks. A Voice belongs to one goroutine (the audio callback); it never
// allocates after NewVoice.
type Voice struct {
	osc []oscillator
	env envelope
}

type oscillator struct {
	amp   float64
	inc   float64 // cycles per sample
	phase float64 // cycles, in [0, 1)
}

// NewVoice prepares the partials at the sample rate. fadeIn and fadeOut are
// in samples; hold > 0 releases the voice by itself after that many samples
// (counted from the start of the fade in), 0 holds it until Release.
func NewVoice(rate float64, ps []Partial, fadeIn, fadeOut, hold int) *Voice {
	v := &Voice{osc: make([]oscillator, len(ps))}
	for i, p := range ps {
		v.osc[i] = oscillator{amp: p.Amp, inc: p.Hz / rate}
	}
	v.env = envelope{attack: max(fadeIn, 1), release: max(fadeOut, 1), hold: hold}
	return v
}

// AddTo adds the voice's next len(buf) samples to buf.
func (v *Voice) AddTo(buf []float64) {
	for i := range buf {
		if g := v.env.next(); g != 0 {
			s := 0.0
			for k := range v.osc {
				o := &v.osc[k]
				s += o.amp * math.Sin(2*math.Pi*o.phase)
			}
			buf[i] += g * s
		}
		v.advance() // even in silence, so that time runs on evenly
	}
}

func (v *Voice) advance() {
	for k := range v.osc {
		o := &v.osc[k]
		if o.phase += o.inc; o.phase >= 1 {
			o.phase -= math.Floor(o.phase)
		}
	}
}

// Release starts the fade out from wherever the fade in has got to.
func (v *Voice) Release() { v.env.releaseNow() }

// Done reports whether the fade out has finished: the voice is silent for good.
func (v *Voice) Done() bool { return v.env.stage == done }

// Envelope stages.
const (
	attack = iota
	sustain
	release
	done
)

// envelope is a raised-cosine rise from 0 to 1 over attack samples, then 1,
// then, once released, a raised-cosine fall from the level it had reached
// to 0 over release samples. Raised-cosine ramps start and end with zero
// slope, which is what keeps a fade free of clicks.
type envelope struct {
	attack, release, hold int
	stage                 int
	n                     int     // samples into the current stage
	age                   int     // samples since the start
	from                  float64 // level at which the release began
}

// next is the gain for the next sample.
func (e *envelope) next() float64 {
	if e.hold > 0 && e.age == e.hold && e.stage < release {
		e.releaseNow()
	}
	e.age++
	switch e.stage {
	case attack:
		g := rampUp(e.n, e.attack)
		if e.n++; e.n >= e.attack {
			e.stage, e.n = sustain, 0
		}
		return g
	case sustain:
		return 1
	case release:
		g := e.from * (1 - rampUp(e.n, e.release))
		if e.n++; e.n >= e.release {
			e.stage, e.n = done, 0
		}
		return g
	}
	return 0
}

func (e *envelope) releaseNow() {
	switch e.stage {
	case attack:
		e.from = rampUp(e.n, e.attack)
	case sustain:
		e.from = 1
	default:
		return
	}
	e.stage, e.n = release, 0
}

// rampUp is the raised cosine ½ − ½·cos(π·n/len): 0 at n = 0, 1 at n = len.
func rampUp(n, length int) float64 {
	return 0.5 - 0.5*math.Cos(math.Pi*float64(n)/float64(length))
}
