package pitchdetect

import "math"

// A note entering over a quieter sound that goes on under it: a player's
// channel still holding some of the neighbours' bleed after cleaning, a
// reverberant tail, a drone. The window's taper gives the newest samples,
// where the entry is, little weight, so for the first frames the older
// sound fills most of the spectrum. Its partials that the entering note's
// comb does not explain passed the guard's test for a lower fundamental,
// and where the detector had read the older sound as a held note, the
// entry on one of its harmonics was kept at the held pitch (the guard's
// held-note rule, and tracking from the last pitch): a soprano's G4
// entering over what was left of the bass's C3 (its third harmonic) read
// C3 and its sub-octaves (FluidR3 voice oohs with bleed, measured: two
// frames late), and a G4 swelling in over a steady C3 20–40 dB under it
// began 53 ms late (TestAQuietEntryOverLeftoverBleedStartsOnTime). So at
// an entry over a pitch read before it the NSDF is read afresh, and
// partials no stronger than the older sound could make by itself move no
// pitch.
//
// The entry begins where the newest eighth first stands out of the older
// sound, frames before the span's ends lie entryDB apart, and a pitch read
// since then is the entering note's own: a slurred note's first frames,
// over the fading tail of the note before it, read the new note. Counted
// from where the ends lay entryDB apart instead, a flute's D6 slurred from
// B5 was taken for the older sound (FluidR3, measured), and the fresh
// readings moved the hops at which the NSDF is refreshed: the C6 slurred
// after it was then tracked at D6 for three frames and read 8.5 ¢ from its
// sound's median (TestASlurredNoteReadAtItsFirstFramesIsTracked).

// entryDB: a span whose oldest eighth is this much quieter than its newest
// holds a sound entering over whatever the oldest eighth holds (the
// onset test below asks for 20 dB; an entry over bleed rises less).
const entryDB = 10.0

// spanEnds returns the mean power of the span's oldest and newest eighths,
// worked out once a frame (noteEntry) and kept in d.ends.
func (d *Detector) spanEnds() (first, last float64) {
	return d.ends[0], d.ends[1]
}

// measureEnds works out the mean power of the span's oldest and newest
// eighths.
func (d *Detector) measureEnds() (first, last float64) {
	n := len(d.lin) / 8
	for i, v := range d.lin[:n] {
		w := d.lin[len(d.lin)-n+i]
		first += v * v
		last += w * w
	}
	return first / float64(n), last / float64(n)
}

// entering reports whether the span holds an entry: its oldest eighth
// entryDB quieter than its newest.
func (d *Detector) entering() bool {
	return isEntry(d.spanEnds())
}

// isEntry reports whether span ends of these powers hold an entry.
func isEntry(first, last float64) bool {
	return first < last*entryRatio
}

// entryRatio is entryDB as a power ratio.
var entryRatio = math.Pow(10, -entryDB/10)

// standOutRatio: a newest eighth with this many times the power of the
// older sound holds at least as much of the entering note as of it (3 dB).
const standOutRatio = 2.0

// noteEntry keeps the power of this frame's newest eighth, and sets
// d.entryRun: 0 when the span holds no entry, else the frames, this one
// included, whose newest eighth stands out of the older sound (the span's
// oldest eighth now) since the entry began.
func (d *Detector) noteEntry() {
	first, last := d.measureEnds()
	d.ends = [2]float64{first, last}
	d.newest[d.frameNo%len(d.newest)] = last
	d.frameNo++
	d.entryRun = 0
	if !isEntry(first, last) {
		return
	}
	for d.entryRun < min(d.frameNo, len(d.newest)) {
		if d.newest[(d.frameNo-1-d.entryRun)%len(d.newest)] < standOutRatio*first {
			break
		}
		d.entryRun++
	}
}

// overOlderPitch reports whether the span holds an entry and the last
// frames' pitch was read before the entry began: the quieter sound's, not
// the entering note's (which, read at its own first frames, is tracked).
func (d *Detector) overOlderPitch() bool {
	return d.entryRun > 0 && d.held.frames >= d.entryRun
}

// onsetInSpan reports whether the span's oldest eighth is more than 20 dB
// quieter than its newest: a note has started inside it.
func (d *Detector) onsetInSpan() bool {
	first, last := d.spanEnds()
	return first < 0.01*last
}

// underlay returns the power the quieter sound of an entry (the span's
// oldest eighth, taken to go on under the whole window) puts in this
// frame's spectrum, in the units of d.power; 0 when the span holds no
// entry. It is an upper bound on what that sound gives any set of
// partials.
func (d *Detector) underlay() float64 {
	if !d.entering() {
		return 0
	}
	first, _ := d.spanEnds()
	var under, windowed float64
	for i, w := range d.win {
		x := d.lin[d.lag+i] // frame B, the one d.power holds
		under += w * w * first
		windowed += w * w * x * x
	}
	if windowed <= 0 {
		return 0
	}
	total := 0.0
	for _, p := range d.power {
		total += p
	}
	return total * min(under/windowed, 1)
}

// moreThanUnder reports whether the power of partials that F does not
// explain, extra, is more than need and more than the quieter sound the
// span began with could hold by itself: what sounded before an entry and
// goes on under it (a leftover bleed, the held note it was) does not pull
// the entering note to a fundamental of its own.
func (d *Detector) moreThanUnder(extra, need float64) bool {
	return extra > need && extra > d.under
}
