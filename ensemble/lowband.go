package ensemble

import (
	"math"

	"fifthline/pitchdetect"
)

// A player entering below the others, under their bleed before it is
// weighed: nothing of the neighbours is subtracted yet, and their partials
// lie near the player's own harmonics (a choir's bass entering on F2 under
// an F major chord still settling: the tenor's C4 40 ¢ above the bass's
// third harmonic, the alto's F4 and the soprano's A4 20 ¢ above its fourth
// and fifth). The channel then repeats at the chord's period, not the
// player's, and the detector reads no pitch until the chord settles on the
// player's harmonics: measured on a rendered choir (FluidR3 voice oohs),
// the bass's first 0.2 s, which the part alone reads, so its note read
// 1.9 ¢ from the part alone. (A detector that does voice such a frame
// reads it at the chord's period: 20–40 ¢ off, measured on the test's
// synthetic choir.) Below the lowest neighbour's pitch no neighbour has a
// partial, so there the channel holds the player's own sound only: at an
// entry under unweighed bleed, whatever the detector heard, the band is
// read, and its pitch stands where it has one (the channel low-passed
// below the lowest neighbour; the same bass then read 0.25 ¢ from alone).
// Whose that pitch is, only the harmonics in the band can tell
// (Owner.weighedSkip).

// Butterworth low-pass of order lowOrder (in biquads, the Audio EQ
// Cookbook's, R. Bristow-Johnson, with the Butterworth poles' Q: common
// practice), its cutoff lowBelow under the lowest neighbour's pitch: 12
// poles are 42 dB down there, so a neighbour's bleed, 15–25 dB under their
// own level, comes through some 60 dB under it.
const (
	lowOrder = 12
	lowBelow = 1.5
)

// lowBand reads a player's channel below the neighbours' partials.
type lowBand struct {
	ring []float64 // the channel as cleaned: a pre-roll for the filter, then the detector's span
	w    int       // next write position in ring
	pre  int       // pre-roll samples
	lin  []float64
	x32  []float32
	det  *pitchdetect.Detector
	est  []pitchdetect.Estimate
}

// newLowBand plans the band's reading with a detector like det: its span,
// after a pre-roll of a window in which the filter settles.
func newLowBand(det *pitchdetect.Detector) (*lowBand, error) {
	d, err := pitchdetect.New(det.SampleRate(), det.Window(), det.Hop())
	if err != nil {
		return nil, err
	}
	d.NoReread()
	n := det.Window() + d.Span()
	return &lowBand{ring: make([]float64, n), pre: det.Window(), lin: make([]float64, n),
		x32: make([]float32, d.Span()), det: d}, nil
}

// add appends the channel's latest cleaned samples.
func (l *lowBand) add(block []float32) {
	for _, s := range block {
		l.ring[l.w] = float64(s)
		if l.w++; l.w == len(l.ring) {
			l.w = 0
		}
	}
}

// read is the detector's estimate of the span that ends with the latest
// sample, low-passed at cutoff Hz; ok is false when it reads no pitch
// below the cutoff.
func (l *lowBand) read(cutoff float64) (e pitchdetect.Estimate, ok bool) {
	x := l.lin
	n := copy(x, l.ring[l.w:])
	copy(x[n:], l.ring[:l.w])
	// The filter starts at rest: a half-Hann fade over the pre-roll keeps
	// its start from ringing into the span.
	for i := range l.pre {
		x[i] *= 0.5 - 0.5*math.Cos(math.Pi*float64(i)/float64(l.pre))
	}
	lowPass(x, cutoff/l.det.SampleRate())
	for i, v := range x[l.pre:] {
		l.x32[i] = float32(v)
	}
	l.det.Reset()
	l.est = l.det.Feed(l.x32, l.est[:0])
	if len(l.est) != 1 || !l.est[0].Voiced || l.est[0].Hz >= cutoff {
		return e, false
	}
	return l.est[0], true
}

// lowPass filters x in place, from rest, below f cycles per sample: the
// Butterworth poles of order lowOrder in pairs, each pair a section whose
// Q is 1/(2·sin((2k−1)π/(2·lowOrder))).
func lowPass(x []float64, f float64) {
	for k := 1; k <= lowOrder/2; k++ {
		newLowPass(f, 1/(2*math.Sin(float64(2*k-1)*math.Pi/(2*lowOrder)))).filter(x)
	}
}

// biquad is one second-order section, b and a normalised by a0.
type biquad struct{ b0, b1, b2, a1, a2 float64 }

// newLowPass is the cookbook's low-pass at f cycles per sample with
// quality q.
func newLowPass(f, q float64) biquad {
	w := 2 * math.Pi * f
	cos, alpha := math.Cos(w), math.Sin(w)/(2*q)
	a0 := 1 + alpha
	return biquad{b0: (1 - cos) / 2 / a0, b1: (1 - cos) / a0, b2: (1 - cos) / 2 / a0, a1: -2 * cos / a0, a2: (1 - alpha) / a0}
}

// filter runs the section over x in place, from rest (transposed direct
// form II).
func (s biquad) filter(x []float64) {
	var z1, z2 float64
	for i, v := range x {
		y := s.b0*v + z1
		z1 = s.b1*v - s.a1*y + z2
		z2 = s.b2*v - s.a2*y
		x[i] = y
	}
}

// lowCutoff is where player i's band ends this frame: lowBelow under the
// lowest pitch a neighbour read within the last window (recent), when at
// least one such neighbour's bleed on i is not weighed yet; 0 otherwise.
func lowCutoff(i int, recent []float64, unweighed func(d int) bool) float64 {
	lowest, any := math.Inf(1), false
	for d, p := range recent {
		if d == i || !(p > 0) {
			continue
		}
		lowest = math.Min(lowest, p)
		any = any || unweighed(d)
	}
	if !any {
		return 0
	}
	return lowest / lowBelow
}

// entry is the player's frame e as read, or, as the player enters (within
// attackFrames of a frame that was silent or another's, or after a frame
// read from the band itself) with a neighbour's bleed not weighed yet
// (recent: the pitches heard within a window, by player), the band's
// reading and its cutoff (0: e as read). A frame the detector left
// unvoiced is read from the band only where the channel has sound of the
// player's own (levels, by player: no more than quietDB under the loudest
// neighbour's); one it voiced may be the chord's period (see above), and
// any pitch below the neighbours is the player's.
func (v *voice) entry(e pitchdetect.Estimate, i int, levels, recent []float64, unweighed func(d int) bool) (pitchdetect.Estimate, float64) {
	if v.run >= attackFrames && !v.lowRead || !e.Voiced && !ownSound(i, levels) {
		return e, 0
	}
	cut := lowCutoff(i, recent, unweighed)
	if cut == 0 {
		return e, 0
	}
	le, ok := v.low.read(cut)
	if !ok {
		return e, 0
	}
	e.Hz, e.Confidence, e.Voiced = le.Hz, le.Confidence, true
	return e, cut
}

// ownSound tells whether channel i is no more than quietDB under the
// loudest other channel: louder than bleed alone.
func ownSound(i int, levels []float64) bool {
	loudest := math.Inf(-1)
	for d, l := range levels {
		if d != i {
			loudest = math.Max(loudest, l)
		}
	}
	return levels[i] > loudest-quietDB
}

// recentPitch notes the pitch the player's frame was heard at (0: none) and
// returns their latest pitch heard within a window of frames (0: none).
func (v *voice) recentPitch(hz float64) float64 {
	if hz > 0 {
		v.recent, v.age = hz, 0
	} else if v.age++; v.age >= steadyFrames {
		v.recent = 0
	}
	return v.recent
}
