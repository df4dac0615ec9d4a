package pitchdetect

// A quick note slurred between two others whose frames are few. A slurred
// note's own frames begin late where the note before rings on under its
// attack (a violin's, slow) and end early where the slur out is read at a
// period the two notes share: FluidR3's violin's D5 sixteenth between G5
// and G4 kept 6 frames, 0.080 s from the middle of its slur in to the G4's
// first frame, and its G3 between B♭3 and E4 kept 5, 0.096 s, its slur out
// read as C2 (G3's third subharmonic, E4's fifth); both were dropped as
// blips under MinSeconds (measured). A blip a slur leaves is read at a
// subharmonic of a note either side of it, where the window holds more of
// one note's periods than the other's (B♭3 slurred to G3 read as E♭2, B♭3's
// third), so a slurred run of frames that is neither, parted from the
// note before it by frames its slur in left unread or read at another
// pitch, gets half a sixteenth at ♩ = 100 and MinFrames. (Frames that
// follow the note before straight on, at a pitch of no note near it, are
// that note misread, while they are few: the blips above kept 3 to 7.) One
// that follows straight on for twice MinFrames is a note too: at one phase
// of the hop in eight, FluidR3's trumpet's G5 sixteenth slurred up an
// octave from G4 to C5, and its violin's A5 slurred from D5 to F5, were
// read straight on from the note before for 8 frames, 0.085 s, and
// dropped (measured).

// slurredNoteSeconds is how long a slurred note with no subharmonic
// relation to its neighbours must sound to be a note.
const slurredNoteSeconds = 0.075

// slurredNote reports whether the open note h, slurred between s.from and
// a note at s.nextHz, no subharmonic of either and its first frame more
// than a hop after s.from's last or its frames twice MinFrames, has
// MinFrames frames and lasts slurredNoteSeconds.
func (s *Segmenter) slurredNote(h Held, length float64) bool {
	return s.from.hz != 0 && s.nextHz != 0 && len(s.frames) >= s.MinFrames && length >= slurredNoteSeconds &&
		(h.Start-s.from.last > 1.5*s.Hop || len(s.frames) >= 2*s.MinFrames) && !subharmonic(h.Hz, s.from.hz) && !subharmonic(h.Hz, s.nextHz)
}
