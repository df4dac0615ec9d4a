package harmony

import "slices"

// One microphone splits a held chord at every moment a voice is heard or
// lost: a slow attack whose partial surfaces as a voice for a moment (choir
// aahs), a voice entering late, released early or lost under the others.
// The piece beside the chord is no chord of its own to a musician, who
// reads the chord's tuning where all its members hold; read from an
// attack, a release or a voice lost, its members lie cents from where the
// chord holds. So for voices heard on one channel a stretch shorter than
// FragmentSeconds beside one at least that long whose notes hold all of
// its notes, or all of whose notes it holds, is part of that chord, not a
// chord of its own. Players each on their own channel are not read so:
// their entries and releases are the players'.

// FragmentSeconds: a piece of a held chord shorter than it is no chord of
// its own. Half a second, more than the estimator's window and a hop
// (0.46 s, multipitch), over which one onset or release stays in its
// readings. A voice's attack, early release or loss split the rendered
// woodwind quartet's and the cello and choir aahs' chords so, for 0.37 and
// 0.47 s (cmd/fifthline TestVoicesOfUntunedScenes, measured).
const FragmentSeconds = 0.5

// span is a stretch's place and its players' notes (stretchKey), as a
// fragment's neighbour.
type span struct {
	start, end float64
	key        []string
	open       bool // still sounding: end is the least it may reach
}

// spanOf is stretch c's span.
func spanOf(c Chord, notes []Note) span {
	return span{start: c.Start, end: c.End, key: stretchKey(c.Notes, notes)}
}

// stretchKey is the stretch's players and notes, sorted: two stretches
// with the same key hold the same notes.
func stretchKey(idx []int, notes []Note) []string {
	key := make([]string, 0, len(idx))
	for _, k := range idx {
		key = append(key, notes[k].Who+"="+notes[k].Note.String())
	}
	slices.Sort(key)
	return key
}

// long: the span is a chord's, not a fragment's.
func (s span) long() bool { return s.end-s.start >= FragmentSeconds }

// contains: every note of b sounds in a (both keys sorted).
func contains(a, b []string) bool {
	for _, k := range b {
		if _, ok := slices.BinarySearch(a, k); !ok {
			return false
		}
	}
	return true
}

// partOf: s is a piece of the chord beside it, nb (nil: none).
func (s span) partOf(nb *span) bool {
	if nb == nil || s.long() || !nb.long() || (nb.end != s.start && nb.start != s.end) {
		return false
	}
	return contains(nb.key, s.key) || contains(s.key, nb.key)
}

// fragment: s, between prev and next (nil: no stretch there), is a piece
// of either.
func (s span) fragment(prev, next *span) bool { return s.partOf(prev) || s.partOf(next) }

// withoutFragments drops the stretches that are pieces of a chord beside
// them.
func withoutFragments(runs []Chord, notes []Note) []Chord {
	return whole(runs, spansOf(runs, notes), nil, nil)
}

// spansOf is each run's span.
func spansOf(runs []Chord, notes []Note) []span {
	spans := make([]span, len(runs))
	for i, c := range runs {
		spans[i] = spanOf(c, notes)
	}
	return spans
}

// whole is the runs (spans: theirs) that are no piece of a chord beside
// them; before and after are the stretches either side of them all (nil:
// none).
func whole(runs []Chord, spans []span, before, after *span) []Chord {
	var out []Chord
	for i, c := range runs {
		prev, next := before, after
		if i > 0 {
			prev = &spans[i-1]
		}
		if i+1 < len(runs) {
			next = &spans[i+1]
		}
		if !spans[i].fragment(prev, next) {
			out = append(out, c)
		}
	}
	return out
}
