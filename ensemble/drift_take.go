package ensemble

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"fifthline/harmony"
	"fifthline/target"
)

// Sounding is a held note as the drift over a take needs it.
type Sounding struct{ Start, End, Hz float64 }

// DriftPoint is the group's drift around a time (seconds): the median of
// the samples of the DriftSeconds centred there.
type DriftPoint struct{ Time, Cents float64 }

// TakeDrift is the group's drift over a whole take, and how its chords
// were tuned inside themselves.
type TakeDrift struct {
	Points []DriftPoint // in time order
	Inside Inside
}

// DriftOver reads the drift over a take from its held notes (any order):
// a moment every DriftTick seconds holding the notes sounding then, less
// each note's first and last chordEdge (an attack or a release is not the
// group's pitch), through the same estimator the live reading uses. Each
// point stands at the middle of the moments it is the median of, so a
// steady sag is read where it happened, not DriftSeconds/2 late, from
// the take's start to its end.
func DriftOver(notes []Sounding, tu target.Tuning, seventh float64) TakeDrift {
	notes = slices.DeleteFunc(slices.Clone(notes), func(n Sounding) bool {
		return !(n.Hz > 0 && n.End >= n.Start && n.End-n.Start <= maxHeldSeconds && math.Abs(n.Start) < maxTakeSeconds) || math.IsInf(n.Hz, 0)
	})
	if len(notes) == 0 {
		return TakeDrift{}
	}
	slices.SortFunc(notes, func(a, b Sounding) int { return cmp.Compare(a.Start, b.Start) })
	d := NewDrift(tu, seventh)
	var out TakeDrift
	var active []Sounding
	var hz []float64
	t0, heard, next := notes[0].Start, math.Inf(-1), 0 // heard: the latest end among the notes begun
	for k := 0; ; k++ {
		t := t0 + (float64(k)+0.5)*DriftTick
		if len(active) == 0 && t > heard+DriftSeconds { // silence for a whole window
			if next == len(notes) {
				break // the last windows, shrinking, have reached the take's end
			}
			// On to the first moment of the next note (never back).
			k = max(k, int(math.Ceil((notes[next].Start-t0)/DriftTick-0.5)))
			for t = t0 + (float64(k)+0.5)*DriftTick; t < notes[next].Start; t = t0 + (float64(k)+0.5)*DriftTick {
				k++
			}
		}
		for ; next < len(notes) && notes[next].Start <= t; next++ {
			active = append(active, notes[next])
			heard = max(heard, notes[next].End)
		}
		active = slices.DeleteFunc(active, func(n Sounding) bool { return n.End < t })
		hz = hz[:0]
		for _, n := range active {
			if t >= n.Start+harmony.Edge && t <= n.End-harmony.Edge {
				hz = append(hz, n.Hz)
			}
		}
		d.Moment(t, hz)
		if c, centre, ok := d.window(); ok {
			out.Points = append(out.Points, DriftPoint{centre, c})
		}
	}
	out.Inside = d.Chords()
	return out
}

// maxHeldSeconds: a journal row held longer than this is damaged, not a
// note (and would keep the reading busy for nothing).
const maxHeldSeconds = 600

// maxTakeSeconds bounds a note's time within its take (a year): beyond
// it, a tenth of a second is lost in the float's rounding.
const maxTakeSeconds = 365 * 24 * 3600

// At is the drift around t: the point nearest t, if one lies within
// DriftSeconds/2 of it.
func (td TakeDrift) At(t float64) (float64, bool) {
	i, _ := slices.BinarySearchFunc(td.Points, t, func(p DriftPoint, t float64) int { return cmp.Compare(p.Time, t) })
	best, found := 0, false
	for _, k := range []int{i - 1, i} {
		if k >= 0 && k < len(td.Points) && (!found || math.Abs(td.Points[k].Time-t) < math.Abs(td.Points[best].Time-t)) {
			best, found = k, true
		}
	}
	if !found || math.Abs(td.Points[best].Time-t) > DriftSeconds/2 {
		return 0, false
	}
	return td.Points[best].Cents, true
}

// Ends are the first and last points: where the group started and where it
// ended up.
func (td TakeDrift) Ends() (first, last DriftPoint, ok bool) {
	if len(td.Points) == 0 {
		return first, last, false
	}
	return td.Points[0], td.Points[len(td.Points)-1], true
}

// Words state the drift over the take, start to end, apart from how its
// chords were tuned inside themselves, in one line.
func (td TakeDrift) Words() string {
	first, last, ok := td.Ends()
	if !ok {
		return "group drift: not known (too little sounded)"
	}
	over := target.Span(time.Duration((last.Time - first.Time) * float64(time.Second)))
	// The move is between the ends as written, to the tenth: 1.95 → 0.04
	// reads "2.0 ¢ sharp → 0.0 ¢", and a move of 1.9 beside it reads wrong.
	tenth := func(c float64) float64 { return math.Round(c*10) / 10 }
	from, to := tenth(first.Cents), tenth(last.Cents)
	s := fmt.Sprintf("group drift %s → %s over %s (moved %s)", flatSharp(from), flatSharp(to), over, flatSharp(to-from))
	var inside []string
	if in := td.Inside; in.NThirds > 0 {
		inside = append(inside, fmt.Sprintf("thirds %.1f ¢", in.Thirds))
	}
	if in := td.Inside; in.NFifths > 0 {
		inside = append(inside, fmt.Sprintf("fifths %.1f ¢", in.Fifths))
	}
	if len(inside) == 0 {
		return s + "; no thirds or fifths in chords heard"
	}
	return s + "; inside the chords, apart from it: " + strings.Join(inside, ", ") + " from just on average, either way"
}

// flatSharp says cents in words: "3.2 ¢ flat", "0.0 ¢".
func flatSharp(c float64) string {
	switch {
	case c <= -0.05:
		return fmt.Sprintf("%.1f ¢ flat", -c)
	case c >= 0.05:
		return fmt.Sprintf("%.1f ¢ sharp", c)
	}
	return "0.0 ¢"
}
