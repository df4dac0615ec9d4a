package pitchdetect

import "math"

// A player's attack may scoop into a note and swing about before holding
// it, and hold it wavering: a horn's A3 slurred from G3 (FluidR3, General
// MIDI 60) rises 39 ¢ in 0.05 s, overshoots to +5 ¢, swings back to −14 ¢
// and holds −1 to +9 ¢ for its last 0.3 s; a trumpet's C4 slurred from D4
// (56) scoops 25 ¢ and holds within ±1 ¢ but for one dip of 7 ¢. glide
// wants what follows a glide within a quarter of the glide's movement, and
// measures the movement from the first frame the steady part lets in: on a
// scoop that steep, which frame that is moves with the phase of the hop,
// and so did whether the horn's swing was left out (219.62–220.30 Hz over
// the hop's eight phases, 5.4 ¢) and how much of the trumpet's scoop came
// in (0.4–0.9 ¢ flat of the part alone, its scoop 0.1 s of 0.5 s).
// What a player calls such a note is the part held after the attack:
// where the pitch enters for good the range the note's later half spans.
const (
	// scoopSeconds: the held part lasts at least a cycle of a usual
	// vibrato (5 Hz or more, turningSeconds), so a vibrato's trough in a
	// note's first half is met again in its later half, not taken for a
	// scoop (common practice for the rate, from memory).
	scoopSeconds = turningSeconds / 2
	// scoopFrames: frames of the attack that reach further beyond the held
	// range than it is wide; one such frame may be a neighbour's bleed or
	// an onset misread, and what it moves the mean is the detector's to
	// answer for, not a rule about attacks.
	scoopFrames = 2
	// driftReach and scoopReach: how far beyond the held range the attack
	// reaches, in the held part's standard deviations (a mean over all its
	// frames, where the range's ends are single frames that the hop's
	// phase moves). A steady drift's first half reaches 3.6 of its later
	// half's (a straight one of the fewest frames scoopSeconds lets
	// through, 40); a scoop, from 5.3 on: the trumpet's reached 6.4, the
	// horn's 8.1–11.7, a recorder's E5 that comes down 30 ¢ over 0.8 s
	// and holds 5.3–6.6, its D5s 5.5–5.8 over the hop's eight phases,
	// each left out whole at most phases when the reach was measured in
	// the held range's widths (FluidR3, measured). Between the two the
	// attack is left out in part, in proportion: a rule that left it out
	// whole or not at all read the same note apart by the hop's phase
	// wherever a note's reach fell near the rule's line (FluidR3's viola's
	// D4, 15 ¢ sharp for 0.3 s and reaching 4.5–4.6, read +2.2 or −2.0 ¢
	// over eight phases; measured).
	driftReach = 4.0
	scoopReach = 5.3
)

// scoop returns how many of the first frames fr (their pitches c, cents)
// are an attack scooping or swinging into the range the note's later half
// spans (heldRange): those up to the last frame of the first half beyond
// that range on the side the attack comes from (its farthest frame's).
// At least scoopFrames of them lie beyond it by more than its width (and
// glideCents), one further than driftReach, and the held part after them
// lasts scoopSeconds and at least half as long as they do. out is how much
// of them a reading leaves out: all from scoopReach on, less toward
// driftReach. On the other side the held note may waver past its later
// half's range (the trumpet's C4 holds at +1 ¢ before its dip). It returns 0 when there is no such
// attack, and for a voice read out of a chord (Margin set: cmd's voice
// tracker), whose frames scatter too widely for its later half's range to
// say where an attack ends (a chorused voice's by 7 to 10 ¢; the rule
// moved a four-part choir's G4 8 ¢ from its truth; measured).
func (s *Segmenter) scoop(fr []Estimate, c []float64) (g int, out float64) {
	n := len(c)
	if n < 2*glideRest || len(fr) < n || s.Margin > 0 {
		return 0, 0
	}
	lo, hi := heldRange(c[n/2:])
	side := attackSide(c[:n/2], lo, hi)
	beyondBy := func(x float64) float64 { // beyond lo..hi on the attack's side
		if side < 0 {
			return lo - x
		}
		return x - hi
	}
	// g: after the last frame of the first half beyond lo..hi
	for i, x := range c[:n/2] {
		if beyondBy(x) > glideSlack {
			g = i + 1
		}
	}
	wide, beyond, reach := max(hi-lo, glideCents), 0, 0.0
	for _, x := range c[:g] {
		if beyondBy(x) > wide {
			beyond++
		}
		reach = max(reach, beyondBy(x))
	}
	_, sd := meanStd(c[n/2:])
	out = min((reach/max(sd, glideSlack)-driftReach)/(scoopReach-driftReach), 1)
	if beyond < scoopFrames || out <= 0 || n-g < (g+1)/2 || fr[n-1].Time-fr[g].Time < scoopSeconds {
		return 0, 0
	}
	return g, out
}

// attackSide is −1 if the farthest of the frames c from lo..hi lies below
// it, +1 if above.
func attackSide(c []float64, lo, hi float64) float64 {
	down, up := 0.0, 0.0
	for _, x := range c {
		down, up = max(down, lo-x), max(up, x-hi)
	}
	if down > up {
		return -1
	}
	return 1
}

// heldRange is the range the frames c span but for the lowest and the
// highest: one frame the detector misreads (a horn's A3 read 3 ¢ under
// both its neighbours once in the hop's eight phases; measured) must not
// move where the held part begins.
func heldRange(c []float64) (lo, hi float64) {
	lo1, lo, hi1, hi := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, x := range c {
		if x < lo1 {
			lo1, lo = x, lo1
		} else if x < lo {
			lo = x
		}
		if x > hi1 {
			hi1, hi = x, hi1
		} else if x > hi {
			hi = x
		}
	}
	return lo, hi
}
