package multipitch

import (
	"math"
	"math/cmplx"
	"slices"
)

// A voice doubled an octave above by another player carries that player's
// partials on its even ones, with the player's own attack, vibrato and
// slight detuning: the phase of an even partial wanders, frame to frame,
// against the odd partials around it, while the odd partials (the lower
// player's alone) keep theirs to each other. One instrument's partials move
// together, its even ones no less firmly than its odd ones, however its
// formants lift them. Measured over 0.3 to 1.9 s of FluidR3 takes (frames
// a quarter window apart) (median
// over partials 2 to 13 of |mean e^{iψ}|, lockedTo; lone → doubled by the
// same instrument an octave above): bassoon F3 evens 0.74, odds 0.39 →
// 0.22, 0.37; bassoon C3 0.59, 0.27 → 0.16, 0.19; French horn D3 0.47, 0.46
// → 0.17, 0.40; trombone C3 1.00, 1.00 → 0.20, 0.99; clarinet G3 0.99,
// 1.00 → 0.52, 1.00. Sox's sawtooths and squares an exact octave apart are
// one periodic sound (1.00, 1.00): there the locks tell nothing, and the
// partials' levels decide (doubled.go).

// lockDecay is how much of a frame's phase evidence is left a frame later:
// about five frames' memory, half a second at the default hop.
const lockDecay = 0.8

// lockMissed is how many frames in a row a voice may be missed and keep
// its track.
const lockMissed = 3

// lockTop is the highest partial whose phase is followed.
const lockTop = 13

// lockTrack follows one voice's phase relations over frames: for partial
// k, the decayed sum of unit phasors of ψ_k = 2φ_k − φ_{k−d} − φ_{k+d},
// with d = 1 for even k (its odd neighbours) and d = 2 for odd k (the odd
// partials either side), which stays put for partials exactly harmonic
// wherever the window lies; and the decayed count of frames that gave one.
type lockTrack struct {
	hz     float64
	seen   bool
	missed int // frames since the voice was last heard
	sum    [lockTop + 1]complex128
	weight [lockTop + 1]float64
}

// followLocks adds the last solve's phases to each voice's track (the one
// within twinCents of it), starting tracks for new voices and ending those
// of voices not heard for over lockMissed frames. lockOf[v] is voice v's
// track afterwards.
func (e *Estimator) followLocks() {
	for i := range e.locks {
		e.locks[i].seen = false
	}
	e.lockOf = e.lockOf[:0]
	for v, hz := range e.f0 {
		i := slices.IndexFunc(e.locks, func(l lockTrack) bool { return !l.seen && math.Abs(cents(hz, l.hz)) < twinCents })
		if i < 0 {
			e.locks = append(e.locks, lockTrack{})
			i = len(e.locks) - 1
		}
		l := &e.locks[i]
		l.hz, l.seen = hz, true
		e.lockOf = append(e.lockOf, i)
		amp := e.partialAmps(v)
		ps := e.powersOf(v, amp)
		for k := 2; k <= lockTop && k+2 < len(amp); k++ {
			l.sum[k] *= lockDecay
			l.weight[k] *= lockDecay
			d := 1 + k%2
			if k-d < 1 || !ps.audible(k) || !ps.audible(k-d) || !ps.audible(k+d) {
				continue
			}
			p := amp[k] * amp[k] * cmplx.Conj(amp[k-d]) * cmplx.Conj(amp[k+d])
			l.sum[k] += p / complex(cmplx.Abs(p), 0)
			l.weight[k]++
		}
	}
	// A voice missed for a few frames keeps its track (the whole window
	// loses a chord's quieter voice every other frame, and the half window
	// holds it); lockOf follows the move.
	kept := e.locks[:0]
	for i, l := range e.locks {
		if l.missed = l.missed + 1; l.seen {
			l.missed = 0
		}
		if l.missed <= lockMissed {
			for v := range e.lockOf {
				if e.lockOf[v] == i {
					e.lockOf[v] = len(kept)
				}
			}
			kept = append(kept, l)
		}
	}
	e.locks = kept
}

// partialAmps gives voice v's fitted complex amplitudes from the last
// solve (index k), in the estimator's scratch, good until the next call.
func (e *Estimator) partialAmps(v int) []complex128 {
	amp := grow(e.amps, maxPartials+2)
	clear(amp)
	e.amps = amp
	for i, a := range e.fitter.amp {
		if c := e.fitter.cols[i]; c.voice == v && !c.broad {
			amp[c.k] = a
		}
	}
	return amp
}

// lockedTo gives the median lock (|mean e^{iψ}|, 1 for phases that never
// move, near 0 for phases that wander at random) of voice v's even and odd
// partials, over those followed for at least three frames' weight; ok is
// false where either parity has fewer than three such partials.
func (e *Estimator) lockedTo(v int) (even, odd float64, ok bool) {
	if v >= len(e.lockOf) {
		return 0, 0, false
	}
	l := &e.locks[e.lockOf[v]]
	var ev, od []float64
	for k := 2; k <= lockTop; k++ {
		if l.weight[k] < 3 {
			continue
		}
		r := cmplx.Abs(l.sum[k]) / l.weight[k]
		if k%2 == 0 {
			ev = append(ev, r)
		} else {
			od = append(od, r)
		}
	}
	if len(ev) < 3 || len(od) < 3 {
		return 0, 0, false
	}
	slices.Sort(ev)
	slices.Sort(od)
	return ev[len(ev)/2], od[len(od)/2], true
}

// periodicLock is the odd partials' lock above which a voice's sound
// repeats nearly exactly, period by period: a synthetic tone's or a
// sample's loop, a double in exact unison of phase with it included.
const periodicLock = 0.9

// lockMargin is how much more firmly than its odd partials a voice's even
// ones must keep their phases for it to be one instrument. Frame by frame
// (lockDecay), a double's locks come out either way by up to 0.14 (FluidR3's
// horn on A3 doubled, a trombone doubled, both near one periodic sound early in
// the note), a lone bassoon's evens 0.10 to 0.38 above its odds once its
// attack is over (measured, the takes above).
const lockMargin = 0.1

// oneInstrument reports whether voice v's partials, over its recent frames,
// move together as one instrument's do: its odd partials wander (not one
// periodic sound) and its even partials keep their phases to the odd ones
// more firmly than the odd ones keep theirs to each other.
func (e *Estimator) oneInstrument(v int) bool {
	even, odd, ok := e.lockedTo(v)
	return ok && odd < periodicLock && even >= odd+lockMargin
}

// phasesWeighed reports whether enough of voice v's partials, of each
// parity, have been followed to weigh their locks (lockedTo).
func (e *Estimator) phasesWeighed(v int) bool {
	_, _, ok := e.lockedTo(v)
	return ok
}
