package harmony

import (
	"slices"

	"fifthline/target"
)

// MinSeconds is the shortest stretch of notes held together that counts as
// a chord: shorter is a passing overlap (a voice entering late, a release
// ringing on under the next attack), and too short for players to tune it.
// An eighth at ♩ = 100 lasts 0.3 s (common practice arithmetic).
const MinSeconds = 0.3

// Edge is how much of a chord's start and end is left out of its members'
// pitches: a new voice's attack, or the last chord's release, is not the
// chord's tuning.
const Edge = 0.06

// Note is one held note as the chord finder needs it.
type Note struct {
	Start, End float64
	// Who plays it (a player's name, a voice's number): a stretch joins
	// the one before when the same players hold the same notes.
	Who  string
	Note target.Note // as spelled alone, for the joining rule only
	// Frames are its player's or voice's pitch frame by frame, covering
	// at least the note; nil reads Hz over the whole note instead.
	Frames *Track
	Hz     float64
	// Settled is when the note's own reading begins (pitchdetect's
	// Held.Settled, 0 for none): its attack's glide before is not read.
	Settled float64
	// Settles: a sounding note's Settled is known (pitchdetect's
	// Segmenter.Settles; see Stream.Sound).
	Settles bool
}

// Chord is a stretch in which two or more notes sound together, and what
// they make.
type Chord struct {
	Start, End float64
	target.HeardChord
	// Notes[i] is the index, in the notes given to Find, of the note that
	// sounds Members[i].
	Notes []int
}

// Find names the chords the notes make: every stretch between note starts
// and ends in which two or more notes sound, joined with the next when the
// same players hold the same notes (a note re-sounded inside a chord does
// not end it), at least MinSeconds long. Each member's pitch is read over
// the stretch less its Edge at both ends, so a common tone held across a
// chord change is read within each chord. seventh is the minor seventh's
// just ratio. Stretches whose notes name no chord, or in which a member has
// no voiced frame, are left out. A note held across a chord change is a
// member of both chords.
func Find(notes []Note, tu target.Tuning, seventh float64) []Chord {
	return find(notes, tu, seventh, false)
}

// FindOneChannel is Find for voices heard on one channel, where a note on
// a lower note's harmonic may be that partial (partials.go) and a stretch
// shorter than FragmentSeconds may be a piece of the chord beside it
// (fragment.go).
func FindOneChannel(notes []Note, tu target.Tuning, seventh float64) []Chord {
	return find(notes, tu, seventh, true)
}

func find(notes []Note, tu target.Tuning, seventh float64, oneChannel bool) []Chord {
	var cuts []float64
	for _, n := range notes {
		cuts = append(cuts, n.Start, n.End)
	}
	runs := stretches(notes, cuts)
	if oneChannel {
		runs = withoutFragments(runs, notes)
	}
	var out []Chord
	for _, c := range runs {
		if named, ok := name(c, notes, tu, seventh, oneChannel); ok {
			out = append(out, named)
		}
	}
	return out
}

// stretches are the stretches between the cuts (sorted here) in which two
// or more notes sound, each joined with the next while the same players
// hold the same notes.
func stretches(notes []Note, cuts []float64) []Chord {
	slices.Sort(cuts)
	cuts = slices.Compact(cuts)
	var out []Chord
	var prev []string // the previous stretch's players and notes
	for i := 0; i+1 < len(cuts); i++ {
		from, to := cuts[i], cuts[i+1]
		var idx []int
		for k, n := range notes {
			if n.Start <= from && n.End >= to {
				idx = append(idx, k)
			}
		}
		if len(idx) < 2 {
			prev = nil
			continue
		}
		key := stretchKey(idx, notes)
		if last := len(out) - 1; last >= 0 && out[last].End == from && slices.Equal(key, prev) {
			out[last].End = to
			continue
		}
		prev = key
		out = append(out, Chord{Start: from, End: to, Notes: idx})
	}
	return out
}

// entersOn says whether c is the first chord note n sounds in: it began
// with the chord or less than MinSeconds before, too soon for a chord
// before (players entering together are heard some 0.1 s apart, a
// recorder's or a violin's attack sooner than a bass's).
func entersOn(n Note, c Chord) bool { return n.Start > c.Start-MinSeconds }

// name reads the stretch's members and names their chord, ordering Notes
// like the members (lowest first); oneChannel names it, where its notes name
// none, without a note on another's harmonic (nameLeavingPartial).
func name(c Chord, notes []Note, tu target.Tuning, seventh float64, oneChannel bool) (Chord, bool) {
	if c.End-c.Start < MinSeconds {
		return c, false
	}
	hz := make([]float64, len(c.Notes))
	for i, k := range c.Notes {
		n := notes[k]
		if hz[i] = n.Hz; n.Frames != nil {
			from, to := c.Start+Edge, c.End-Edge
			// A note entering on the chord, from where it settled: its
			// attack's glide is not its tuning (as for the note alone).
			if entersOn(n, c) && n.Settled > from && n.Settled < to {
				from = n.Settled
			}
			hz[i] = n.Frames.Mean(from, to)
		}
		if hz[i] <= 0 {
			return c, false
		}
	}
	hc, ok := tu.NameChord(hz, seventh)
	kept := make([]int, len(hz))
	for i := range kept {
		kept[i] = i
	}
	if !ok && oneChannel {
		hc, kept, ok = nameLeavingPartial(tu, hz, seventh)
	}
	if !ok {
		return c, false
	}
	order := make([]int, len(hc.Members))
	for i, m := range hc.Members {
		order[i] = c.Notes[kept[m.Index]]
	}
	c.HeardChord, c.Notes = hc, order
	return c, true
}
