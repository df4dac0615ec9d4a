package multipitch

import (
	"testing"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
)

// fluid-soundfont-gm (Debian) installs the FluidR3 General MIDI font here.
const fluidR3 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"

// loopsOf returns FluidR3's short (≤ 2048 frame) loops of the named
// instruments: one waveform repeated, so every frame has exact truth.
func loopsOf(t *testing.T, names ...string) map[string][]sf2.Loop {
	t.Helper()
	font := sf2.OpenForTest(t, fluidR3)
	loops, err := font.Loops(names, 12, 4096)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][]sf2.Loop{}
	for _, l := range loops {
		out[l.Instrument] = append(out[l.Instrument], l)
	}
	return out
}

// Real instrument spectra: FluidR3 sample loops (the ones whose loops hold
// exact whole cycles: clarinet, trombone, tuba) moved to the pitches of just
// and tempered chords and mixed with white noise at 40 dB SNR. Every voice
// within 2 ¢, median ≤ 0.5 ¢, no voice missed, phantoms ≤ 10 % (the issue's
// figures).
func TestSoundFontChords(t *testing.T) {
	loops := loopsOf(t, "Clarinet", "Trombone", "Tuba")
	type v struct {
		inst string
		hz   float64
	}
	a3 := et(-12)
	for _, tc := range []struct {
		name   string
		voices []v
	}{
		{"just C major, tuba trombone clarinet", []v{{"Tuba", c3}, {"Trombone", c3 * 3 / 2}, {"Clarinet", c3 * 5 / 2}}},
		{"tempered C major, trombone clarinet trombone", []v{{"Trombone", c3}, {"Clarinet", e4 / 2}, {"Trombone", g3}}},
		{"just A minor, trombone and clarinets", []v{{"Trombone", a3}, {"Clarinet", a3 * 6 / 5}, {"Clarinet", a3 * 3 / 2}}},
		{"tempered G dominant seventh, four voices", []v{{"Tuba", g3 / 2}, {"Trombone", b3}, {"Clarinet", d4}, {"Clarinet", f4}}},
		{"just fifth, tuba and trombone", []v{{"Tuba", g3 / 2}, {"Trombone", g3 * 3 / 4}}},
	} {
		n := int(2 * rate)
		x := make([]float64, n)
		var truth []float64
		for _, p := range tc.voices {
			l, ok := sf2.Nearest(loops[p.inst], p.hz)
			if !ok {
				t.Fatalf("no usable %s loop", p.inst)
			}
			y, hz := l.At(rate, p.hz, n)
			for i := range x {
				x[i] += y[i]
			}
			truth = append(truth, hz)
		}
		testsignal.AddNoise(x, testsignal.White(newRand(uint64(len(truth))), n), 40)
		hear(t, x, Config{}, 0, 2, truth...).meets(t, tc.name, 2)
	}
}
