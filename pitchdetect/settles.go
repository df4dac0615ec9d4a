package pitchdetect

import (
	"cmp"
	"math"
	"slices"
)

// settleSeconds is how much of a long note's steady part says where its
// reading begins (Held.Settled): an attack's glide into the pitch (some
// 0.15 s on a trumpet) or a vibrato starting late (vibratoLate) is over
// well within it, and what the note does later cannot move it. A reader of
// chords then knows it once the note has sounded that long (Settles), not
// only at its end: a bass held under four chords would otherwise hold back
// the first and every one after it.
const settleSeconds = 1.5

// judgedEarly says whether a note's Settled is judged on its steady part's
// first settleSeconds alone: its steady part, from first (the time of its
// first frame), reaches hi, and its frames read for a glide reach until,
// both past that. Both only grow as the note goes on, so once an open note
// is judged early, so is the note it ends as.
func judgedEarly(first, hi, until float64) bool {
	return min(hi, until) >= first+settleSeconds
}

// settlesAt is Settled for a note judged early: fr are its steady part's
// frames within settleSeconds of the first, of which the first wobble may
// precede a glide (glide), and how many of them are that glide, and how
// much of it a reading leaves out (glideAfter). It reads them in cents
// from the first frame, so an open note and the note it ends as read them
// alike.
func (s *Segmenter) settlesAt(fr []Estimate, wobble int) (glide int, out, at float64) {
	s.jt, s.jc = s.jt[:0], s.jc[:0]
	for _, e := range fr {
		s.jt = append(s.jt, e.Time)
		s.jc = append(s.jc, 1200*math.Log2(e.Hz/fr[0].Hz))
	}
	glide, out = s.glideAfter(fr, s.jc, wobble)
	at = s.jt[glide]
	if !findVibrato(s.jt, s.jc, s.Window).ok {
		if v, k := s.lateVibrato(s.jt, s.jc); v.ok {
			at = max(at, s.jt[k])
		}
	}
	return glide, out, at
}

// earlyFrames is how many of fr, from the first, lie within settleSeconds
// of it.
func earlyFrames(fr []Estimate) int {
	m := 0
	for m < len(fr) && fr[m].Time <= fr[0].Time+settleSeconds {
		m++
	}
	return m
}

// Settles tells, while a note is open, where its reading will begin (the
// Settled of the note it ends as), once that no longer depends on how it
// goes on: its steady part has lasted settleSeconds. Once known it is
// kept for the note, so asking on every frame costs little.
func (s *Segmenter) Settles() (at float64, ok bool) {
	fr := s.frames
	if len(fr) == 0 {
		return 0, false
	}
	if s.settles.known && s.settles.start == fr[0].Time {
		return s.settles.at, true
	}
	h := Held{Start: fr[0].Time, End: fr[len(fr)-1].Time}
	lo, hi, _ := s.steadyFrom(fr, h)
	i, _ := slices.BinarySearchFunc(fr, lo, func(e Estimate, t float64) int { return cmp.Compare(e.Time, t) })
	if i >= len(fr) || !judgedEarly(fr[i].Time, hi, h.End-s.Window/2) {
		return 0, false
	}
	early := fr[i:][:earlyFrames(fr[i:])]
	_, _, at = s.settlesAt(early, s.wobble(early, h.Start))
	s.settles = settles{start: h.Start, at: at, known: true}
	return at, true
}

// steadyFrom is where the steady part of the open note h (frames fr) may
// begin and end: ends, after the slur it came from (slurredFrom, which
// also says whether a quick slurred note holds part of a vibrato's cycle).
func (s *Segmenter) steadyFrom(fr []Estimate, h Held) (lo, hi float64, turning bool) {
	lo, hi = s.ends(fr, h)
	if s.from.hz != 0 {
		lo, turning = s.slurredFrom(fr, h)
	}
	return lo, hi, turning
}

// wobble is how many of a steady part's first frames fr come before a note
// starting at start could begin its steady part after a rest (a Window, or
// Margin, after its first frame): a glide may start past them.
func (s *Segmenter) wobble(fr []Estimate, start float64) int {
	w := 0
	for w < len(fr) && fr[w].Time < start+s.margin() {
		w++
	}
	return w
}

// settles is what Settles found for the open note beginning at start.
type settles struct {
	start, at float64
	known     bool
}
