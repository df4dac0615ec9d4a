package ensemble

import (
	"context"
	"math"
	"testing"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
	"fifthline/session"
	"fifthline/target"
)

// A choir's first chord (F major: F2, C4, F4, A4, bent +2, −3, +1 and −4
// ¢ from equal temperament at A4 = 440 Hz, ISO 16), then B♭ major with
// the alto's F4 held, each part sung by FluidR3's "Ohh Voices" (their
// profiles, sf2.Timbre) on its own microphone, which hears nothing of the
// others. The bass's fifth partial (437.0 Hz) lies 2 Hz from the
// soprano's A4: when both release together, the bass's quiet tail, no
// longer voiced, must not be learned as the soprano's bleed (it was, at
// −23 dB, and then pulled the bass's F2 0.65 ¢ sharp). Read twice, as
// analyze does: nothing learned above −40 dB, every note as sung.
func TestAReleaseTailIsNotLearnedAsBleed(t *testing.T) {
	font := sf2.OpenForTest(t, "/usr/share/sounds/sf2/FluidR3_GM.sf2")
	voices, err := font.Timbres([]string{"Ohh Voices"}, 20000)
	if err != nil || len(voices) == 0 {
		t.Fatalf("no profiles of FluidR3's Ohh Voices: %v", err)
	}
	tk := &take{}
	et := func(key int, cents float64) float64 { return 440 * math.Exp2((float64(key-69)+cents/100)/12) }
	lines := [][]tone{
		{{et(41, 2), 0.3, 1.7, 0, 0}, {et(46, 2), 1.8, 3.2, 0, 0}},
		{{et(60, -3), 0.3, 1.7, 0, 0}, {et(62, -3), 1.8, 3.2, 0, 0}},
		{{et(65, 1), 0.3, 3.2, 0, 0}},
		{{et(69, -4), 0.3, 1.7, 0, 0}},
	}
	// Each note rises over 40 ms and dies away over 80 ms, as sung notes do.
	tk.ch = make([][]float64, len(lines))
	for c, notes := range lines {
		tk.ch[c] = make([]float64, int(3.5*rate))
		for _, nt := range notes {
			v, _ := sf2.Nearest(voices, nt.hz)
			x := testsignal.Tone(rate, int((nt.end-nt.start)*rate), v.Spectrum, 0.2, nt.pitch)
			testsignal.FadeIn(x, rate, 0.04)
			testsignal.FadeOut(x, rate, 0.08)
			copy(tk.ch[c][int(nt.start*rate):], x)
		}
	}
	players := []Player{{"b", 0}, {"t", 1}, {"a", 2}, {"s", 3}}
	const unheard = 0.01 // −40 dB: far below any close microphone's neighbour (15–25 dB down)
	var learned Bleed
	var notes []Note
	for range 2 {
		notes = notes[:0]
		tk.pos = 0
		err := Run(context.Background(), tk, Options{Players: players, Bleed: &learned,
			Tunings: session.NewTunings(target.Default()), OnNote: func(n Note) error { notes = append(notes, n); return nil }})
		if err != nil {
			t.Fatal(err)
		}
	}
	for i, p := range learned.m.pairs {
		if p.gain > unheard {
			t.Errorf("channel %d learned to hear channel %d at gain %.4f; the take has no bleed", i/4+1, i%4+1, p.gain)
		}
	}
	for _, n := range notes {
		if math.Abs(n.Reading.Deviation-map[string]float64{"b": 2, "t": -3, "a": 1, "s": -4}[n.Player.Name]) > 0.1 {
			t.Errorf("%s %s read %+.3f ¢ from equal temperament, bent as sung", n.Player.Name, n.Reading.Note, n.Reading.Deviation)
		}
	}
}

// A bass moves F2, B♭2, C3 under an alto who holds F4 throughout (equal
// temperament at A4 = 440 Hz, ISO 16), the microphones hearing each other
// 20 dB down and 3.1 ms (148.8 samples) late. F4 is the fourth and third
// partial of the bass's first two notes, so the alto's bleed on the bass
// can be measured only at F4's own partials, and one held pitch fits
// delays a period (137.5 samples) apart about equally well; the bass's
// moving line on the alto's channel fixes that delay, and sound crosses
// between the two in the same time either way. Both are learned as mixed.
func TestAHeldPitchsBleedIsLearnedAtItsTrueDelay(t *testing.T) {
	et := func(key int) float64 { return 440 * math.Exp2(float64(key-69)/12) }
	parts := []part{
		{"b", testsignal.Saw, []tone{{et(41), 0.2, 1.4, 0, 0}, {et(46), 1.5, 2.7, 0, 0}, {et(48), 2.8, 4, 0, 0}}},
		{"a", testsignal.Saw, []tone{{et(65), 0.2, 4, 0, 0}}},
	}
	var learned Bleed
	if err := Run(context.Background(), record(parts, 4.2, -20, 3.1), Options{Players: []Player{{"b", 0}, {"a", 1}},
		Bleed: &learned, Tunings: session.NewTunings(target.Default())}); err != nil {
		t.Fatal(err)
	}
	for c := range 2 {
		p := learned.m.pair(c, 1-c)
		t.Logf("channel %d hears channel %d at gain %.4f, delay %.2f samples", c+1, 2-c, p.gain, p.delay)
		if math.Abs(p.gain-0.1) > 0.01 || math.Abs(p.delay-148) > 1 {
			t.Errorf("channel %d hears channel %d at gain %.4f, delay %.2f samples; mixed at 0.1, 148 (whole samples)", c+1, 2-c, p.gain, p.delay)
		}
	}
}
