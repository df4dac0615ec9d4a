package ensemble

import (
	"context"
	"math"
	"math/cmplx"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/session"
	"fifthline/target"
)

// Two microphones whose delays differ by more than reciprocalMs each way
// (a take mixed with every pair's delay drawn on its own: the bassoon's
// channel hears the flute 5.6 ms late, the flute's the bassoon 1.5 ms
// late, 268 and 72 whole samples), the flute on B5 then C♯6 over the
// bassoon's C3, F3, G3, 22 dB down each way. Each direction is learned at
// its own delay: the flute's two pitches agree on one peak, and the
// bassoon's direction does not pull the other to a period of the flute
// near its own delay. Equal temperament at A4 = 440 Hz
// (ISO 16).
func TestEachDirectionLearnsItsOwnDelay(t *testing.T) {
	c3 := 440 * math.Exp2(-21.0/12)
	et := func(s float64) float64 { return c3 * math.Exp2(s/12) }
	parts := []part{
		{"bn", testsignal.Saw, []tone{{et(0), 0.1, 1.0, 0, 0}, {et(5), 1.1, 2.0, 0, 0}, {et(7), 2.1, 3.0, 0, 0}}},
		{"fl", testsignal.Saw, []tone{{et(35), 0.1, 2.0, 0, 0}, {et(37), 2.1, 3.0, 0, 0}}},
	}
	late := [2]float64{5.6, 1.5}
	var learned Bleed
	tk := recordEach(parts, 3.2, nil, func(c, o int) (float64, float64) { return -22, late[c] })
	if err := Run(context.Background(), tk, Options{Players: []Player{{"bn", 0}, {"fl", 1}},
		Bleed: &learned, Tunings: session.NewTunings(target.Default())}); err != nil {
		t.Fatal(err)
	}
	for c := range 2 {
		p, want := learned.m.pair(c, 1-c), math.Floor(late[c]/1000*rate)
		t.Logf("channel %d hears channel %d %.2f samples late; mixed %g", c+1, 2-c, p.delay, want)
		if math.Abs(p.delay-want) > 0.5 {
			t.Errorf("channel %d hears channel %d %.2f samples late; mixed %g", c+1, 2-c, p.delay, want)
		}
	}
}

// A player entering softly on a louder neighbour's second harmonic: the
// bassoon's D3 sounds throughout, the clarinet (odd partials) enters on
// D4, 20 dB under it, after a second, and the two microphones hear each
// other 20 dB down and 3 ms late. D4's harmonics all lie on the bassoon's
// and sound louder on its channel, but once that bleed is learned the
// clarinet's channel holds more of D4 than the bleed makes: the clarinet
// is read from its entry, at its pitch, and the bassoon's channel reads
// only D3.
func TestASoftEntryOnANeighboursHarmonicIsThePlayersOwn(t *testing.T) {
	d3 := 440 * math.Exp2(-19.0/12)
	parts := []part{
		{"bn", testsignal.Saw, []tone{{d3, 0.1, 3.5, 0, 0}}},
		{"cl", testsignal.OddOnly, []tone{{2 * d3, 1.5, 3.5, 0, 0}}},
	}
	tk := recordEach(parts, 3.7, []float64{0, -20}, func(c, o int) (float64, float64) { return -20, 3 })
	notes := read(t, tk, []Player{{"bn", 0}, {"cl", 1}})
	got := map[string][]Note{}
	for _, n := range notes {
		got[n.Player.Name] = append(got[n.Player.Name], n)
		t.Logf("%s: %s %.3f–%.3f s, %.3f Hz", n.Player.Name, n.Reading.Note, n.Held.Start, n.Held.End, n.Held.Hz)
	}
	if len(got["bn"]) != 1 || got["bn"][0].Reading.Note.String() != "D3" {
		t.Errorf("bassoon: %d notes, want its D3 alone", len(got["bn"]))
	}
	cl := got["cl"]
	if len(cl) != 1 || cl[0].Reading.Note.String() != "D4" || math.Abs(cl[0].Held.Start-1.5) > 0.15 || cl[0].Held.End < 3.3 {
		t.Fatalf("clarinet: %d notes, want D4 from 1.5 s to 3.5 s", len(cl))
	}
	if c := 1200 * math.Log2(cl[0].Held.Hz/(2*d3)); math.Abs(c) > 1 {
		t.Errorf("clarinet's D4 %+.2f ¢ from its pitch", c)
	}
}

// Evidence of one delay (58 samples, 1.2 ms) at the partials of two
// pitches a semitone apart (A4 and B♭4), strong at the fundamentals and
// falling as 1/k² above (a brass note's bleed, its strongest partials
// low): the two pitches' periods part only at the upper partials, so
// weighed by power alone a peak a period away stood at 0.87 of the true
// one, a near-tie the other direction could choose. Weighed by
// 1/√|a| per bin, the upper partials count: the true delay stands
// highest, and no other peak within nearTie of it.
func TestTheUpperPartialsTellDelaysAPeriodApart(t *testing.T) {
	const n, delay = 4096, 58.0
	m := newBleedModel(n, 2)
	p := m.pair(0, 1)
	for _, hz := range []float64{440, 440 * math.Exp2(1.0/12)} {
		for k := 1; float64(k)*hz < maxBleedHz; k++ {
			b := int(math.Round(float64(k) * hz * n / rate))
			w := 2 * math.Pi * float64(b) / n
			p.a[b] += cmplx.Rect(1/float64(k*k), -w*delay)
		}
	}
	p.b, p.frames = 1, minBleedFrames
	peaks := m.candidates(nil, p, int(maxBleedMs/1000*rate))
	if len(peaks) != 1 || math.Abs(peaks[0].lag-delay) > 0.5 {
		t.Errorf("candidates %v; want the one delay, %g samples", peaks, delay)
	}
}

// A bassoon-like D3 whose third partial is its strongest and whose
// fundamental, fifth and seventh are weak (from memory: a bassoon's
// formant lies near 500 Hz) under a clarinet entering on D4 20 dB under
// it half a second in, before any bleed is weighed. The clarinet is too
// quiet for its bleed to share a period with the bassoon's note, so the
// bassoon's D3 is not taken for the phantom of A4, the twelfth above.
func TestAQuietNeighbourMakesNoPhantom(t *testing.T) {
	d3 := 440 * math.Exp2(-19.0/12)
	bassoon := testsignal.Spectrum{Name: "third strongest", Amps: []float64{0.05, 0.3, 1, 0.3, 0.03, 0.2, 0.02, 0.1}}
	parts := []part{
		{"bn", bassoon, []tone{{d3, 0.1, 2.5, 0, 0}}},
		{"cl", testsignal.OddOnly, []tone{{2 * d3, 0.6, 2.5, 0, 0}}},
	}
	tk := recordEach(parts, 2.7, []float64{0, -20}, func(c, o int) (float64, float64) { return -20, 3 })
	for _, n := range read(t, tk, []Player{{"bn", 0}, {"cl", 1}}) {
		t.Logf("%s: %s %.3f–%.3f s", n.Player.Name, n.Reading.Note, n.Held.Start, n.Held.End)
		if n.Player.Name == "bn" && n.Reading.Note.String() != "D3" {
			t.Errorf("bassoon read %s from %.3f s", n.Reading.Note, n.Held.Start)
		}
	}
}
