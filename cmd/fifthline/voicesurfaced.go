package main

import (
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
func (tr *tracker) surfaced(t *track, h pitchdetect.Held) bool {
	together := tr.window / 2
	for _, d := range tr.done {
		if multipitch.OnPartial(h.Hz, d.Hz) && d.power > t.level() && d.Start < h.Start-together && d.End >= h.End-together {
			return true
		}
	}
	for _, o := range tr.tracks {
		if o != t && !o.delivered && multipitch.OnPartial(h.Hz, o.hz) && o.level() > t.level() && o.start < h.Start-together {
			return true
		}
	}
	return false
}
