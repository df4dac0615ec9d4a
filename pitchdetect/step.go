package pitchdetect

import (
	"cmp"
	"math"
	"slices"
)

// A step in pitch smaller than JumpCents that holds is two notes: in
// ¼-comma meantone G♯4 and A♭4 lie a lesser diesis apart (128/125, 41.06 ¢:
// common practice), and a player moving from one to the other without a
// break plays two spellings. What tells such a step from the movements
// inside one note is that it holds: the frames on each side stay within
// stepSteadyCents of their own median for stepHoldSeconds, and the two
// medians lie StepCents or more apart, with no more between them than the
// frames whose window holds both (a Window) and the new note's attack
// gliding into its pitch (stepGlideSeconds). A vibrato swings on through
// any such stretch (a side with one is judged by its centre: vibratoStep),
// a glide into a note is not steady on its way, and a held note's slow
// drift moves less than StepCents in that time.
//
// Measured on FluidR3 (fluidsynth), G♯4 and A♭4 in ¼-comma meantone played
// one after the other without a break (MIDI key 68 retuned by pitch bend)
// on twelve instruments (clarinet, oboe, trumpet, horn, tenor sax,
// bassoon, voice oohs, violin, viola, cello, flute, recorder), both ways:
// by steady sides alone 16 of 24 were two notes, the bowed strings'
// ±10–16 ¢ vibrato and the flute's wavering of some ±7 ¢ holding no steady
// side; with sides judged by their centre over a vibrato's cycle (below)
// 22 of 24 are, and the recorder's, wandering one way then the other by
// some 15 ¢ and at no rate, still holds none. A 30 ¢ step, 9 of 12 (of
// an earlier twelve); a 20 ¢ step, none. Their held notes, two seconds
// each across their range on sixteen instruments, split nowhere at
// StepCents 20 and over, with either kind of side: the largest steps
// inside a note were a viola's, 18–20 ¢, and a bassoon's B♭4 attack
// holding 16–18 ¢ off its pitch. With --voices (cmd/fifthline: frames
// 85 ms apart, each side four of them) the same pairs were two notes about
// key 68 on 19 of 24 by steady sides alone and are on all 24 with sides
// judged by the mean of each two frames.
const (
	// stepCents (StepCents by default) lies above the commas a player
	// moves a held note by to tune it — the syntonic comma, 81/80 =
	// 21.51 ¢, and the Pythagorean comma, 23.46 ¢ (common practice): such a
	// correction is the same note better tuned — and below the lesser
	// diesis.
	stepCents = 25.0
	// stepHoldSeconds (StepHold by default) is longer than half the
	// cycle of the slowest vibrato (vibratoMinRate: 0.17 s), so no crest
	// or trough of one holds that long on frames a few ms apart, and
	// longer than the bassoon's attack above (held 0.2 s, its step read
	// 20–22 ¢: measured).
	stepHoldSeconds = 0.25
	// stepSteadyCents: within it, the winds' and the voices' held notes
	// above, whose frames waver a few cents (a trumpet's ±2 ¢, a clarinet's
	// attack settling), hold; within 4 ¢, and with no time for the glide
	// below, 6 of the 24 diesis steps split (measured).
	stepSteadyCents = 10.0
	// stepGlideSeconds: an attack's glide into its pitch, some 0.15 s on a
	// trumpet (settles.go); FluidR3's clarinet rises 10 ¢ over 0.16 s.
	stepGlideSeconds = 0.15
)

// heldStep is the index of the first of the open note's frames that
// begins a note of its own after a held step, or 0 if its frames end in
// none. It is asked on every frame, so it judges only a steady stretch just
// formed: one whose last StepHold seconds of frames are steady and whose
// frame before is not part of it (a steady note held on costs a glance at
// its recent frames).
func (s *Segmenter) heldStep() int {
	fr := s.frames
	n := len(fr)
	if s.StepCents <= 0 || n < 3 {
		return 0
	}
	ref := fr[n-1].Hz
	a, after, ok := s.heldSince(n, ref)
	if !ok || a == 0 || math.Abs(s.cents(fr[a-1], ref)-after) <= stepSteadyCents {
		return 0
	}
	// The held side nearest the step is the one judged: a note drifting
	// one way holds sides a step apart further back, the gap between them
	// its drift too (a recorder's D5 falling 30 ¢ over 0.8 s from its
	// attack, a consort's descant, held sides 25.2 ¢ apart 0.25 s either
	// side of such a gap at one phase of the hop, while the nearest held
	// side before lay 12 ¢ off: measured). A step's sides hold up to it:
	// the steps FluidR3's winds' diesis pairs and sox's sawtooths are
	// split at read the same from the nearest side.
	judged := false
	return s.stepBefore(a, func(j int) bool {
		if judged {
			return false
		}
		_, before, ok := s.heldSince(j+1, ref)
		judged = ok
		return ok && math.Abs(before-after) >= s.StepCents
	})
}

// stepBefore is the index after the latest frame j before the a-th, no
// further back than the frames whose window holds both sides (a Window
// and a Hop) and the new note's glide into its pitch, where held(j) says
// the frames up to j hold a side a step from the one from a on; 0 if none.
func (s *Segmenter) stepBefore(a int, held func(j int) bool) int {
	fr := s.frames
	for j := a - 1; j > 0 && fr[a].Time-fr[j].Time <= s.Window+s.Hop+stepGlideSeconds; j-- {
		if held(j) {
			return j + 1
		}
	}
	return 0
}

// heldSince finds whether the open note's frames up to its end-th
// (exclusive) end in a held stretch: those within StepHold seconds of the
// last, spanning that long, within stepSteadyCents of their median. It
// returns the first one's index and the median, in cents from ref.
func (s *Segmenter) heldSince(end int, ref float64) (first int, median float64, ok bool) {
	fr := s.frames[:end]
	last := fr[end-1].Time
	hold := s.StepHold
	if fr[0].Time > last-hold {
		return 0, 0, false
	}
	i, _ := slices.BinarySearchFunc(fr, last-hold, func(e Estimate, t float64) int {
		return cmp.Compare(e.Time, t)
	})
	// Unvoiced frames are not kept: too few left is no stretch held.
	if float64(end-i)*s.Hop < hold/2 || end-i < 3 {
		return 0, 0, false
	}
	s.jc = s.jc[:0]
	for _, e := range fr[i:] {
		s.jc = append(s.jc, s.cents(e, ref))
	}
	m, ok := s.steadyAbout(s.jc)
	return i, m, ok
}

// steadyAbout is within for frames: a held stretch's.
func (s *Segmenter) steadyAbout(c []float64) (median float64, ok bool) {
	return s.within(c, stepSteadyCents)
}

// within gives the median of c and whether all of c lies within tol of it.
func (s *Segmenter) within(c []float64, tol float64) (median float64, ok bool) {
	lo, hi := slices.Min(c), slices.Max(c)
	if hi-lo > 2*tol {
		return 0, false
	}
	m := s.median(c)
	return m, m-lo <= tol && hi-m <= tol
}

// cents is frame e's pitch in cents from ref.
func (s *Segmenter) cents(e Estimate, ref float64) float64 {
	return 1200 * math.Log2(e.Hz/ref)
}

// stepAt ends the open note before its k-th frame, where a held step
// begins the next, and opens that note with the frames from there.
func (s *Segmenter) stepAt(k int) (Held, bool) {
	s.tail = append(s.tail[:0], s.frames[k:]...)
	s.frames = s.frames[:k]
	h, ok := s.slurOn(s.tail[0], s.tail[len(s.tail)-1].Hz)
	for _, e := range s.tail[1:] {
		s.add(e)
	}
	return h, ok
}

// A side with vibrato holds no frame steady: a violin's ±15–25 ¢ (FluidR3,
// measured) swings past stepSteadyCents either side of its median within a
// cycle. What holds is its centre: the mean of the track over one cycle
// about each moment, at the rate the side's own track swings at, cancels a
// steady vibrato whole, whatever its width, and follows the note's own
// pitch. So a side is also held where, over sideSeconds of frames, the
// track fits a sinusoid at a vibrato's rate (vibratoMinFit) and its
// running centre holds within centreSteadyCents of its median, that median
// being the side's pitch. A step between two such sides (or a steady one
// and such a one) is judged as between two steady ones: the sides
// StepCents apart, with no more than a Window, a Hop and a glide between
// them. A vibrato note's sides share one centre, and a glide or a
// portamento moves the centre, so no side of it holds.
const (
	// sideSeconds spans sideCycles of a vibrato at 3.75 Hz, its centre
	// then held over 0.13 s, and over 0.22 s at 5.5 Hz; a side of 0.6 s
	// keeps 0.5 s clear of the step's smear (a Window).
	sideSeconds = 0.4
	// sideCycles: one cycle gives the running centre, and half of one
	// more the span it holds over.
	sideCycles = 1.5
	// centreSteadyCents: a mean over a cycle wavers far less than a
	// frame. Within it, no side of a 41 ¢ portamento over 0.8 s (51 ¢ a
	// second) holds, as no side of a steady tone's does (stepSteadyCents),
	// while a sawtooth's ±15 ¢ vibrato, and FluidR3's violin's, viola's,
	// cello's and flute's, hold (measured; within ±10 ¢ the portamento
	// split with vibrato, within ±3 ¢ one of 0.5 s did not, as it does
	// steady).
	centreSteadyCents = 4.0
)

// sides caches, for each of the open note's frames, what the sideSeconds
// of frames ending there hold: each frame is judged once, when it comes.
type sides struct {
	at      []side
	t, c    []float64 // each frame's time, and pitch in cents from the first's
	rate    float64   // the vibrato rate last found, Hz; 0: none
	rateAt  int       // at which frame
	centres []float64 // scratch for the running centre
}

// side is what the sideSeconds of frames ending at one frame hold.
type side struct {
	time   float64 // that frame's, to tell the cache is the open note's
	first  int     // the index of the span's first frame
	held   bool
	centre float64 // cents from the note's first frame, which all frames keep
}

// vibratoStep is heldStep for sides judged by their centres: the index of
// the first frame of a note after a held step, or 0.
func (s *Segmenter) vibratoStep() int {
	fr, c := s.frames, &s.sides
	n := len(fr)
	// A new note, or one whose first frames were taken for another,
	// begins afresh (the cache is checked at both ends).
	if k := len(c.at); k > n || k > 0 && (c.at[0].time != fr[0].Time || c.at[k-1].time != fr[k-1].Time) {
		c.at, c.t, c.c, c.rate = c.at[:0], c.t[:0], c.c[:0], 0
	}
	for e := len(c.at); e < n; e++ {
		c.t, c.c = append(c.t, fr[e].Time), append(c.c, s.cents(fr[e], fr[0].Hz))
		c.at = append(c.at, s.sideAt(e))
	}
	after := c.at[n-1]
	if !after.held {
		return 0
	}
	return s.stepBefore(after.first, func(j int) bool {
		b := c.at[j]
		return b.held && math.Abs(b.centre-after.centre) >= s.StepCents
	})
}

// sideAt judges the sideSeconds of the open note's frames ending at its
// e-th.
func (s *Segmenter) sideAt(e int) side {
	fr := s.frames[:e+1]
	last := fr[e].Time
	h := side{time: last}
	if fr[0].Time > last-sideSeconds {
		return h
	}
	i, _ := slices.BinarySearchFunc(fr, last-sideSeconds, func(e Estimate, t float64) int {
		return cmp.Compare(e.Time, t)
	})
	h.first = i
	// Unvoiced frames are not kept: too few left is no side held.
	if float64(e+1-i)*s.Hop < sideSeconds/2 || e+1-i < 4 {
		return h
	}
	cache := &s.sides
	t, c := cache.t[i:e+1], cache.c[i:e+1]
	if h.centre, h.held = s.steadyAbout(c); h.held {
		return h
	}
	centres := cache.centres[:0]
	if len(c) < 8 {
		// Too few frames to fit a vibrato to: frames far apart, as the
		// voice tracker's, 85–93 ms, about half a bowed vibrato's cycle,
		// so that they alternate crest and trough (cmd/fifthline). The
		// mean of each two is the running centre.
		for k := 1; k < len(c); k++ {
			centres = append(centres, (c[k-1]+c[k])/2)
		}
		cache.centres = centres
		h.centre, h.held = s.within(centres, centreSteadyCents)
		return h
	}
	// The periodogram scan is most of a side's cost, and a vibrato's rate
	// changes slowly: one found lately serves until it no longer fits.
	if cache.rate == 0 || e-cache.rateAt >= vibratoRefresh {
		mean, _ := meanStd(c)
		cache.rate, cache.rateAt = vibratoRate(t, c, mean), e
	}
	r := cache.rate
	if dur := t[len(t)-1] - t[0]; dur*r < sideCycles {
		cache.rate = 0
		return h
	}
	if _, _, _, fit := fitSinusoid(t, c, r); fit < vibratoMinFit {
		cache.rate = 0
		return h
	}
	half := 0.5 / r
	for _, tk := range t {
		if tk-half >= t[0] && tk+half <= t[len(t)-1] {
			centres = append(centres, spanMean(t, c, tk-half, tk+half))
		}
	}
	cache.centres = centres
	if len(centres) == 0 {
		return h
	}
	h.centre, h.held = s.within(centres, centreSteadyCents)
	return h
}
