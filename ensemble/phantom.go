package ensemble

import "math"

// A phantom below: before the bleed between two channels is weighed,
// nothing of the neighbour is subtracted, and a player's note together
// with a neighbour's bleed repeats at the period both share. A cello's D3
// entering under the viola's A3 (2:3) is read as D2 on the cello's own
// channel until the cello is some 20 dB louder than the bleed: its
// harmonics sound loudest on the cello's channel, so the ownership test
// keeps it. The phantom shows in its harmonics: those that are the
// player's note (the even ones, for an octave) sound, the others lie on
// the neighbour's partials or are silent. A real D2 sounds its own odd
// harmonics (its fundamental, fifth, seventh) wherever the neighbour is.

// phantomDB is how far below the harmonics of the note above those of
// the phantom alone must lie. Measured on a rendered cello's D3 under a
// viola's A3 (FluidR3): 25–40 dB once the note has begun, the main lobes
// of the note's own partials three bins away leaking into them. A real
// note's odd harmonics lie well within 20 dB of its even ones (a saw's
// fundamental and seventh: 1 and 1/49 in power against 1/4, 1/16, 1/36,
// 1/64), and a note with no odd harmonics at all is the note above.
const phantomDB = 20.0

// A neighbour too quiet for its bleed to reach phantomDB of the note
// shares no period with it: taken at the loudest bleed there is
// (maxBleedGain), its harmonics on its own channel must stand within
// phantomDB of the note's on c. Else a note whose odd harmonics are weak
// reads as the twelfth above: a bassoon's D3, its third partial its
// strongest, read A4 while a clarinet entered pianissimo on D4 (FluidR3,
// velocity 32 under 96).

// phantom tells whether a pitch hz read on channel c is the period its
// own note, an octave or a twelfth above (k·hz), shares with the bleed of
// a neighbour whose bleed on c is not weighed yet (unweighed(d)) and may
// be heard (above): the neighbour's pitch is m·hz, m prime to k, and of
// hz's harmonics those that are neither the note's nor the neighbour's are
// silent. It returns k, or 0. pitches are the players' readings this
// frame, by channel.
func (o *Owner) phantom(c int, hz float64, pitches []float64, unweighed func(d int) bool) int {
	if !o.have[c] || !(hz > 0) {
		return 0
	}
	const all = 1<<ownHarmonics - 1
	for k := 2; k <= 3; k++ {
		above := multiples(k) // the harmonics of hz that are the note k·hz's
		var next uint16       // those that are a neighbour's m·hz's
		for d, p := range pitches {
			m := math.Round(p / hz)
			if d == c || !(p > 0) || m < 2 || int(m)%k == 0 || !unweighed(d) || math.Abs(1200*math.Log2(p/(m*hz))) > partialCents {
				continue
			}
			if maxBleedGain*maxBleedGain*o.Power(d, p)*math.Pow(10, phantomDB/10) < o.Power(c, float64(k)*hz) {
				continue // too quiet to share a period with the note
			}
			next |= multiples(int(m))
		}
		alone := all &^ above &^ next
		if next == 0 || alone == 0 {
			continue // no neighbour shares the period, or nothing left to tell
		}
		if o.power(c, hz, all&^alone)*math.Pow(10, phantomDB/10) < o.power(c, hz, all&^above) {
			return k
		}
	}
	return 0
}

// multiples marks (bit h−1) the harmonics h of a pitch, up to
// ownHarmonics, that are harmonics of its k-th.
func multiples(k int) (mask uint16) {
	for h := k; h <= ownHarmonics; h += k {
		mask |= 1 << (h - 1)
	}
	return mask
}

// A phantom on a partial: the same period, where the neighbour sounds
// below and the pitch read lies on one of its partials, so that every
// harmonic of it is the neighbour's too and none is silent to tell by.
// A flute's A5 entering with a bassoon's D3, whose third partial is its
// strongest, read A4 for 0.15 s before the pair's bleed was weighed
// (FluidR3, bleed 15–25 dB down): on the flute's channel A4's odd
// harmonics, which are not A5's, lay 17 dB under the bassoon's channel
// there, and 14–18 dB under A5's harmonics. So where the harmonics of
// hz that are not the note above's sound ownDB louder on another channel
// (they are its bleed, as Bleed judges a whole pitch), and on c ownDB
// under those of the note above (the player's sound is that note's), the
// note is the one above. A note of the player's own sounds its odd
// harmonics on its own channel (a clarinet's most of all); a note that
// sounds only its even ones is the note above. The frame is given away
// rather than read k times higher: its period holds the neighbour's
// partial too, and so read the flute's A5 took in frames 4 ¢ flat and
// read 1.1 ¢ flat of the part alone (the note begins where it is read
// whole, as attack.go's frames do).

// phantomOnPartial tells whether hz read on channel c is the period its
// note k·hz shares with the bleed of a neighbour not yet weighed on c,
// on one of whose partials hz lies (pitches: the players' readings this
// frame, by channel).
func (o *Owner) phantomOnPartial(c int, hz float64, pitches []float64, unweighed func(d int) bool, ownDB float64) bool {
	if !o.have[c] || !(hz > 0) {
		return false
	}
	below := false
	for d, p := range pitches {
		j := math.Round(hz / p)
		below = below || d != c && p > 0 && j >= 1 && unweighed(d) && math.Abs(1200*math.Log2(hz/(j*p))) < partialCents
	}
	if !below {
		return false
	}
	const all = 1<<ownHarmonics - 1
	for k := 2; k <= 3; k++ {
		above := multiples(k) // power(…, skip) leaves these out: it weighs the rest
		if o.power(c, hz, above)*math.Pow(10, ownDB/10) < o.power(c, hz, all&^above) && o.louderElsewhere(c, hz, above, ownDB) {
			return true
		}
	}
	return false
}

// A phantom inside a held note: before the bleed is weighed, a chord whose
// members are all harmonics of a period below the player's note (G major
// over a bass's G2: B3, D4 and G4 are G1's fifth, sixth and eighth) can
// make the player's channel repeat at that period for a frame or two while
// the player holds the note. FluidR3's voice oohs, a choir's G2 entering
// with the chord, read G1 for two frames 0.18 s in at two of eight phases
// of the hop, splitting the note (measured; alone it never did). Its odd
// harmonics did not lie the 20 dB (phantomDB) under its even ones that
// phantom asks: the voices' vibrato and breath fill them (6.7 dB). What
// tells it instead is the player's own recent note, k times the pitch
// read. A real leap down a twelfth or an octave while the neighbours
// sound that period's harmonics loses its first frames to this, until
// the bleed is weighed or the leap is a window old.

//
// The same happens in a note's attack with the bleed weighed: the
// neighbours entering with it are subtracted only as well as their own
// attacks let the learned delay match, and what is left of them with the
// attack repeats at their shared period. FluidR3's voice oohs, a choir's
// bass D3 entering under the tenor's and alto's A3 3.3 s in, read D2 for
// 7 frames after 3 of D3 at one of eight phases of the hop, a note of its
// own (measured; alone, and with bleed at the other phases, it read D3
// throughout). Under a window into the note, a real leap an octave or a
// twelfth down is not likely; past it, weighed bleed is trusted.

// phantomHeld tells whether hz read on channel c is the period shared,
// with the bleed of a neighbour not yet weighed (pitches: the players'
// readings this frame, by channel; the neighbour's a whole multiple of
// hz), by the note held (the player's pitch heard within the last
// window), an octave or a twelfth above. In the held note's attack
// (attack: heard for under a window without a break) the neighbour's
// bleed may be weighed.
func phantomHeld(c int, hz, held float64, attack bool, pitches []float64, unweighed func(d int) bool) bool {
	if !(hz > 0) || !(held > 0) {
		return false
	}
	k := math.Round(held / hz)
	if k < 2 || k > 3 || math.Abs(1200*math.Log2(held/(k*hz))) > partialCents {
		return false
	}
	for d, p := range pitches {
		m := math.Round(p / hz)
		if d != c && p > 0 && m >= 2 && (attack || unweighed(d)) && math.Abs(1200*math.Log2(p/(m*hz))) < partialCents {
			return true
		}
	}
	return false
}

// sharedPeriod is phantomHeld for the player's own note and attack; in the
// attack a reading within partialCents of the last pitch so given away is
// that phantom still, its pitch moving with the attacks beneath it (the
// bass's D2 read 72.05 Hz while the tenor's A3 rose to 220.66, 36 ¢ off
// its third harmonic; measured).
func (v *voice) sharedPeriod(c int, hz float64, pitches []float64, unweighed func(d int) bool) bool {
	attack := v.inAttack()
	if phantomHeld(c, hz, v.recent, attack, pitches, unweighed) ||
		attack && v.ghost > 0 && hz > 0 && math.Abs(1200*math.Log2(hz/v.ghost)) < partialCents {
		v.ghost = hz
		return true
	}
	return false
}

// onset counts the frames since the player's latest note was first heard:
// a pitch heard after none within a window (recent, before this frame's),
// or more than partialCents from it, begins one.
func (v *voice) onset(hz, recent float64) {
	v.since++
	if hz > 0 && (!(recent > 0) || math.Abs(1200*math.Log2(hz/recent)) > partialCents) {
		v.since, v.ghost = 0, 0
	}
}

// inAttack tells whether the player's latest note is still in its attack:
// its first frame's span (a window and the detector's lag) holds the frame
// read now, so that span may hold the onset.
func (v *voice) inAttack() bool {
	return v.recent > 0 && v.since*v.det.Hop() <= v.det.Span()
}
