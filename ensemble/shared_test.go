package ensemble

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// Which harmonics of a pitch the ownership test leaves out, with the
// detector's default window at 48 kHz (4096 samples, 11.72 Hz bins).
// Pitches in equal temperament at A4 = 440 Hz (ISO 16).
func TestSharedHarmonics(t *testing.T) {
	const binHz = 48000.0 / 4096
	const f2, c4, f4, a4 = 87.307, 261.626, 349.228, 440.0
	for _, c := range []struct {
		name    string
		hz      float64
		pitches []float64
		want    uint16
	}{
		// A bass's F2 under a tenor's C4 (its 3rd and 6th harmonics), an
		// alto's F4 (4th, 8th) and a soprano's A4 (5th, 5 ¢ from a just
		// third's): what stays weighed is the 1st, 2nd and 7th.
		{"bass under three voices", f2, []float64{f2, c4, f4, a4}, 1<<2 | 1<<5 | 1<<3 | 1<<7 | 1<<4},
		// The same pitch on another channel may be that player's bleed:
		// all of it is weighed.
		{"unison", c4, []float64{c4, c4}, 0},
		// So may an octave or a twelfth above another's pitch (a bleed
		// whose fundamental is weak).
		{"octave above", 2 * c4, []float64{2 * c4, c4}, 0},
		{"twelfth above", 3 * f2, []float64{3 * f2, f2}, 0},
		// Nothing else sounding: nothing left out.
		{"alone", a4, []float64{a4, 0, 0}, 0},
	} {
		if got := sharedHarmonics(0, c.hz, c.pitches, binHz); got != c.want {
			t.Errorf("%s: harmonics %b left out, want %b", c.name, got, c.want)
		}
	}
}

// A bass entering softly (a third of the others' level, swelling over
// 0.3 s) under a tenor sounding its third harmonic, an alto its fourth and
// a soprano near its fifth, on close microphones that hear nothing of each
// other: the bass's note is the bass's from its start (within a few
// frames), as read alone.
// Equal temperament at A4 = 440 Hz (ISO 16).
func TestASoftBassUnderTheOthersIsTheBass(t *testing.T) {
	f2 := 440 * math.Exp2(-28.0/12)
	hz := []float64{f2, f2 * math.Exp2(19.0/12), f2 * 4, f2 * math.Exp2(28.0/12)} // F2, C4, F4, A4
	n := int(2.5 * rate)
	tk := &take{ch: make([][]float64, 4)}
	for i, f := range hz {
		level, swell := 0.15, 0.02
		if i == 0 {
			level, swell = 0.05, 0.3
		}
		x := testsignal.Tone(rate, n-int(0.2*rate), testsignal.Saw, level, testsignal.Steady(f))
		testsignal.FadeIn(x, rate, swell)
		tk.ch[i] = append(make([]float64, int(0.2*rate)), x...)
	}
	var alone float64
	for _, nt := range read(t, &take{ch: tk.ch[:1]}, []Player{{"b", 0}}) {
		alone = nt.Held.Start
	}
	for _, nt := range read(t, tk, []Player{{"b", 0}, {"t", 1}, {"a", 2}, {"s", 3}}) {
		if nt.Player.Name != "b" {
			continue
		}
		t.Logf("the bass's %s starts at %.3f s; alone at %.3f s", nt.Reading.Note, nt.Held.Start, alone)
		if math.Abs(nt.Held.Start-alone) > 0.05 { // 0.26 s late when the shared harmonics were weighed
			t.Errorf("the bass's %s starts at %.3f s; alone at %.3f s", nt.Reading.Note, nt.Held.Start, alone)
		}
	}
}

// E♭3 under G3 B♭3 D4, four harmonics each at equal amplitude (as sox's
// sines, summed), equal temperament at A4 = 440 Hz (ISO 16): every
// harmonic E♭3 sounds lies near a partial of the others (its 3rd and 6th
// on B♭3's 2nd and 4th), and those left weighed, its 7th and 8th, hold
// nothing of it. On close microphones that hear nothing of each other the
// note is its player's; heard on another channel 20 dB down beside that
// player's own E♭3, it is that player's bleed.
func TestANoteWhoseSoundingHarmonicsAreAllSharedIsWeighedWhole(t *testing.T) {
	et := func(semitones float64) float64 { return 440 * math.Exp2(semitones/12) }
	four := testsignal.Spectrum{Name: "four equal harmonics", Amps: []float64{1, 1, 1, 1}}
	eb3, chord := et(-18), []float64{et(-14), et(-11), et(-7)} // G3, B♭3, D4
	const n = 4096                                             // the detector's window at 48 kHz
	tone := func(hz, level float64) []float64 { return testsignal.Tone(rate, n, four, level, testsignal.Steady(hz)) }
	o := NewOwner(rate, n, 5)
	o.Set(0, tone(eb3, 0.15), nil)
	for i, hz := range chord {
		o.Set(i+1, tone(hz, 0.15), nil)
	}
	pitches := []float64{eb3, chord[0], chord[1], chord[2], 0}
	if o.Bleed(0, eb3, pitches, DefaultOwnDB) {
		t.Errorf("E♭3 on its own channel under G3 B♭3 D4 given away as bleed")
	}
	// Channel 4 plays E♭3; channel 0 rests and hears it 20 dB down.
	o.Set(0, tone(eb3, 0.015), nil)
	o.Set(4, tone(eb3, 0.15), nil)
	pitches[4] = eb3
	if !o.Bleed(0, eb3, pitches, DefaultOwnDB) {
		t.Errorf("E♭3 heard 20 dB down beside its player's channel kept as a note")
	}
}
