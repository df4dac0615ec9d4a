package ensemble

import (
	"math"
	"slices"

	"fifthline/target"
)

// Track is one player's pitch frame by frame, as Run heard it on their
// channel (another player's bleed left out), for reading a note's pitch
// within each chord it belongs to: a held common tone moves when the
// chord around it changes.
type Track struct {
	Time, Hz []float64 // voiced frames only, in time order
}

// Add records a frame; unvoiced frames (hz 0) are not kept.
func (tr *Track) Add(t, hz float64) {
	if hz > 0 {
		tr.Time, tr.Hz = append(tr.Time, t), append(tr.Hz, hz)
	}
}

// ChordEdge is how much of a chord's start and end is left out of its
// members' pitches: a new voice's attack, or the last chord's release,
// is not the chord's tuning.
const ChordEdge = 0.06

// MinChordSeconds is the shortest stretch of notes held together that
// counts as a chord: shorter is a passing overlap of two notes.
const MinChordSeconds = 0.15

// Mean is the pitch over [from, to] (the mean of the frames' cents, so a
// vibrato's centre), 0 when no frame was voiced there.
func (tr *Track) Mean(from, to float64) float64 {
	i := sortSearch(tr.Time, from)
	sum, n := 0.0, 0
	for ; i < len(tr.Time) && tr.Time[i] <= to; i++ {
		sum += math.Log2(tr.Hz[i])
		n++
	}
	if n == 0 {
		return 0
	}
	return math.Exp2(sum / float64(n))
}

func sortSearch(xs []float64, x float64) int {
	i, _ := slices.BinarySearch(xs, x)
	return i
}

// Chord is a stretch in which two or more players held notes together,
// and what those notes made.
type Chord struct {
	Start, End float64
	target.HeardChord
	Players []Player // Players[i] plays Members[i]
}

// Chords finds the chords the notes make: every stretch between note
// starts and ends in which two or more players hold notes, at least
// MinChordSeconds long, joined with the next when the same players hold
// the same notes (a note re-sounded inside a chord does not end it). Each
// member's pitch is its player's mean over the stretch, less its edges,
// from tracks (indexed like players); seventh is the minor seventh's just
// ratio. Stretches whose notes make no chord that NameChord knows are
// left out.
func Chords(notes []Note, tracks []Track, players []Player, tu target.Tuning, seventh float64) []Chord {
	var edges []float64
	for _, n := range notes {
		edges = append(edges, n.Held.Start, n.Held.End)
	}
	slices.Sort(edges)
	edges = slices.Compact(edges)
	var out []Chord
	var prev []string // the previous stretch's players and notes, to join with
	for i := 0; i+1 < len(edges); i++ {
		from, to := edges[i], edges[i+1]
		var who []int
		var key []string
		for _, n := range notes {
			if n.Held.Start <= from && n.Held.End >= to {
				p := slices.IndexFunc(players, func(p Player) bool { return p == n.Player })
				if p >= 0 && !slices.Contains(who, p) {
					who = append(who, p)
					key = append(key, n.Player.Name+"="+n.Reading.Note.String())
				}
			}
		}
		if len(who) < 2 {
			prev = nil
			continue
		}
		slices.Sort(key)
		if slices.Equal(key, prev) && len(out) > 0 && out[len(out)-1].End == from {
			out[len(out)-1].End = to
			continue
		}
		prev = key
		out = append(out, Chord{Start: from, End: to, Players: playersOf(players, who)})
	}
	// Name each stretch from its members' pitches over the whole of it.
	named := out[:0]
	for _, c := range out {
		if c.End-c.Start < MinChordSeconds {
			continue
		}
		hz := make([]float64, len(c.Players))
		ok := true
		for i, p := range c.Players {
			k := slices.Index(players, p)
			if hz[i] = tracks[k].Mean(c.Start+ChordEdge, c.End-ChordEdge); hz[i] == 0 {
				ok = false
			}
		}
		if !ok {
			continue
		}
		hc, ok := tu.NameChord(hz, seventh)
		if !ok {
			continue
		}
		c.HeardChord = hc
		order := make([]Player, len(hc.Members))
		for i, m := range hc.Members {
			order[i] = c.Players[m.Index]
		}
		c.Players = order
		named = append(named, c)
	}
	return named
}

func playersOf(players []Player, idx []int) []Player {
	out := make([]Player, len(idx))
	for i, k := range idx {
		out[i] = players[k]
	}
	return out
}
