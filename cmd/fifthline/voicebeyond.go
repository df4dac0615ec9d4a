package main

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"

	"fifthline/harmony"
	"fifthline/multipitch"
	"fifthline/target"
)

// More voices than --voices N asked for: the contract speaks of a channel
// holding up to N voices and is silent on more. The estimator always hears
// up to four, so a voice left out is still fitted with the others and its
// partials neither pull a voice reported nor pass for one (with the
// estimator held to two, E3 B3 G♯4 read as a phantom E2 under G♯4, E2's 3rd
// partial on B3). The N loudest are reported; the others are kept aside
// only to check the chords: a chord is named from the voices reported only
// where the whole sounding chord has the same name (B3 and G♯4 of E3 B3 G♯4
// are E major without its root, not G♯ minor); otherwise it gets no rows
// (in a file, and as heard with listen --chords), and a file's warning says
// why. A voice whose track so far the tracker would drop as a lower
// voice's partials is no voice: it yields its place to every voice held as
// one, however quiet (E3's 3rd partial read as B4, louder than the flute's
// B5 over E3 G4 B5, put B5 out), and is not counted among those left out.

// heardVoices is how many voices the estimator hears whatever --voices asks.
const heardVoices = 4

// keepGain is how much louder (amplitude) a voice must be than one reported
// in the frame before to take its place: equal voices would otherwise swap
// from frame to frame and break each other's notes.
const keepGain = 1.4 // 3 dB

// leftOut caps frames to the voices asked for and keeps what it left out.
type leftOut struct {
	asked  int
	record bool        // keep the frames for names (--chords)
	last   []float64   // the voices reported in the frame before
	frames []float64   // every frame's time
	at     []float64   // times of the frames that left voices out
	hz     [][]float64 // their voices left out
	counts map[int]int // frames by the number of voices sounding, octaves apart
	// judge follows every voice heard, the capped ones too, to say which
	// are a lower voice's partials as their notes would be judged
	// (tracker.heldSoFar): over a track's frames, since a real voice
	// can be marked so in single frames. Nil: no voice is judged so.
	judge *tracker
	// aside: the voices left out of the frame last capped (voicelost.go).
	aside []float64
}

// cap keeps the asked number of the voices vs of the frame at time at, the
// loudest (a voice reported in the frame before counting keepGain louder;
// a lower voice's partials below every voice held as one), lowest first.
func (l *leftOut) cap(at float64, vs []multipitch.Voice) []multipitch.Voice {
	if l.record {
		l.frames = append(l.frames, at)
	}
	// Each voice's track is held long enough for a note (without a judge,
	// every one), and that note would be a lower voice's partials.
	held, partial := make([]bool, len(vs)), make([]bool, len(vs))
	for i := range held {
		held[i] = true
	}
	if l.judge != nil {
		l.judge.push(multipitch.Frame{Time: at, Voices: slices.Clone(vs)})
		held, partial = l.judge.heldSoFar()
	}
	l.aside = l.aside[:0]
	if len(vs) <= l.asked {
		l.last = append(l.last[:0], voicesHz(vs)...)
		return vs
	}
	weight := make([]float64, len(vs))
	voices := math.Inf(1) // the quietest voice held as one
	for i, v := range vs {
		weight[i] = v.Amplitude
		if slices.ContainsFunc(l.last, func(hz float64) bool { return math.Abs(1200*math.Log2(v.Hz/hz)) < 50 }) {
			weight[i] *= keepGain
		}
		if held[i] && !partial[i] {
			voices = min(voices, weight[i])
		}
	}
	// A partial yields to every voice held as one, however quiet; so does
	// a reading too new to be judged that this frame marks as a lower
	// voice's partials (the open voicing's B4 on E3's 3rd partial, as the
	// E minor begins, took the held G4's place). Between readings too new
	// to be judged, loudness decides (a partial read as B4 is likelier the
	// chord's than a passing one, G4's 3rd read as D6).
	for i, v := range vs {
		if partial[i] || !held[i] && v.OnPartials {
			weight[i] = min(weight[i], math.Nextafter(voices, 0))
		}
	}
	order := make([]int, len(vs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(weight[b], weight[a]) })
	var kept, left []multipitch.Voice
	var counted []bool // which of left count as voices sounding
	for n, i := range order {
		switch {
		case n < l.asked:
			kept = append(kept, vs[i])
		case !partial[i]:
			left, counted = append(left, vs[i]), append(counted, held[i])
			l.aside = append(l.aside, vs[i].Hz)
		}
	}
	if l.record && len(left) > 0 {
		l.left(at, vs, left, counted)
	}
	out := vs[:0] // in place, lowest first as they came
	for _, v := range vs {
		if slices.ContainsFunc(kept, func(k multipitch.Voice) bool { return k.Hz == v.Hz }) {
			out = append(out, v)
		}
	}
	l.last = append(l.last[:0], voicesHz(out)...)
	return out
}

// left notes the voices left out of the frame at time at, of all vs; of
// them, those counted are voices sounding (the others are passing
// readings, too new to be judged, which the warning does not count).
func (l *leftOut) left(at float64, vs, left []multipitch.Voice, counted []bool) {
	l.at = append(l.at, at)
	l.hz = append(l.hz, voicesHz(left))
	// An octave above another voice is that voice doubled, not one more.
	more := 0
	for k, v := range left {
		if counted[k] && !slices.ContainsFunc(vs, func(lo multipitch.Voice) bool { return multipitch.OctaveAbove(v.Hz, lo.Hz) }) {
			more++
		}
	}
	if l.counts == nil {
		l.counts = map[int]int{}
	}
	l.counts[l.asked+more]++
}

// forget drops the frames before the given time, which no chord still to
// be named reads (listening keeps flat memory).
func (l *leftOut) forget(before float64) {
	i, _ := slices.BinarySearch(l.frames, before)
	j, _ := slices.BinarySearch(l.at, before)
	l.frames, l.at, l.hz = slices.Delete(l.frames, 0, i), slices.Delete(l.at, 0, j), slices.Delete(l.hz, 0, j)
}

func voicesHz(vs []multipitch.Voice) []float64 {
	hz := make([]float64, len(vs))
	for i, v := range vs {
		hz[i] = v.Hz
	}
	return hz
}

// names reports whether chord c, named from the voices reported, is named
// the same with the notes left out over at least half of its stretch (each
// at the mean of its frames, in cents) added to its members.
func (l *leftOut) names(c harmony.Chord, tu target.Tuning, seventh float64) bool {
	from, to := c.Start+harmony.Edge, c.End-harmony.Edge
	type heard struct {
		frames int
		log2   float64
	}
	notes := map[target.Note]*heard{}
	for i, at := range l.at {
		if at < from || at > to {
			continue
		}
		for _, hz := range l.hz[i] {
			n := tu.Classify(hz).Note
			if notes[n] == nil {
				notes[n] = &heard{}
			}
			notes[n].frames++
			notes[n].log2 += math.Log2(hz)
		}
	}
	var hz []float64
	for _, m := range c.Members {
		hz = append(hz, m.Hz)
	}
	lo, _ := slices.BinarySearch(l.frames, from)
	hi, _ := slices.BinarySearch(l.frames, to)
	added := false
	for _, h := range notes {
		if 2*h.frames >= hi-lo {
			hz, added = append(hz, math.Exp2(h.log2/float64(h.frames))), true
		}
	}
	if !added {
		return true
	}
	slices.Sort(hz)
	whole, ok := tu.NameChord(hz, seventh)
	return ok && whole.Name() == c.Name()
}

// named keeps the chords the voices left out do not rename, and warns on
// w when more voices than asked for sounded for half a second or more.
func (l *leftOut) named(w io.Writer, path string, chords []harmony.Chord, tu target.Tuning, seventh float64) []harmony.Chord {
	kept := slices.DeleteFunc(chords, func(c harmony.Chord) bool { return !l.names(c, tu, seventh) })
	if len(l.frames) < 2 {
		return kept
	}
	hop := (l.frames[len(l.frames)-1] - l.frames[0]) / float64(len(l.frames)-1)
	most, over := 0, 0 // the most sounding for half a second, and the frames over
	for n := heardVoices; n > l.asked; n-- {
		if over += l.counts[n]; most == 0 && float64(over)*hop >= 0.5 {
			most = n
		}
	}
	if most == 0 {
		return kept
	}
	msg := fmt.Sprintf("fifthline: warning: %s: %d voices sounded at once, more than the %d asked for; the %d loudest are reported (--voices auto hears up to %d)", path, most, l.asked, l.asked, heardVoices)
	if unnamed := len(chords) - len(kept); unnamed == 1 {
		msg += "; 1 chord they make without the others is not named"
	} else if unnamed > 1 {
		msg += fmt.Sprintf("; %d chords they make without the others are not named", unnamed)
	}
	fmt.Fprintln(w, msg)
	return kept
}
