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
// any such stretch, a glide into a note is not steady on its way, and a
// held note's slow drift moves less than StepCents in that time.
//
// Measured on FluidR3 (fluidsynth), G♯4 and A♭4 in ¼-comma meantone played
// one after the other without a break (MIDI key 68 retuned by pitch bend)
// on twelve instruments, both ways: 17 of 24 are two notes (the violin's
// and viola's ±15–25 ¢ vibrato and the flute's and recorder's wavering of
// some ±9 ¢ hold no steady side); a 30 ¢ step, 9
// of 12; a 20 ¢ step, none. Their held notes, two seconds each across
// their range on sixteen instruments, split nowhere at StepCents 20 and
// over: the largest steps inside a note were a viola's, 18–20 ¢, and a
// bassoon's B♭4 attack holding 16–18 ¢ off its pitch.
const (
	// stepCents (StepCents by default) lies above the commas a player
	// moves a held note by to tune it — the syntonic comma, 81/80 =
	// 21.51 ¢, and the Pythagorean comma, 23.46 ¢ (common practice): such a
	// correction is the same note better tuned — and below the lesser
	// diesis.
	stepCents = 25.0
	// stepHoldSeconds (StepHold by default) is longer than half the
	// cycle of the slowest vibrato (vibratoMinRate: 0.17 s), so no crest
	// or trough of one holds that long on frames a few ms apart, and than the bassoon's attack above (held 0.2 s,
	// its step read 20–22 ¢: measured).
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
	for j := a - 1; j > 0 && fr[a].Time-fr[j].Time <= s.Window+s.Hop+stepGlideSeconds; j-- {
		if _, before, ok := s.heldSince(j+1, ref); ok && math.Abs(before-after) >= s.StepCents {
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
	lo, hi := math.Inf(1), math.Inf(-1)
	s.jc = s.jc[:0]
	for _, e := range fr[i:] {
		c := s.cents(e, ref)
		lo, hi = min(lo, c), max(hi, c)
		s.jc = append(s.jc, c)
	}
	if hi-lo > 2*stepSteadyCents {
		return 0, 0, false
	}
	m := s.median(s.jc)
	return i, m, m-lo <= stepSteadyCents && hi-m <= stepSteadyCents
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
