package target

import (
	"math"
	"sort"
)

// A take played in another tuning than the one declared (a forgotten --a4
// 415, a wrong key) reads as plausible notes all the same, only the wrong
// ones: a whole G major scale at A4 = 415 Hz reads at 440 Hz as F♯, G♯, A♯…
// a steady 1 ¢ off. TakeCheck says when that seems to be so, and which key
// and reference would explain the notes.

// FitCents is how near its target a note must be to count as fitting a
// tuning: well inside the 50 ¢ that separate neighbouring readings, wide
// enough for ordinary playing.
const FitCents = 15

// Reference pitches a group is likely to use, the likeliest first (common
// practice): ISO 16, Baroque, the modern orchestras', Classical, high and
// low Baroque. The fit starts its search from each, as well as from the
// declared one, and prefers them in this order where notes fit equally.
var commonA4 = []float64{440, 415, 442, 430, 466, 392}

// commonness is the place in commonA4 of the reference within 20 ¢ of a4,
// or len(commonA4) for none.
func commonness(a4 float64) int {
	for i, c := range commonA4 {
		if math.Abs(Cents(a4/c)) <= 20 {
			return i
		}
	}
	return len(commonA4)
}

// TakeCheck is what the held notes of one take say about the declared
// tuning.
type TakeCheck struct {
	Notes      int
	OutOfScale int     // notes read as spellings outside the key's scale
	Offset     float64 // median cents of the notes from their targets
	Steady     int     // notes within SteadyCents of Offset
	Fits       int     // notes that fit the declared tuning (in scale, within FitCents)
	Best       Tuning  // the key and reference that fit most notes
	BestFits   int
	// AtA4 is the key that fits as many notes as Best at the declared
	// reference (within 20 ¢ of it), where Best moved the reference: a take
	// in A♭ major at 440 fits C major at 466 as well, and a player who
	// left --key out more likely forgot the key than the pitch. HasAtA4 is
	// false when none does.
	AtA4    Tuning
	HasAtA4 bool
}

// SteadyCents is how close to their common offset notes must sit for the
// offset to count as steady.
const SteadyCents = 7

// CheckTake reads the held pitches (hertz) of one take in t and looks for a
// key of t's mode and a reference that fit them better.
func (t Tuning) CheckTake(hz []float64) TakeCheck {
	t.Chord = nil
	c := TakeCheck{Notes: len(hz), Best: t}
	if len(hz) == 0 {
		return c
	}
	cents := make([]float64, 0, len(hz))
	for _, h := range hz {
		r := t.Classify(h)
		if !t.Key.inScale(r.Note) {
			c.OutOfScale++
		}
		cents = append(cents, r.Deviation)
	}
	c.Offset = median(cents)
	for _, x := range cents {
		if math.Abs(x-c.Offset) <= SteadyCents {
			c.Steady++
		}
	}
	c.Fits = t.fits(hz)
	c.BestFits = c.Fits
	for fifths := -7; fifths <= 7; fifths++ {
		// The key of t's mode with this many sharps (or flats).
		k := Key{Tonic: noteAt(fifths+int(t.Key.Mode)-1, 4), Mode: t.Key.Mode}
		for _, start := range append([]float64{t.A4}, commonA4...) {
			cand := t
			cand.Key, cand.A4 = k, start
			cand.A4 = cand.settle(hz)
			if !(cand.A4 >= MinA4 && cand.A4 <= MaxA4) {
				continue
			}
			n := cand.fits(hz)
			if n > c.BestFits || n == c.BestFits && c.Best.likelier(cand, t) {
				c.Best, c.BestFits = cand, n
			}
			if math.Abs(Cents(cand.A4/t.A4)) <= 20 && (!c.HasAtA4 || n > c.AtA4.fits(hz) || n == c.AtA4.fits(hz) && c.AtA4.likelier(cand, t)) {
				c.AtA4, c.HasAtA4 = cand, true
			}
		}
	}
	if c.HasAtA4 && (c.AtA4.fits(hz) < c.BestFits || math.Abs(Cents(c.Best.A4/t.A4)) <= 20) {
		c.AtA4, c.HasAtA4 = Tuning{}, false // not as good, or Best itself keeps the reference
	}
	return c
}

// settle moves the reference until the notes' median offset is zero, then
// to the mean offset of the notes that fit, and returns it.
func (t Tuning) settle(hz []float64) float64 {
	cents := make([]float64, len(hz))
	for round := 0; round < 4; round++ {
		for i, h := range hz {
			cents[i] = t.Classify(h).Deviation
		}
		t.A4 *= math.Exp2(median(cents) / 1200)
	}
	sum, n := 0.0, 0
	for _, h := range hz {
		if r := t.Classify(h); t.Key.inScale(r.Note) && math.Abs(r.Deviation) <= FitCents {
			sum += r.Deviation
			n++
		}
	}
	if n > 0 {
		t.A4 *= math.Exp2(sum / float64(n) / 1200)
	}
	return t.A4
}

// fits counts the notes that are in the key's scale and within FitCents
// of their targets.
func (t Tuning) fits(hz []float64) int {
	n := 0
	for _, h := range hz {
		if r := t.Classify(h); t.Key.inScale(r.Note) && math.Abs(r.Deviation) <= FitCents {
			n++
		}
	}
	return n
}

// likelier breaks a tie between two tunings that fit as many notes: the
// declared key first, then fewer accidentals, then the more usual
// reference, then the reference nearer the declared one.
func (t Tuning) likelier(cand, declared Tuning) bool {
	if (cand.Key == declared.Key) != (t.Key == declared.Key) {
		return cand.Key == declared.Key
	}
	if a, b := abs(cand.Key.Signature()), abs(t.Key.Signature()); a != b {
		return a < b
	}
	if a, b := commonness(cand.A4), commonness(t.A4); a != b {
		return a < b
	}
	return math.Abs(Cents(cand.A4/declared.A4)) < math.Abs(Cents(t.A4/declared.A4))
}

// inScale reports whether n is one of the key's seven spellings.
func (k Key) inScale(n Note) bool {
	p := n.Fifths() - k.lowest()
	return p >= 0 && p < 7
}

func median(x []float64) float64 {
	s := append([]float64(nil), x...)
	sort.Float64s(s)
	if len(s)%2 == 1 {
		return s[len(s)/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}
