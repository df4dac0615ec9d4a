package pitchdetect

import (
	"cmp"
	"math"
	"slices"
)

// vibratoRefresh is how many new frames Current waits before refitting;
// liveSeconds is how much of the held note's end it describes.
const (
	vibratoRefresh = 8
	liveSeconds    = 4.0
)

// summarise describes the frames of the open note; live reuses a recent
// vibrato fit; next is the first frame's time of the note slurred on from
// it, 0 if none follows without a gap.
func (s *Segmenter) summarise(live bool, next float64) Held {
	slurred := next > 0
	fr := s.frames
	h := Held{Start: fr[0].Time, End: fr[len(fr)-1].Time, Frames: len(fr)}
	if live {
		// While the note is held, its last few seconds: what the player is
		// doing now, at a cost that does not grow with a long note (a drone
		// exercise may hold one for minutes). A finished note is
		// summarised whole, once.
		i, _ := slices.BinarySearchFunc(fr, h.End-liveSeconds, func(e Estimate, t float64) int { return cmp.Compare(e.Time, t) })
		fr = fr[i:]
	}
	ref := fr[len(fr)/2].Hz
	// Steady part: frames whose whole window lies inside the note. A
	// detector voices a frame once part of its window holds a note, so a
	// note's first and last Window seconds of frames reach past its onset
	// and offset. A slur lies after the old note's last frame (the frames
	// whose window holds both notes are read as neither), and a frame's
	// window reaches half a Window either side of it: the new note's own
	// frames begin half a Window after that frame, and the old note's end
	// half a Window before it. (Ending a Window before it, a quick note
	// whose pitch still moves lost its later frames: FluidR3's violin's
	// high eighths read 6.3 ¢ on average from the median pitch they sound
	// over their length, 3.9 ¢ so; measured.) Margin, where set, replaces
	// the Window at the note's ends.
	// turning: a quick slurred note holding part of a vibrato's cycle.
	lo, hi, turning := s.steadyFrom(fr, h)
	quick := hi // a quick note with none such: to half a Window before a slur
	if slurred {
		quick = h.End - s.Window/2
	}
	i, j := steady(fr, lo, hi, quick)
	// A slurred note with a steady part by the rule above is read on to
	// half a Window before its end, or turning, to its end.
	long := slurred && fr[j-1].Time <= hi
	for long && j < len(fr) && (turning || fr[j].Time <= quick) {
		j++
	}
	// A slurred note whose frames move one way only has no turn of a
	// vibrato in them: it is read on to half a Window before the next
	// note's first frame, as its own frames began half a Window after the
	// last note's. One still drifting there has no settled part: its pitch
	// is the median of those frames, its whole sound's. (Cut half a Window
	// before its own end, a trumpet's sixteenth, rising some 20 ¢ through
	// its length, read its attack: 2–11 ¢ below the median pitch its sound
	// has; FluidR3, measured.) A note's last frame, whose window holds the
	// slur, is pulled toward the next note: one drifting away from it turns
	// back there and is read as before. One entering after silence is
	// judged, and read, from half a Window after its first frame, as a
	// slurred note's own frames begin: the first frame's window holds the
	// onset, and those before its frames lie inside the note hold the
	// detector's jitter over the silence before it. (Judged on all its
	// frames, a trumpet's first sixteenth rising 27 ¢ stepped back 0.3 ¢
	// between its second and third frames, was read on its steady part's
	// last three frames alone and 3.8 ¢ sharp of the median pitch its
	// sound has; over the hop's eight phases its runs' sixteenths gained
	// 18 notes within 2 ¢ of that; FluidR3, measured.)
	moves := drifts(fr)
	onset := 0 // after silence, the first frame half a Window in
	if !slurred && !live {
		moves = drifts(s.beforeRelease(fr))
	} else if slurred && s.from.hz == 0 {
		for onset < len(fr)-1 && fr[onset].Time < h.Start+s.margin()/2 {
			onset++
		}
		moves = drifts(fr[onset:])
	}
	drifting := slurred && moves
	for drifting && j < len(fr) && fr[j].Time <= next-s.Window/2 {
		j++
	}
	if drifting && s.from.hz == 0 {
		i = min(i, onset)
	}
	s.t, s.c = s.t[:0], s.c[:0]
	for _, e := range fr[i:j] {
		s.t = append(s.t, e.Time)
		s.c = append(s.c, 1200*math.Log2(e.Hz/ref))
	}
	// Whether the note settled after a glide is judged on its frames up to
	// half a Window before its end: a quick note's steady part may end in a
	// vibrato's trough, where half a cycle looks like a settled glide (a
	// violin's 0.3 s C6 read 11 ¢ low: FluidR3, measured). A slurred note
	// read on to there, if its steady part lasts less than the slowest
	// vibrato's cycle, is judged on all its frames: the same C6 settled in
	// a trough five frames long at one phase of the hop, and read 22 ¢ low.
	n := len(s.c)
	until := h.End - s.Window/2
	if long && s.t[n-1]-s.t[0] < 1/vibratoMinRate {
		until = h.End
	}
	for _, e := range fr[j:] {
		if e.Time > until {
			break
		}
		s.c = append(s.c, 1200*math.Log2(e.Hz/ref))
	}
	// The glide may start as late as a note after a rest starts its
	// steady part (a Window, or Margin, after its first frame), past a wobble.
	// A long note's is judged on its first settleSeconds alone (settles.go).
	settled, judged := 0.0, n > 0 && judgedEarly(s.t[0], hi, until)
	var g int
	out := 1.0 // how much of the glide the mean leaves out (glideAfter)
	if judged {
		early := fr[i:][:earlyFrames(fr[i:])]
		g, out, settled = s.settlesAt(early, s.wobble(early, h.Start))
	} else {
		g, out = s.glideAfter(fr[i:], s.c, s.wobble(fr[i:j], h.Start))
	}
	if s.c = s.c[:n]; g >= n || turning {
		g = 0
	}
	mean, sd := meanStd(s.c[g:])
	if g > 0 && out < 1 {
		whole, _ := meanStd(s.c)
		mean = out*mean + (1-out)*whole
	}
	// A slurred note that moves one way and holds only for its last frames,
	// fewer than its glide's, spent most of its sound on the way: a
	// listener's pitch for it is the median of its frames, not the pitch it
	// reached (a trumpet's D4 sixteenth, rising 18 ¢ until just before the
	// next note, read 7 ¢ above the median pitch its sound has; FluidR3,
	// measured). One that holds twice as long as it glided settled there;
	// in between, the glide is left out in proportion, as scoop.go leaves
	// out an attack, so that a hop's phase moving one frame from the glide
	// to the hold moves the reading a little, not from one rule to the
	// other. (FluidR3's trumpet, flute and oboe runs over the hop's eight
	// phases: 1586 -> 1587 of 1792 within 2 ¢ of their sound's median, on
	// average 0.976 -> 0.972 ¢ from it; measured.)
	if drifting && g == 0 {
		mean = s.median(s.c)
	} else if (slurred || s.from.hz != 0) && moves && g > 0 {
		held := min(max(float64(n-g)/float64(g)-1, 0), 1)
		mean = held*mean + (1-held)*s.median(s.c)
	}
	h.Spread = sd
	if h.Settled = h.Start; judged {
		h.Settled = settled
	} else if g < n {
		h.Settled = s.t[g]
	}
	h.Hz = ref * math.Pow(2, mean/1200)
	if n := len(s.frames); !live || n >= s.vibAt+vibratoRefresh || n < s.vibAt {
		s.vib, s.vibAt = findVibrato(s.t, s.c, s.Window), len(s.frames)
		if k := 0; !s.vib.ok && !live {
			if s.vib, k = s.lateVibrato(s.t, s.c); s.vib.ok && !judged {
				h.Settled = max(h.Settled, s.t[k])
			}
		}
		s.vibHz = ref * math.Pow(2, s.vib.centre/1200)
	}
	if s.vib.ok {
		h.Hz, h.VibratoWidth, h.VibratoRate = s.vibHz, s.vib.width, s.vib.rate
	}
	return h
}
