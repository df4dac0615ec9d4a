package pitchdetect

import "math"

// An attack read a subharmonic low. A quick note's first frames may hold
// its own sound read an octave low (the detector's window still holding
// the last note's tail): FluidR3's violin C5 sixteenth slurred from E5 read
// C4 for 7 frames, then C5 for 2–3 before the next note's slur, and at some
// phases of the hop was given out as C4, or lost (fluidsynth, measured).
// A note of its own a subharmonic below would be slurred into this one
// through frames whose window holds both, read as neither; this one's
// frames pass straight into the note at the very multiple of their pitch.
// (After silence, or where the low reading is the period the note shares
// with the one before it, Push folds the low frames into the note and
// leaves them out of its reading: see Segmenter.OnsetBlip.)

// lowCents is how near the new pitch must lie to the multiple of the last
// frame's for the two to be one sound read two ways.
const lowCents = 5.0

// readLow reports whether the open note, slurred from another and begun
// less than OnsetBlip before first, is first's own attack read a
// subharmonic low: its last frame the one just before first, at first's
// pitch divided by 2, 3 or 4 within lowCents, and no subharmonic of the
// note it was slurred from. If so its frames are given first's pitch
// (their own times k), and the note goes on.
func (s *Segmenter) readLow(first Estimate) bool {
	n := len(s.frames)
	last := s.frames[n-1]
	if s.from.hz == 0 || subharmonic(last.Hz, s.from.hz) ||
		first.Time-s.frames[0].Time >= s.OnsetBlip || first.Time-last.Time > 1.5*s.Hop {
		return false
	}
	k := math.Round(first.Hz / last.Hz)
	if k < 2 || k > 4 || math.Abs(1200*math.Log2(first.Hz/(k*last.Hz))) > lowCents {
		return false
	}
	for i := range s.frames {
		s.frames[i].Hz *= k
	}
	return true
}

// subharmonic reports whether low is the second, third or fourth
// subharmonic of high, within the segmenter's notion of one pitch.
func subharmonic(low, high float64) bool {
	if low <= 0 || high <= 0 {
		return false
	}
	for k := 2.0; k <= 4; k++ {
		if math.Abs(1200*math.Log2(high/(k*low))) < 50 {
			return true
		}
	}
	return false
}
