package main

import (
	"cmp"
	"math"
	"slices"

	"fifthline/pitchdetect"
)

// resumeCents is how near its note's pitch a lost voice must be found again
// to go on with the same note: the estimator's frames of a chorused voice
// scatter by 10 to 14 ¢ (standard deviation, measured on the choir's E3),
// so one frame is not held closer than that.
const resumeCents = 20.0

// heardShare is the least share of its frames a note must have been heard
// in to be waited for when lost: an estimator's passing reading of a
// partial (E4's 3rd read as B5 under the choir's chord) comes and goes a
// frame or two at a time, 0.22 to 0.33 of its frames, and joined it would
// be a note; the choir's voices, lost and found again, are heard in 0.39
// to 0.75 (measured, the scene begun 23 ms late).
const heardShare = 0.36

// lostVoice is a track's voice missing from the frames while the chord
// around it holds: the frames missed are held back from its segmenter, so
// the note goes on if the voice is found again at its pitch within
// lostSeconds (one microphone under a chorused choir loses a voice for up
// to 0.84 s while it sings on; TestVoicesOfRenderedEnsembles, "choir, four
// parts", on other frame grids), and ends where it was lost if not.
type lostVoice struct {
	last  float64        // its note's last frame
	times []float64      // the frames missed, not yet told to the segmenter
	hz    float64        // its note's pitch as it was lost
	with  map[*track]int // the other tracks sounding then, and their notes delivered by then
}

// holds: every other voice sounding when t's voice was lost is still on
// the note it sang then (or lost itself, for now), and no voice has come in
// since as a held note: the chord has not moved.
func (tr *tracker) holds(l *lostVoice) bool {
	for o, notes := range l.with {
		if o.gone || o.notes != notes {
			return false
		}
	}
	for _, o := range tr.tracks {
		if o.start <= l.times[0] {
			continue
		}
		if _, held := tr.heldNote(o); held {
			return false
		}
	}
	return true
}

// resumes: voice hz goes on with t's note.
func (tr *tracker) resumes(t *track, hz float64) bool {
	return t.lost == nil || (math.Abs(1200*math.Log2(hz/t.lost.hz)) <= resumeCents && tr.holds(t.lost))
}

// stillLost reports whether t's voice, missing from the frame at time at,
// is held as lost under a chord that holds (got: the tracks given a voice
// in this frame); false when its note is to end as the frames say.
func (tr *tracker) stillLost(t *track, at float64, got []bool) bool {
	if t.lost != nil {
		if at-t.lost.times[0] >= lostSeconds || !tr.holds(t.lost) {
			return false
		}
		t.lost.times = append(t.lost.times, at)
		return true
	}
	h, ok := tr.heldNote(t)
	if !ok {
		return false
	}
	if slices.ContainsFunc(tr.aside, func(lo float64) bool { return lo < h.Hz && harmonicPair(lo, h.Hz) }) {
		return false // as below: a voice left out by --voices N still sounds
	}
	l := &lostVoice{last: h.End, times: []float64{at}, hz: h.Hz, with: map[*track]int{}}
	for oi, o := range tr.tracks {
		if !got[oi] || o == t {
			continue
		}
		if harmonicPair(o.hz, h.Hz) {
			if o.hz < h.Hz {
				return false // on a lower voice's harmonic: its partial, maybe
			}
			continue
		}
		if _, held := tr.heldNote(o); held {
			l.with[o] = o.notes
		}
	}
	if len(l.with) == 0 {
		return false
	}
	t.lost = l
	return true
}

// heldNote is t's open note when it is a held note, heard in heardShare of
// its frames at least; a passing reading comes and goes too often.
func (tr *tracker) heldNote(t *track) (pitchdetect.Held, bool) {
	if t.missed > 0 || t.lost != nil {
		return pitchdetect.Held{}, false
	}
	h, ok := t.seg.Current()
	if !ok || h.Frames < t.seg.MinFrames || float64(h.Frames) < heardShare*((h.End-h.Start)/tr.hop+1) || t.onPartials() {
		return pitchdetect.Held{}, false
	}
	return h, true
}

// harmonicPair: one pitch lies within 50 ¢ of the other's first to eighth
// harmonic (its unison included). Such a pair may be one voice read twice,
// its partial or a chorused voice's second reading, which vouches for
// nothing: a lone chorused E3 read as E3, B4 and a second E3 would hold
// its own lost pieces together (TestLoneChorusedVoiceHangsOnTheFrameGrid),
// and the choir's G4 read an octave up, G5, would be held as a voice.
func harmonicPair(a, b float64) bool {
	lo, hi := min(a, b), max(a, b)
	for k := 1.0; k <= 8; k++ {
		if math.Abs(1200*math.Log2(hi/(k*lo))) < 50 {
			return true
		}
	}
	return false
}

// missing tells t's segmenter of the frames at which its voice was missed
// (first those held back while it was lost), delivering the note they end;
// false once the track has ended with it.
func (tr *tracker) missing(t *track, at ...float64) bool {
	if t.lost != nil {
		at = append(t.lost.times, at...)
		t.lost = nil
	}
	for _, a := range at {
		t.missed++
		if h, ok := t.seg.Push(pitchdetect.Estimate{Time: a, Level: -120}); ok {
			tr.deliver(t, h, false)
		}
		if t.missed > t.seg.MaxGap {
			if h, ok := t.seg.Flush(); ok {
				tr.deliver(t, h, false)
			}
			t.gone = true
			return false
		}
	}
	return true
}

// give hands a note on as notes end: while a voice is held as lost it may
// yet end where it was lost, before the notes given since (a chord's voices
// falling silent a frame apart), so those wait for it.
func (tr *tracker) give(n voiceNote) {
	tr.waiting = append(tr.waiting, n)
	for _, t := range tr.tracks {
		if t.lost != nil {
			return
		}
	}
	tr.release()
}

// release hands on the waiting notes that end before every lost voice's
// last frame, in the order they end.
func (tr *tracker) release() {
	until := math.Inf(1)
	for _, t := range tr.tracks {
		if t.lost != nil {
			until = min(until, t.lost.last)
		}
	}
	slices.SortStableFunc(tr.waiting, func(a, b voiceNote) int { return cmp.Compare(a.End, b.End) })
	n := 0
	for n < len(tr.waiting) && tr.waiting[n].End <= until {
		n++
	}
	ready := slices.Clone(tr.waiting[:n])
	tr.waiting = slices.Delete(tr.waiting, 0, n)
	for _, w := range ready {
		tr.emit(w)
	}
}
