package harmony

import (
	"math"
	"slices"

	"fifthline/target"
)

// Stream finds the chords of notes heard live, each as soon as no note
// still to come can change it, and forgets the notes no chord still to
// come needs: a long session keeps only what its open chords need, and
// each chord is written while its tuning is still known.
type Stream struct {
	Seventh float64 // the minor seventh's just ratio
	// Join, if set, joins notes before their chords are found (a voice
	// lost for a moment under a chord), a note to one starting less than
	// Reach seconds after it ends: a note still to come may then change
	// the chords Reach seconds before it, and notes are kept that long
	// past what the chords to come need.
	Join  func([]Note) []Note
	Reach float64
	// OneChannel: the notes are voices heard on one channel, as
	// FindOneChannel reads them.
	OneChannel bool
	notes      []Note
	sounding   []Note  // notes still sounding (see Sound)
	last       *span   // the last stretch given, a fragment's neighbour
	from       float64 // every chord ending before it has been given
	settled    float64 // every chord starting before it has been given
	begun      bool
}

// Add takes a note that has ended.
func (s *Stream) Add(n Note) { s.notes = append(s.notes, n) }

// Sound says which notes are sounding now, not yet ended (replacing what
// it said before): a note sure to begin at its Start (pitchdetect's
// Segmenter.Sounding), its Who and Frames, and its Settled once Settles
// (pitchdetect's Segmenter.Settles: a long note's is known once it has
// sounded 1.5 s); its End and Note are not known yet (Hz may say its pitch
// so far, read where it has no Frames). The chords above it that end
// before the horizon are then given without waiting for it to end (a pedal
// held under a run of chords), each reading it over the chord's own
// stretch; the chord it enters on, read from where its attack settled,
// once that is known.
func (s *Stream) Sound(notes []Note) { s.sounding = append(s.sounding[:0], notes...) }

// From is the earliest time a chord still to be given can read frames
// from: frames before it are no longer needed.
func (s *Stream) From() float64 {
	if !s.begun {
		return math.Inf(-1)
	}
	return s.from
}

// Settled is the time before which every chord has been given: a note
// ending by then sounds in no chord still to come, so what the chords
// make of it (its spelling from their roots) is known.
func (s *Stream) Settled() float64 {
	if !s.begun {
		return math.Inf(-1)
	}
	return s.settled
}

// Ready gives the chords that end before horizon, the earliest a note not
// yet added can start (+Inf at the end of the stream), so nothing still to
// come can lengthen, split or join them; their frames must be in before
// it. Each is named in tuning(at), the tuning in force at the chord's
// end, as a note is read in the tuning in force as it ends. Notes[i] of
// each chord indexes the notes returned with them. Chords come as Find
// would give them from all the notes at once, in time order.
func (s *Stream) Ready(horizon float64, tuning func(at float64) target.Tuning) ([]Chord, []Note) {
	if !s.begun {
		s.from, s.settled, s.begun = math.Inf(-1), math.Inf(-1), true
	}
	horizon -= s.Reach
	if horizon <= s.from {
		return nil, nil
	}
	// The sounding notes are joined with the others: the pedal under a
	// chord is what holds a voice's two pieces together (bridgeLost).
	notes, horizon := s.withSounding(s.notes, horizon)
	if horizon <= s.from {
		return nil, nil
	}
	if s.Join != nil {
		notes = s.Join(notes)
	}
	cuts := []float64{s.from, horizon}
	for _, n := range notes {
		for _, t := range [2]float64{n.Start, n.End} {
			if t > s.from && t < horizon {
				cuts = append(cuts, t)
			}
		}
	}
	slices.Sort(cuts)
	cuts = slices.Compact(cuts)
	runs := stretches(notes, cuts)
	// The stretch reaching the horizon may go on: it waits, and so does
	// everything from its start. Without one, what follows the last cut
	// sounds fewer than two notes.
	next := cuts[len(cuts)-2] // the last cut before the horizon
	settled := horizon
	var held *span // the first stretch held back, if any
	if last := len(runs) - 1; last >= 0 && runs[last].End == horizon {
		held = &span{start: runs[last].Start, end: horizon, key: stretchKey(runs[last].Notes, notes), open: true}
		next, runs = runs[last].Start, runs[:last]
		settled = next
	}
	// A chord that a sounding note enters on waits until where that
	// note's attack settled is known, and so do the chords after it
	// (chords come in time order).
	for i, c := range runs {
		if slices.ContainsFunc(c.Notes, func(k int) bool {
			return math.IsInf(notes[k].End, 1) && entersOn(notes[k], c) && !notes[k].Settles
		}) {
			sp := spanOf(c, notes)
			held = &sp
			next, runs, settled = c.Start, runs[:i], c.Start
			break
		}
	}
	if s.OneChannel {
		runs, next, settled = s.withoutFragments(runs, notes, held, next, settled)
	}
	s.settled = max(s.settled, settled)
	var out []Chord
	for _, c := range runs {
		if named, ok := name(c, notes, tuning(c.End), s.Seventh, s.OneChannel); ok {
			out = append(out, named)
		}
	}
	s.from = next
	s.notes = slices.DeleteFunc(slices.Clone(s.notes), func(n Note) bool { return n.End <= next-s.Reach })
	for _, n := range s.notes {
		if n.Frames != nil {
			n.Frames.Forget(next)
		}
	}
	return out, notes
}

// withSounding adds the sounding notes to notes, lasting past any horizon
// (End +Inf). Where one begins just as its player's last note ended, the
// two may join one chord or not as its name, still unknown, decides: the
// horizon is held at its start. With Join, a note that ended less than
// Reach before one begins, near its pitch so far, may be joined to it as
// its name decides: the horizon is held as for a note still to come
// beginning there.
func (s *Stream) withSounding(notes []Note, horizon float64) ([]Note, float64) {
	if len(s.sounding) == 0 {
		return notes, horizon
	}
	notes = slices.Clone(notes)
	for _, n := range s.sounding {
		if slices.ContainsFunc(notes, func(o Note) bool { return o.Who == n.Who && o.End == n.Start }) {
			horizon = min(horizon, n.Start)
		}
		if s.Join != nil && slices.ContainsFunc(notes, func(o Note) bool { return mayJoin(o, n, s.Reach) }) {
			horizon = min(horizon, n.Start-s.Reach)
		}
		n.End = math.Inf(1)
		notes = append(notes, n)
	}
	return notes, horizon
}

// sameCents is how near a note heard again lies to its pitch before: a
// held note goes on within 50 ¢ of its recent pitch (pitchdetect's
// Segmenter.JumpCents). A semitone's step (E3 to F3 over a pedal) is
// another note.
const sameCents = 50

// mayJoin: sounding note n may turn out to be o heard again (Join): o
// ended less than reach before n began, and n's pitch so far, where told,
// is within sameCents of o's.
func mayJoin(o, n Note, reach float64) bool {
	if o.End > n.Start || o.End <= n.Start-reach {
		return false
	}
	return n.Hz <= 0 || o.Hz <= 0 || math.Abs(1200*math.Log2(n.Hz/o.Hz)) < sameCents
}

// withoutFragments leaves out the stretches to be given that are pieces of
// a chord beside them (fragment.go), as FindOneChannel does: the one before
// the first was given already (s.last), the one after the last is held back
// (nil: none), and while that one may yet grow long enough to make the last
// a piece of it, the last is held back too.
func (s *Stream) withoutFragments(runs []Chord, notes []Note, held *span, next, settled float64) ([]Chord, float64, float64) {
	spans := spansOf(runs, notes)
	if last := len(runs) - 1; last >= 0 && held != nil && held.open && !held.long() && held.start == spans[last].end &&
		!spans[last].long() && (contains(held.key, spans[last].key) || contains(spans[last].key, held.key)) {
		next, settled = runs[last].Start, runs[last].Start
		runs, spans = runs[:last], spans[:last]
	}
	out := whole(runs, spans, s.last, held)
	if len(spans) > 0 {
		s.last = &spans[len(spans)-1]
	}
	return out, next, settled
}
