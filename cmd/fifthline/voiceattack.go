package main

import (
	"fifthline/multipitch"
	"fifthline/pitchdetect"
)

// attackShort is how long a note read an octave under a voice that takes
// over from it may last and still be that voice's attack: half a second,
// the length under which a stretch beside a chord is a piece of it
// (harmony/fragment.go).
const attackShort = 0.5

// attackBelow reports whether note h of track t, shorter than attackShort,
// lies an octave under a voice that began while it sounded and holds on
// past its end: that voice's attack read an octave low, no voice. While an
// attack's pitch still glides over the estimator's window, the octave
// below, whose even partials lie a few hertz off the sound's own, fits the
// moving partials better beside them or in their place (Klapuri 2003's
// spectral smoothness would tell, its odd partials silent, but one window's
// odd partials of a weak-fundamental voice, an oboe's, lie as low; measured
// on the woodwind quartet's A minor onset: the flute's A5 read as A4 from
// 3.07 s, A5 from 3.34 s on, A4 ending at 3.53 s).
func (tr *tracker) attackBelow(t *track, h pitchdetect.Held) bool {
	if h.End-h.Start >= attackShort {
		return false
	}
	for _, o := range tr.tracks {
		if o != t && !o.delivered && o.start > h.Start && o.start < h.End && multipitch.OctaveAbove(o.hz, h.Hz) {
			return true
		}
	}
	return false
}
