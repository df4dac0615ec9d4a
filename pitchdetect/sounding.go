package pitchdetect

// Sounding tells, while a note is open, where it began and the time of its
// last frame, once it is sure to be given as a note beginning there however
// it goes on: long enough to count (MinFrames, MinSeconds), past the time
// in which a jump would fold it into the next note as that note's attack
// read a subharmonic low (OnsetBlip), and no possible echo of the note
// before. A reader of chords needs it for a note held under several (a
// pedal): the chords above it can be read before it ends. The frames after
// through are not yet the note's: a second frame at a new pitch, or
// silence, may end it there.
func (s *Segmenter) Sounding() (start, through float64, ok bool) {
	if len(s.frames) < s.MinFrames {
		return 0, 0, false
	}
	start, through = s.frames[0].Time, s.frames[len(s.frames)-1].Time
	if through-start < max(s.MinSeconds, s.OnsetBlip) {
		return 0, 0, false
	}
	// finish's echo rule, whatever the note's pitch turns out to be: an
	// echo starts quietly soon after the last note's end and never rises.
	// Before any note there is none to echo (a steady note heard from the
	// stream's first quarter second on is not one).
	first, peak := s.frames[0].Level, s.frames[0].Level
	for _, e := range s.frames {
		peak = max(peak, e.Level)
	}
	if s.prev.hz > 0 && s.from.hz == 0 && start-s.prev.end < echoGap && first < s.prev.level-echoDB && peak <= first+1 {
		return 0, 0, false
	}
	return start, through, true
}
