package main

import (
	"fifthline/harmony"
	"fifthline/multipitch"
)

// A voice held under several chords (a pedal, a choir's held bass) would
// hold every chord above it back until it ends, and with them every other
// voice's note row (heldrows.go): a minute, under a choir's held bass. So
// the tracker tells the chord finder its voices' notes still sounding
// (harmony.Stream.Sound), as ensemble tells the players' (OnSounding).

// openVoice is a voice's note still sounding, sure to be given as the
// voice's note beginning at start, heard through the time of its last
// frame.
type openVoice struct {
	voice          int
	start, through float64
	hz             float64        // its pitch so far: read where it has no frames
	frames         *harmony.Track // its track's frames, as its note will have
	doubled        bool           // so far (voiceNote.doubled)
	track          *track
	settled        float64 // where its reading begins, once settles (pitchdetect's Segmenter.Settles)
	settles        bool
}

// moment is, at frame time now, the earliest a note still to come can
// start, and the voices' notes still sounding. A track whose note sounds
// starts no other before that note's last frame; any other track's next
// note starts at or after its first frame and after its last note; a
// track still to come starts after now, and a note waiting for a lost
// voice's (give) at its start.
func (tr *tracker) moment(now float64) (earliest float64, open []openVoice) {
	earliest = now
	for _, t := range tr.tracks {
		if o, ok := tr.sounding(t); ok {
			open = append(open, o)
			earliest = min(earliest, o.through)
			continue
		}
		earliest = min(earliest, max(t.start, t.ended))
	}
	for _, n := range tr.waiting {
		earliest = min(earliest, n.Start)
	}
	return earliest, open
}

// sounding is t's open note when it is sure to be given as a voice's note
// beginning where it began (pitchdetect's Segmenter.Sounding). A note that
// may yet be dropped as no voice is not told: one most of whose frames so
// far lie on a lower voice's partials, or one an octave above another
// voice (foldOctave may fold it into that voice).
func (tr *tracker) sounding(t *track) (openVoice, bool) {
	start, through, ok := t.seg.Sounding()
	if !ok || t.onPartials() {
		return openVoice{}, false
	}
	hz := t.hz // enough to tell octaves and semitones apart
	for _, d := range tr.done {
		if d.End >= start && multipitch.OctaveAbove(hz, d.Hz) {
			return openVoice{}, false
		}
	}
	for _, o := range tr.tracks {
		if o != t && multipitch.OctaveAbove(hz, o.hz) {
			return openVoice{}, false
		}
	}
	settled, settles := t.seg.Settles()
	return openVoice{tr.voiceAt(t, start, hz), start, through, hz, t.frames, 2*t.doubled > t.count, t, settled, settles}, true
}

// readPitch sets the note's pitch so far to its frames' (the last seconds'
// mean), not its latest frame's, a vibrato's one end, where its chords
// read it without frames (without --chords); only when the chords are
// looked for, as it costs a summary of the note.
func (o *openVoice) readPitch() {
	if o.frames != nil || o.track == nil {
		return
	}
	if h, ok := o.track.seg.Current(); ok {
		o.hz = h.Hz
	}
}
