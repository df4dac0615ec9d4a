package ensemble

import (
	"math"

	"fifthline/pitchdetect"
)

// An attack heard among louder neighbours: a player's first frames may
// sound their pitch more loudly on another channel, because the note is
// still growing (a violin entering in unison with another), or because
// the detector read it an octave low, where a neighbour's partial lies (a
// flute's G5 entering over a bassoon's C3 first reads G4, the bassoon's
// third harmonic), or because the neighbour's attack hides the partials
// the ownership test would leave out (its pitch is not yet read). Each
// frame alone looks like bleed; the frames after tell: the player's own
// note follows at that pitch, or an octave or a twelfth above it. So the
// frames given away as bleed at an onset are held back, up to
// attackFrames of them, until the player's next frame decides: an own
// note related to them takes them back as read (as the player alone reads
// them, so the note starts where it would alone), anything else gives
// them away. Measured before: a flute's note started a frame late and
// read 1.06 ¢ off, a clarinet's two frames late and 1.29 ¢ off.

// attackFrames is how many frames at an onset are held back: 43 ms at
// the detector's default hop, longer than the misread attacks measured
// (one or two frames) and short against the 0.1 s a note needs.
const attackFrames = 4

// push feeds the segmenter the frame e as the detector read it, given
// away as bleed if blanked; prev is the pitch the player's previous frame
// was heard at (0: silent, so this frame is an onset). deliver gets each
// note the segmenter finishes.
func (v *voice) push(e pitchdetect.Estimate, blanked bool, prev float64, deliver func(*voice, pitchdetect.Held) error) error {
	if blanked && (len(v.held) > 0 || prev == 0 || sameNote(e.Hz, prev)) {
		if len(v.held) == 0 {
			v.note, v.spilled = prev, false
		}
		var err error
		if len(v.held) == attackFrames {
			err = v.feed1(unvoiced(v.held[0]), deliver)
			v.held = append(v.held[:0], v.held[1:]...)
			v.spilled = true
		}
		v.held = append(v.held, e)
		return err
	}
	var errs error
	for _, h := range v.held {
		if !v.takesBack(h, e, blanked) {
			h = unvoiced(h)
		}
		if err := v.feed1(h, deliver); err != nil && errs == nil {
			errs = err
		}
	}
	v.held = v.held[:0]
	if blanked {
		e = unvoiced(e)
	}
	if err := v.feed1(e, deliver); err != nil && errs == nil {
		errs = err
	}
	return errs
}

// takesBack tells whether the held frame h is the player's own, given
// the frame e that follows the held ones. Held at an onset: the player's
// own note follows, at h's pitch or an octave or a twelfth above it. Held
// within a note: h is at the note's pitch and the note was not given up
// meanwhile (more than attackFrames held: the segmenter has bridged or
// ended it), whatever follows.
func (v *voice) takesBack(h, e pitchdetect.Estimate, blanked bool) bool {
	switch {
	case blanked:
		return false
	case v.note > 0:
		return !v.spilled && sameNote(h.Hz, v.note)
	}
	return e.Voiced && attackOf(h.Hz, e.Hz)
}

// release gives away the frames still held back (the stream ended).
func (v *voice) release(deliver func(*voice, pitchdetect.Held) error) error {
	var errs error
	for _, h := range v.held {
		if err := v.feed1(unvoiced(h), deliver); err != nil && errs == nil {
			errs = err
		}
	}
	v.held = v.held[:0]
	return errs
}

func (v *voice) feed1(e pitchdetect.Estimate, deliver func(*voice, pitchdetect.Held) error) error {
	v.decided = append(v.decided, e)
	if h, done := v.seg.Push(e); done {
		return deliver(v, h)
	}
	return nil
}

// attackOf tells whether a frame read at hz may be the attack of a note
// at pitch: the same pitch, or read an octave or a twelfth low (within
// partialCents).
func attackOf(hz, pitch float64) bool {
	if !(hz > 0) {
		return false
	}
	k := math.Round(pitch / hz)
	return k >= 1 && k <= 3 && math.Abs(1200*math.Log2(pitch/(k*hz))) < partialCents
}

// sameNote tells whether a frame read at hz is at the pitch of the
// player's note (within partialCents).
func sameNote(hz, pitch float64) bool {
	return hz > 0 && pitch > 0 && math.Abs(1200*math.Log2(hz/pitch)) < partialCents
}

// unvoiced is e given away: no pitch, its level kept (the segmenter
// bridges frames missed at a note's own level).
func unvoiced(e pitchdetect.Estimate) pitchdetect.Estimate {
	e.Voiced, e.Hz, e.Confidence = false, 0, 0
	return e
}

// decided hands onFrame (if set) every moment whose frames all players'
// segmenters have had, oldest first, each in player order, and forgets
// them: a frame held back is seen as it was finally read.
func decided(voices []*voice, onFrame func(int, pitchdetect.Estimate)) {
	n := len(voices[0].decided)
	for _, v := range voices {
		n = min(n, len(v.decided))
	}
	if n == 0 {
		return
	}
	for k := range n {
		for i, v := range voices {
			if onFrame != nil {
				onFrame(i, v.decided[k])
			}
		}
	}
	for _, v := range voices {
		v.decided = append(v.decided[:0], v.decided[n:]...)
	}
}
