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
	from       float64 // every chord ending before it has been given
	begun      bool
}

// Add takes a note that has ended.
func (s *Stream) Add(n Note) { s.notes = append(s.notes, n) }

// From is the earliest time a chord still to be given can read frames
// from: frames before it are no longer needed.
func (s *Stream) From() float64 {
	if !s.begun {
		return math.Inf(-1)
	}
	return s.from
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
		s.from, s.begun = math.Inf(-1), true
	}
	horizon -= s.Reach
	if horizon <= s.from {
		return nil, nil
	}
	notes := s.notes
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
	if last := len(runs) - 1; last >= 0 && runs[last].End == horizon {
		next, runs = runs[last].Start, runs[:last]
	}
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
