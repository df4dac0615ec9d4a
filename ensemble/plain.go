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
// on the neighbour's channel, and either the neighbour's note is still
// filling the detector's window (the channel hears its bleed grow with
// it, three milliseconds late) or the channel stands no more than risingDB
// above the quietest it has been since its player last played. An attack
// of the channel's own player rises out of the bleed (a violin entering in
// unison with a note already sounding, whose first frames sound louder on
// the other's channel): that is still held, and so is a frame at any other
// pitch (an attack read an octave low, or one whose neighbour is not yet
// read).

// farDB is how much louder the neighbour's harmonics must sound: above
// DefaultOwnDB and the few dB that separate two players in unison, under
// the 15–25 dB close microphones hear of their neighbours (the ensemble
// issue's measurements).
const farDB = 12.0

// farRatio is farDB as a power ratio.
var farRatio = math.Pow(10, farDB/10)

// risingDB is how far above its quietest a channel hearing only bleed may
// read: a held note's bleed wavers by about this much with its player's
// bow or breath; a channel read as rising is only held back, as before.
const risingDB = 1.0

// plainly tells whether player i's frame e, given away as bleed
// (v.blanked) at an onset (the previous frame silent: prev 0; any frames
// held, held at an onset), is plainly another player's: see above. heard
// is each player's own pitch this frame (0: unvoiced or given away). It
// follows the channel's quietest level (v.floor) on every frame.
func (v *voice) plainly(o *Owner, voices []*voice, i int, e pitchdetect.Estimate, heard []float64, prev float64) bool {
	if e.Voiced && !v.blanked {
		v.floor = math.Inf(1) // the player's own: the bleed after it is measured afresh
	}
	rising := e.Level > v.floor+risingDB
	v.floor = math.Min(v.floor, e.Level)
	if !v.blanked || prev != 0 || len(v.held) > 0 && v.note != 0 {
		return false
	}
	for d, u := range voices {
		if d == i || !sameNote(e.Hz, heard[d]) || !(o.power(d, e.Hz, 0) > o.power(i, e.Hz, 0)*farRatio) {
			continue
		}
		if u.run < steadyFrames {
			v.floor = e.Level // the bleed grows with the neighbour's note
			return true
		}
		if !rising {
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
