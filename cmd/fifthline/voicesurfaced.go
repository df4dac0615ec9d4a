package main

import (
	"math"

	"fifthline/multipitch"
	"fifthline/pitchdetect"
)

// surfaced reports whether note h of track t lies on a partial (3 to 6) of
// a louder voice's note that sounded before it began, by more than the
// half window within which voices count as struck together, and sounds on
// to its end: that partial surfacing while the note holds, not a voice. One
// microphone hears a held note's strong partial as a voice of its own
// whenever the estimator has a voice to spare for it, though its spectral
// envelope says it is a voice (multipitch/smoothness.go judges one window,
// and a formant's partial stands out of it): an oboe's B4's 3rd partial
// read as F#6 over another voice's release, a violin's F#4's 3rd as C#6,
// the choir aahs' A3's 5th as C6 (measured on voices_untuned_test.go's
// scenes). A voice entering on a held note's partial does so at its own
// attack, and is held as a voice; this note is the held note's, as the
// octave is (foldOctave).
//
// An octave above the held note surfaces so at any level: a horn's 2nd
// partial, as loud as its fundamental or louder, read as a voice a second
// into the held note (FluidR3's horn on C4 and C♯4, measured in
// voices_unseen2_test.go's brass quartet and voices_unseen_test.go's
// Werckmeister trio), is no more a voice than a quieter octave is
// (foldOctave); one microphone cannot part a real octave doubling from it
// either, and the contract reports a doubling once.
func (tr *tracker) surfaced(t *track, h pitchdetect.Held) bool {
	together := tr.window / 2
	on := func(lo, power float64) bool {
		return multipitch.OctaveAbove(h.Hz, lo) || multipitch.OnPartial(h.Hz, lo) && power > t.level()
	}
	for _, d := range tr.done {
		if on(d.Hz, d.power) && d.from < h.Start-together && d.End >= h.End-together {
			return true
		}
	}
	for _, o := range tr.tracks {
		if o != t && o.holding() && on(o.hz, o.level()) && o.from < h.Start-together && !(multipitch.OctaveAbove(h.Hz, o.hz) && o.onPartials()) {
			return true
		}
	}
	return false
}

// heldOnCents: a voice entering within this of a track sounding in this
// frame or the last takes over that track's held note, which stepped
// further than the tracker follows (JumpCents): FluidR3's voice oohs
// holding A♭4 then G♯4 in ¼-comma meantone, a lesser diesis (41 ¢) apart,
// were read 423.6 then 410.5 Hz (53 ¢; measured), the new track entering a
// frame before the old one fell silent. Under a semitone (100 ¢ by
// definition), as a step held through is.
const heldOnCents = 100

// heldFrom is where the held note a voice entering at hz at time at sounds
// began: that of a track within heldOnCents of it sounding lately, else at.
// It serves surfaced only: one microphone hears a single instrument's step
// as another voice entering, and its partials as surfacing at that entry.
func (tr *tracker) heldFrom(hz, at float64) float64 {
	for _, o := range tr.tracks {
		if o.missed <= 1 && math.Abs(1200*math.Log2(hz/o.hz)) < heldOnCents {
			return min(at, o.from)
		}
	}
	return at
}

// holding reports whether the track sounds a note not yet given out: its
// first, or the next past a step its voice held through. A held note split
// by a step is one instrument's, and so are its partials and octave
// through the step (surfaced, foldOctave).
func (t *track) holding() bool { return !t.delivered || t.stepped }
