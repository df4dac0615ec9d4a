package ensemble

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
)

// The period a player's note shares with a neighbour's bleed, read on the
// player's channel before that bleed is learned, and a real note there.
// Sawtooth tones (every harmonic, 1/k), a neighbour heard 18 dB down; the
// detector's default window at 48 kHz (4096 samples). D2 in equal
// temperament at A4 = 440 Hz (ISO 16); D3 an octave and A3 a just twelfth
// (3/1, common practice) above it, so the three share D2's period exactly.
func TestAPhantomBelowIsThePlayersNoteAbove(t *testing.T) {
	d2 := 440 * math.Exp2(-31.0/12)
	const n = 4096
	saw := func(hz, level float64) []float64 {
		return testsignal.Tone(rate, n, testsignal.Saw, level, testsignal.Steady(hz))
	}
	mix := func(a, b []float64) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = a[i] + math.Pow(10, -18.0/20)*b[i]
		}
		return x
	}
	for _, c := range []struct {
		name      string
		own, next float64 // the player's pitch and the neighbour's
		weighed   bool    // the neighbour's bleed on the player is estimated
		want      int
	}{
		// The cello's D3 under the viola's A3 (2:3): read as D2, it is D3.
		{"an octave above", 2 * d2, 3 * d2, false, 2},
		// The viola's A3 over the cello's D3 bleed: read as D2, it is A3.
		{"a twelfth above", 3 * d2, 2 * d2, false, 3},
		// A real D2 under the viola's A3 sounds its own odd harmonics.
		{"a real note", d2, 3 * d2, false, 0},
		// Once the bleed is estimated it is subtracted before the detector
		// reads (or there is none): a D2 read then is no shared period.
		{"bleed weighed", 2 * d2, 3 * d2, true, 0},
	} {
		o := NewOwner(rate, n, 2)
		ch0, ch1 := mix(saw(c.own, 0.15), saw(c.next, 0.15)), mix(saw(c.next, 0.15), saw(c.own, 0.15))
		o.Set(0, ch0, nil)
		o.Set(1, ch1, nil)
		got := o.phantom(0, d2, []float64{d2, c.next}, func(int) bool { return !c.weighed })
		if got != c.want {
			t.Errorf("%s: D2 read on the player's channel is harmonic %d of their note, want %d", c.name, got, c.want)
		}
	}
}

// The period a player's note shares with a louder neighbour sounding
// below, on one of whose partials it lies, and a real note there.
// Sawtooth tones, a neighbour heard 18 dB down, the detector's default
// window at 48 kHz. D3 in equal temperament at A4 = 440 Hz (ISO 16); A4
// a just twelfth (3/1) and A5 two octaves and a fifth (6/1) above it
// (common practice), so A4 lies on D3's third partial and A5 on its sixth.
func TestAPhantomOnANeighboursPartialIsGivenAway(t *testing.T) {
	d3 := 440 * math.Exp2(-19.0/12)
	const n = 4096
	for _, c := range []struct {
		name    string
		own     float64 // the player's pitch; A4 is read on their channel
		weighed bool    // the neighbour's bleed on the player is estimated
		want    bool
	}{
		// The flute's A5 entering with the bassoon's D3: read as A4, its
		// odd harmonics are the bassoon's bleed.
		{"the note an octave above", 6 * d3, false, true},
		// A real A4 sounds its own odd harmonics on its own channel.
		{"a real note", 3 * d3, false, false},
		// Once the bleed is estimated it is subtracted before the detector
		// reads: an A4 read then is no shared period.
		{"bleed weighed", 6 * d3, true, false},
	} {
		own := testsignal.Tone(rate, n, testsignal.Saw, 0.15, testsignal.Steady(c.own))
		next := testsignal.Tone(rate, n, testsignal.Saw, 0.15, testsignal.Steady(d3))
		ch0, ch1 := make([]float64, n), make([]float64, n)
		for i := range ch0 {
			ch0[i] = own[i] + math.Pow(10, -18.0/20)*next[i]
			ch1[i] = next[i] + math.Pow(10, -18.0/20)*own[i]
		}
		o := NewOwner(rate, n, 2)
		o.Set(0, ch0, nil)
		o.Set(1, ch1, nil)
		got := o.phantomOnPartial(0, 3*d3, []float64{3 * d3, d3}, func(int) bool { return !c.weighed }, DefaultOwnDB)
		if got != c.want {
			t.Errorf("%s: A4 read on the player's channel given away %v, want %v", c.name, got, c.want)
		}
	}
}

// A pitch read an octave or a twelfth under the player's held note, where
// an unweighed neighbour sounds a whole multiple of it, is the held note's
// period shared with that bleed. The pitches are those the choir's bass
// channel read (FluidR3 voice oohs, G major over G2; measured, Hz): G1
// under the held G2, the tenor's B3 (26.7 ¢ off G1's fifth harmonic in
// equal temperament, within partialCents), the alto's D4, the soprano's G4.
// In the held note's attack the bleed may be weighed: the same choir's
// bass entering on D3 under the tenor's and alto's A3 read D2 (measured,
// Hz: 72.70 after 143.48; the tenor 218.14, the alto 217.61, the soprano's
// F♯4 377.12).
func TestAPhantomInAHeldNote(t *testing.T) {
	chord := []float64{48.855, 248.073, 294.362, 391.364}
	entry := []float64{72.70, 218.14, 217.61, 377.12}
	none := func(int) bool { return false }
	all := func(int) bool { return true }
	for _, c := range []struct {
		name      string
		held      float64
		attack    bool
		pitches   []float64
		unweighed func(int) bool
		want      bool
	}{
		{"G1 under a held G2, the chord's bleed unweighed", 97.86, false, chord, all, true},
		{"the bleed weighed", 97.86, false, chord, none, false},
		{"nothing held", 0, false, chord, all, false},
		{"held a fourth above, no octave or twelfth", 65.3, false, chord, all, false},
		{"no neighbour on its harmonics", 97.86, false, []float64{48.855, 0, 270, 0}, all, false},
		{"D2 in D3's attack, the bleed weighed", 143.48, true, entry, none, true},
		{"D2 past D3's attack, the bleed weighed: a leap down", 143.48, false, entry, none, false},
		{"in the attack, no neighbour on its harmonics", 143.48, true, []float64{72.70, 0, 190, 0}, none, false},
	} {
		if got := phantomHeld(0, c.pitches[0], c.held, c.attack, c.pitches, c.unweighed); got != c.want {
			t.Errorf("%s: phantomHeld %v, want %v", c.name, got, c.want)
		}
	}
}

// In an attack a phantom is followed while its reading stays within
// partialCents of the last pitch given away, its pitch moving with the
// attacks beneath it, and no further than the attack's span: the choir's
// bass D3 entering under the tenor's and alto's A3 (FluidR3 voice oohs,
// the bleed weighed; the channels' readings measured, Hz) read D2 at
// 72.70 Hz, then at 72.05 Hz while the tenor rose to 220.66 Hz, 36 ¢ off
// D2's third harmonic.
func TestAPhantomFollowedThroughAnAttack(t *testing.T) {
	det, err := pitchdetect.New(48000, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	none := func(int) bool { return false }
	v := &voice{det: det}
	frame := func(read float64, given bool) {
		hz := 0.0
		if !given {
			hz = read
		}
		v.onset(hz, v.recent)
		v.recentPitch(hz)
	}
	for _, hz := range []float64{142.19, 142.27, 143.48} { // D3's attack, read flat
		frame(hz, false)
	}
	if !v.sharedPeriod(0, 72.70, []float64{72.70, 218.14, 217.61, 377.12}, none) {
		t.Fatal("D2 under the attack's 143.48 Hz, the A3s on its third harmonic: not given away")
	}
	frame(72.70, true)
	drifted := []float64{72.05, 220.66, 220.01, 0}
	if phantomHeld(0, 72.05, v.recent, true, drifted, none) {
		t.Fatal("72.05 Hz against the tenor's 220.66 Hz: phantomHeld alone should not tell it")
	}
	if !v.sharedPeriod(0, 72.05, drifted, none) {
		t.Error("72.05 Hz, 15 ¢ from the D2 given away: not followed")
	}
	for range det.Span() / det.Hop() {
		frame(72.05, true)
	}
	if v.sharedPeriod(0, 72.05, drifted, none) {
		t.Error("past the attack's span: still given away")
	}
}
