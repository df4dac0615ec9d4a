package ensemble

import (
	"errors"
	"math"

	"fifthline/pitchdetect"
)

// Bleed plainly another's: a resting player's channel, before its bleed
// is weighed, reads a neighbour's note at the neighbour's pitch. Each such
// frame is given away, and attack.go held it back as a possible onset, up
// to attackFrames of them for as long as the neighbour played; every
// moment waited for them (OnFrame hands out whole moments), so every
// player's first notes came attackFrames hops late until the bleed was
// learned. Measured live (four channels, bleed 20 dB down, the players'
// first cycle): 35 ms of the 90–100 ms from onset to first reading.
//
// A frame is plainly the neighbour's, and given away at once, when the
// neighbour's own frame reads that pitch, its harmonics sound farDB louder
// on the neighbour's channel, and either the neighbour is at their own
// onset (the channel heard their attack, three milliseconds late) or the
// channel's level is not rising. An attack of the channel's own player
// rises (a violin entering in unison with a note already sounding): that
// is still held, and so is a frame at any other pitch (an attack read an
// octave low, or one whose neighbour is not yet read).

// farDB is how much louder the neighbour's harmonics must sound: above
// DefaultOwnDB and the few dB that separate two players in unison, under
// the 15–25 dB close microphones hear of their neighbours (the ensemble
// issue's measurements).
const farDB = 12.0

// risingDB is how much louder than its previous frame a channel must read
// to be rising: more than a held note's bleed wavers (a neighbour's
// tremolo moves it a dB or so).
const risingDB = 2.0

// plainly tells whether player i's frame e, given away as bleed
// (v.blanked) at an onset (the previous frame silent: prev 0; any frames
// held, held at an onset), is plainly another player's: see above. heard is each player's own
// pitch this frame (0: unvoiced or given away). It notes every frame's
// level for the next frame's.
func (v *voice) plainly(o *Owner, voices []*voice, i int, e pitchdetect.Estimate, heard []float64, prev float64) bool {
	rising := e.Level > v.level+risingDB
	v.level = e.Level
	if !v.blanked || prev != 0 || len(v.held) > 0 && v.note != 0 {
		return false
	}
	hz := e.Hz
	for d, u := range voices {
		if d == i || !sameNote(hz, heard[d]) || rising && u.run >= attackFrames {
			continue
		}
		if o.power(d, hz, 0) > o.power(i, hz, 0)*math.Pow(10, farDB/10) {
			return true
		}
	}
	return false
}

// giveAway feeds the segmenter the frame e, plainly another's, and the
// frames held at the onset before it: each a frame of the same bleed
// (attack.go would give them away at the player's next own frame, unless
// it took them back, which a frame of bleed between does not).
func (v *voice) giveAway(e pitchdetect.Estimate, deliver func(*voice, pitchdetect.Held) error) error {
	return errors.Join(v.release(deliver), v.feed1(unvoiced(e), deliver))
}
