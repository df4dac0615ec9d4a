package ensemble

import "math"

// quietDB is how far below player d's level a channel whose detector
// reads no pitch must lie to count as silent for d's bleed evidence: the
// loudest neighbour of the ensemble issue's figures is 15 dB down, so a
// channel louder than that holds sound of its own (a soft attack not yet
// read), whose partials would pass for d's bleed.
const quietDB = 15.0

// frameReadings is what the players' detectors made of one frame, by
// player, for the bleed evidence.
type frameReadings struct {
	hz     []float64 // the pitch after the ownership test: 0 when unvoiced or another's bleed
	read   []float64 // the detector's pitch before it
	level  []float64 // the level of the window the detector read (cleaned), dBFS
	steady []bool    // the player has held hz, or silence, for a window
	recent []float64 // the player's latest pitch heard within a window, 0: none (lowband.go)
}

func newFrameReadings(players int) *frameReadings {
	return &frameReadings{hz: make([]float64, players), read: make([]float64, players),
		level: make([]float64, players), steady: make([]bool, players), recent: make([]float64, players)}
}

// own is player c's own pitch this frame as the bleed evidence needs it:
// their pitch, or one their detector read that the ownership test gave
// away but that is no partial of another player's pitch (a soft attack
// under louder neighbours: its partials are c's, not bleed). unread tells
// that the detector heard no pitch at all, so the channel may still hold
// sound of c's own.
func (f *frameReadings) own(c int) (hz float64, unread bool) {
	switch {
	case f.hz[c] > 0:
		return f.hz[c], false
	case f.read[c] > 0 && !partialOfAnother(f.read[c], f.hz, c):
		return f.read[c], false
	}
	return 0, f.read[c] == 0
}

// partialOfAnother tells whether hz lies within partialCents of a partial
// of another player's pitch. A pitch below another's is not: it may be
// that player's bleed read an octave low, but also a bass's own note two
// octaves under the soprano, and its partials are better left out of the
// evidence than taken for bleed.
func partialOfAnother(hz float64, pitches []float64, c int) bool {
	for d, p := range pitches {
		if d == c || !(p > 0) {
			continue
		}
		if k := math.Round(hz / p); k >= 1 && math.Abs(1200*math.Log2(hz/(k*p))) < partialCents {
			return true
		}
	}
	return false
}
