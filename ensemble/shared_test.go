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
