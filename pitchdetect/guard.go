package pitchdetect

import "math"

// The octave and fifth guard. A period pick can land on a multiple or a
// fraction of the true period when the fundamental is weak (bassoon, low
// brass, cello C string), when even partials dominate, or when a strong
// third partial makes 2/3 of the period look periodic. The guard asks the
// spectrum two questions about a candidate F:
//
//   - down: does a lower G = F·p/q (1/2, 1/3, 2/3) have real partials that
//     F does not explain (peaks at odd multiples of F/2, etc.)? Then G is the
//     fundamental.
//   - up: are F's odd partials missing while its even ones are present?
//     Then F is an octave low (an odd-only spectrum such as a clarinet's is
//     the opposite case and keeps F). And is F no fundamental at all — no
//     partial at F itself, and little beyond the multiples of 2F or 3F? A
//     slur's frames hold the end of one note and the start of the next, and
//     together they can repeat at a period neither has (an oboe's A4 slurred
//     to B4 reads E3, B4/3, for a whole span): what F explains is then 2F's
//     or 3F's series plus a few partials of the other note.

// guardExtraRatio is the share of F's harmonic power that unexplained
// partials of a lower candidate must reach before the pitch moves down.
// guardHeldRatio is the same for F that is a held note's pitch when the
// lower candidate's own partial is weak (under guardBleedOwn of F's
// power): a note does not fall to its own subharmonic, and a neighbour's
// bleed left on a player's channel makes a few per cent (a flute's A4 over
// the bassoon's and clarinet's D3 and D4 read D4 for 5–9 % of unexplained
// power, D4's own partial 0.05–0.5 %: FluidR3, one pass with bleed,
// measured), while a note slurred to under it soon has more power than the
// old one. A held misreading an octave high is left as before: the true
// note's fundamental is strong (a violin's D6 read D7 across a slur).
const (
	guardExtraRatio = 0.05
	guardHeldRatio  = 0.25
	guardBleedOwn   = 0.01
)

// guardOddRatio: below this share of even-partial power, odd partials count
// as missing and the pitch moves an octave up.
const guardOddRatio = 0.01

// guardAbsent: a partial below this share of the comb's power is absent;
// guardStray: partials off the series of 2F or 3F below this share are the
// other note of a slur, not F's own; guardSweepCents: how far from F its
// own partial may peak (see own).
//
// guardHeldAbsent is guardAbsent for a held note: its fundamental may fade
// under a strong formant and still be its own. FluidR3's bassoon D3, a few
// frames after its attack, has its fundamental at 0.06–0.1 % of its power,
// 3F and 6F at 81 %, 2F and 4F at 17 % (measured), and was read as the D4
// and A4 of a slur for 0.2 s. A slur's shared period has no partial of its
// own at all, held or not (a violin's G4 slurred to B4 at G2).
const (
	guardSweepCents = 50.0
	guardAbsent     = 1e-3
	guardHeldAbsent = 1e-4
	guardStray      = 0.25
	guardMaxK       = 9 // a whole tone's notes repeat together at 1/8 and 1/9 of them
)

var guardDown = [...]struct{ p, q int }{{1, 2}, {1, 3}, {2, 3}}

// peakNear returns the power of a spectral peak within a bin of f, or 0 if
// the spectrum has no local maximum there above the floor.
func (d *Detector) peakNear(f float64) float64 {
	return d.peakWithin(f, 1)
}

// peakWithin is peakNear searching reach bins either side of f.
func (d *Detector) peakWithin(f float64, reach int) float64 {
	p := d.power
	c := int(f/d.binHz + 0.5)
	best := 0.0
	for b := max(c-reach, 1); b <= c+reach && b < len(p)-1; b++ {
		if p[b] >= p[b-1] && p[b] >= p[b+1] && p[b] > best {
			best = p[b]
		}
	}
	if best < d.floor {
		return 0
	}
	return best
}

// own is the power of f's own partial, the peak at f. A high note's
// fundamental swept by a wide vibrato within the window peaks where it is
// loudest, and its second partial where that one is: up to the vibrato's
// full width apart (a violin's C♯6 and D6, ±25 ¢ at 5 Hz: 38 and 51 ¢ below
// half the second partial; FluidR3, measured), so it is looked for that far.
func (d *Detector) own(f float64) float64 {
	return d.peakWithin(f, max(1, int(f*guardSweepCents/centsPerUnit/d.binHz+0.5)))
}

// combPower sums peak power at multiples j·g (j ≥ 1) below the analysis
// ceiling; skip, if non-zero, leaves out every multiple j with j%skip == 0.
func (d *Detector) combPower(g float64, skip int) float64 {
	sum := d.own(g)
	for j := 2; float64(j)*g < d.ceilHz && j <= maxPartials; j++ {
		if skip > 0 && j%skip == 0 {
			continue
		}
		sum += d.peakNear(float64(j) * g)
	}
	return sum
}

// resolvedBins is the partial spacing, in bins, from which the spectrum
// separates neighbouring partials: the Blackman–Harris main lobe (±4 bins)
// plus a bin of search. Closer partials are judged in the time domain.
const resolvedBins = 5.5

// NSDF margins for the unresolved (low) case: the lag of a lower candidate
// must be clearly more periodic than the pick, the lag of a higher one about
// as periodic.
const (
	nsdfDownMargin = 0.04
	nsdfUpMargin   = 0.01
	// and the lower candidate's lag must itself be clearly periodic.
	nsdfDownClarity = 0.9
)

// guard returns the corrected fundamental and its period in samples for a
// coarse period pick.
func (d *Detector) guard(period float64) (float64, float64) {
	f := d.fs / period
	resolved := resolvedBins * d.binHz
	if k := d.harmonicOfHeld(f); k > 1 && d.held.hz >= resolved &&
		d.moreThanUnder(d.combPower(d.held.hz, k), guardExtraRatio*d.combPower(f, 0)) {
		// The comb is seeded where the note was, as while tracking it:
		// a partial of a note still settling need not lie at k·F.
		f, period = d.held.hz, d.refineLag(d.fs/d.held.hz)
	}
	for range 3 { // a few moves at most: F/4 is two octave moves
		moved := false
		k := 1
		if 2*f <= d.maxHz && d.missingOdd(f, period, resolved) {
			k = 2
		} else if f >= resolved {
			k = d.noFundamental(f, d.heldAt(f))
		}
		if k > 1 {
			f, period = float64(k)*f, d.refineLag(period/float64(k))
			moved = true
		}
		for _, c := range guardDown {
			g := f * float64(c.p) / float64(c.q)
			if g < d.minHz || (g >= resolved && d.noFundamental(g, false) > 1) {
				continue
			}
			lower := period * float64(c.q) / float64(c.p)
			var down bool
			if f/float64(c.q) >= resolved {
				// Multiples of g that are also multiples of f are those
				// with j·p/q integral, i.e. j % q == 0 (p, q coprime).
				all, ratio := d.combPower(f, 0), guardExtraRatio
				if d.heldAt(f) && d.own(g) < guardBleedOwn*all {
					ratio = guardHeldRatio
				}
				down = d.moreThanUnder(d.combPower(g, c.q), ratio*all)
			} else {
				nl := d.nsdfAt(lower)
				down = nl > d.nsdfAt(period)+nsdfDownMargin && nl >= nsdfDownClarity
			}
			if down {
				f, period = g, d.refineLag(lower)
				moved = true
				break
			}
		}
		if !moved {
			break
		}
	}
	return f, period
}

// guardHeldFrames is how many frames must read one pitch (within the
// segmenter's notion of one, 50 ¢), missing no more than guardHeldGap in a
// row, before it is a held note to the guard: a misreading's run is
// shorter (a slur's shared period lasts a frame or two), and a note
// settling after its attack may lose a frame to the tracking pick
// (FluidR3's bassoon D3: measured).
const (
	guardHeldFrames = 4
	guardHeldGap    = 2
)

// heldNote is the note the last frames read: its pitch, how many frames
// read it, and how many since have read nothing.
type heldNote struct {
	hz       float64
	frames   int
	unvoiced int
}

// heldAt reports whether f is the pitch of a held note.
func (d *Detector) heldAt(f float64) bool {
	return d.held.frames >= guardHeldFrames && onePitch(f, d.held.hz)
}

// remember notes the frame's pitch (0: unvoiced or silent) for the next.
func (d *Detector) remember(hz float64) {
	d.prevHz = hz
	h := &d.held
	switch {
	case hz <= 0:
		if h.unvoiced++; h.unvoiced > guardHeldGap {
			*h = heldNote{}
		}
		return
	case onePitch(hz, h.hz):
		h.frames++
	default:
		h.frames = 1
	}
	h.hz, h.unvoiced = hz, 0
}

// harmonicOfHeld returns k when f is the kth harmonic (2 ≤ k ≤ guardMaxK)
// of a held note, else 1. A fresh period pick in a held note can land on a
// strong partial whose period the note's own repeats (FluidR3's bassoon G2
// read at its 5th partial, B4, for 0.1 s after its attack: measured), and
// the guard's moves down reach F/3 at most; the held note is still
// sounding while its partials off kF's series do (guardExtraRatio, as for
// any move down).
func (d *Detector) harmonicOfHeld(f float64) int {
	h := d.held
	if h.frames < guardHeldFrames {
		return 1
	}
	k := math.Round(f / h.hz)
	if k < 2 || k > guardMaxK || !onePitch(f, k*h.hz) {
		return 1
	}
	return int(k)
}

// onePitch reports whether a and b lie within 50 ¢.
func onePitch(a, b float64) bool {
	return a > 0 && b > 0 && math.Abs(centsPerUnit*math.Log(a/b)) < 50
}

// missingOdd reports whether f's odd partials are absent while its even ones
// are present, so that f is an octave low.
func (d *Detector) missingOdd(f, period, resolved float64) bool {
	if f < resolved {
		return d.nsdfFresh && d.nsdfAt(period/2) >= d.nsdfAt(period)-nsdfUpMargin
	}
	odd, even := d.oddEven(f)
	return even > 0 && odd < guardOddRatio*even
}

// nsdfAt is the NSDF's highest value within a sample of a fractional lag,
// or -1 outside the computed range.
func (d *Detector) nsdfAt(lag float64) float64 {
	c := int(lag + 0.5)
	if !d.nsdfFresh || c < 1 || c+1 >= len(d.nsdfOut) {
		return -1
	}
	return max(d.nsdfOut[c-1], d.nsdfOut[c], d.nsdfOut[c+1])
}

// refineLag moves a fractional lag to the parabolic top of the NSDF peak
// within two samples of it.
func (d *Detector) refineLag(lag float64) float64 {
	n := d.nsdfOut
	c := int(lag + 0.5)
	if !d.nsdfFresh || c < 2 || c+2 >= len(n) {
		return lag
	}
	k := c
	for j := c - 2; j <= c+2; j++ {
		if n[j] > n[k] {
			k = j
		}
	}
	for k > 0 && k+1 < len(n) && (n[k-1] > n[k] || n[k+1] > n[k]) && k > c-4 && k < c+4 {
		if n[k-1] > n[k+1] { // climb to the local maximum
			k--
		} else {
			k++
		}
	}
	p, _ := parabolicPeak(n, k)
	return p
}

// oddEven sums peak power over the odd and the even multiples of f.
func (d *Detector) oddEven(f float64) (odd, even float64) {
	all := d.combPower(f, 0)
	odd = d.combPower(f, 2)
	return odd, all - odd
}

// noFundamental returns k when a resolved f is no fundamental but kF is:
// f has no partial of its own (held: f is a held note's pitch), and of the
// series of 2F … guardMaxK·F the one holding most of its comb's power holds
// all but a stray share; else 1.
func (d *Detector) noFundamental(f float64, held bool) int {
	all := d.combPower(f, 0)
	absent := guardAbsent
	if held {
		absent = guardHeldAbsent
	}
	if all <= 0 || d.own(f) >= absent*all {
		return 1
	}
	best, stray := 1, guardStray*all
	for k := 2; k <= guardMaxK && float64(k)*f <= d.maxHz; k++ {
		if off := d.combPower(f, k); off < stray {
			best, stray = k, off
		}
	}
	if best == 2 && d.oddPartials(f, all) >= 2 {
		return 1 // a weak fundamental, not a slur's common period
	}
	return best
}

// guardOddPresent is the share of the comb's power that makes one of the
// partials 3F, 5F, 7F present.
const guardOddPresent = 0.005

// oddPartials counts which of 3F, 5F and 7F are present. A tone whose
// fundamental is filtered away (a low voice or a bassoon through a small
// loudspeaker or a thin sample) keeps them, and its pitch is still F (the
// missing fundamental; common practice in psychoacoustics). A slur's two
// notes that repeat together at F hold 2F's and 3F's series, where 5F and
// 7F have nothing.
func (d *Detector) oddPartials(f, all float64) int {
	n := 0
	for _, j := range []float64{3, 5, 7} {
		if j*f <= d.maxHz && d.peakNear(j*f) >= guardOddPresent*all {
			n++
		}
	}
	return n
}
