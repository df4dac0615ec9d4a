package multipitch

import (
	"math"
	"math/rand/v2"
	"testing"

	"fifthline/internal/testsignal"
)

// et is the equal-tempered pitch s semitones from A4 = 440 Hz (ISO 16;
// twelve equal semitones, common practice).
func et(s float64) float64 { return 440 * math.Exp2(s/12) }

var (
	c3, g3, c4, e4, g4 = et(-21), et(-14), et(-9), et(-5), et(-2)
	b3, d4, f4         = et(-10), et(-7), et(-4)
)

// Exact chords with known truth, 35–45 dB SNR. In the just triad the root's
// 5th partial and the third's 4th are one frequency, and so are the root's
// 3rd and the fifth's 2nd (5·1 = 4·5/4; 3·1 = 2·3/2, from the ratios); in
// the tempered triad they lie 13.7 ¢ and 2.0 ¢ apart (400 − 386.3 and
// 701.955 − 700 ¢, from the definitions) — one or two bins at most. Neither
// may pull any voice by more than 2 ¢.
func TestChordsToTheCent(t *testing.T) {
	saw, odd, weak, second := testsignal.Saw, testsignal.OddOnly, testsignal.WeakFund, testsignal.StrongSecond
	for _, tc := range []struct {
		name  string
		snr   float64
		parts []part
	}{
		{"just C major triad, close", 40, []part{steady(saw, c4), steady(saw, c4*5/4), steady(saw, c4*3/2)}},
		{"tempered C major triad, close", 40, []part{steady(saw, c4), steady(saw, e4), steady(saw, g4)}},
		{"just triad, open (C3 G3 E4)", 35, []part{steady(weak, c3), steady(saw, c3*3/2), steady(odd, c3*5/2)}},
		{"just fifth, two voices", 45, []part{steady(saw, g3), steady(second, g3*3/2)}},
		{"tempered dominant seventh, four timbres", 40, []part{steady(weak, et(-14)), steady(odd, b3), steady(saw, d4), steady(second, f4)}},
		{"just minor triad (A3 C4 E4)", 40, []part{steady(saw, et(-12)), steady(odd, et(-12)*6/5), steady(saw, et(-12)*3/2)}},
	} {
		x := chord(2, tc.snr, 1, tc.parts...)
		truth := make([]float64, len(tc.parts))
		for i, p := range tc.parts {
			truth[i] = p.ctr
		}
		s := hear(t, x, Config{}, 0, 2, truth...)
		s.meets(t, tc.name, 2)
		// No voice here is doubled. A spectrum whose even partials
		// dominate (the strong second partial) looks like one doubled an
		// octave above and may be marked so: see doubleGain.
		for i, p := range tc.parts {
			if s.doubled[i] > 0 && p.spec.Name != testsignal.StrongSecond.Name {
				t.Errorf("%s: voice %d marked doubled in %d frames", tc.name, i+1, s.doubled[i])
			}
		}
	}
}

// Voices crossing: the upper voice of a duet moves below the lower one
// (E4 over C4, then A3 under it). Each chord is read on its own.
func TestVoicesCrossing(t *testing.T) {
	a := chord(1.5, 40, 2, steady(testsignal.Saw, c4), steady(testsignal.OddOnly, e4))
	b := chord(1.5, 40, 3, steady(testsignal.Saw, c4), steady(testsignal.OddOnly, et(-12)))
	x := append(a, b...)
	hear(t, x, Config{}, 0, 1.5, c4, e4).meets(t, "before crossing", 2)
	hear(t, x, Config{}, 1.5, 3, et(-12), c4).meets(t, "after crossing", 2)
}

// A voice with vibrato (5.5 Hz, 40 ¢ peak to peak, common practice for
// strings and voices) among steady ones: the steady voices stay within 2 ¢;
// the vibrato voice's frames follow it, and their mean over whole cycles
// is its centre within 3 ¢.
func TestChordWithVibrato(t *testing.T) {
	v := part{testsignal.Saw, testsignal.Vibrato(e4, 40, 5.5), e4}
	x := chord(3, 40, 4, steady(testsignal.Saw, c4), v, steady(testsignal.OddOnly, g4))
	s := hear(t, x, Config{}, 0, 3, c4, e4, g4)
	if s.missed > 0 || s.frames < 6 {
		t.Fatalf("%d frames, %d missed", s.frames, s.missed)
	}
	for i, name := range []string{"C4", "E4 (vibrato)", "G4"} {
		worst, mean := 0.0, 0.0
		for _, c := range s.perVoice[i] {
			worst = math.Max(worst, math.Abs(c))
			mean += c / float64(len(s.perVoice[i]))
		}
		if (i != 1 && worst > 2) || math.Abs(mean) > 3 {
			t.Errorf("%s: worst frame %.3f ¢, mean %+.3f ¢", name, worst, mean)
		} else {
			t.Logf("%s: worst frame %.3f ¢, mean %+.3f ¢", name, worst, mean)
		}
	}
}

// An octave doubling cannot be parted from one microphone: C3 and C4 in the
// same timbre under E4 read as C3, marked doubled (its even partials stand
// above their neighbours, which a smooth spectral envelope would not have,
// Klapuri 2003), and E4, never as an invented third voice; a lone voice is
// one voice, and noise alone is none.
func TestDoublingAndNothingInvented(t *testing.T) {
	// Two players' phases are unrelated: the upper C starts 3.7 ms later.
	x := chord(2, 40, 5, steady(testsignal.Saw, c3), steady(testsignal.OddOnly, c4*5/4))
	for i, v := range testsignal.Tone(rate, len(x)+163, testsignal.Saw, 0.2, testsignal.Steady(c4))[163:] {
		x[i] += v
	}
	e, _ := New(rate, 0, 0, Config{})
	frames, ok, doubled := 0, 0, 0
	e.Feed(testsignal.Float32(x), func(f Frame) {
		frames++
		if len(f.Voices) == 2 && math.Abs(testsignal.Cents(f.Voices[0].Hz, c3)) < 2 && math.Abs(testsignal.Cents(f.Voices[1].Hz, c4*5/4)) < 2 {
			ok++
		}
		if len(f.Voices) > 0 && f.Voices[0].Doubled {
			doubled++
		}
	})
	if frames == 0 || ok < frames {
		t.Errorf("doubled C3 under E4: %d of %d frames read as C3 and E4 alone", ok, frames)
	}
	if doubled < frames*9/10 {
		t.Errorf("C3 marked doubled in %d of %d frames", doubled, frames)
	}
	hear(t, chord(2, 40, 6, steady(testsignal.WeakFund, g3)), Config{}, 0, 2, g3).meets(t, "one voice", 2)
	// Pink noise at 0.02 full scale (-34 dBFS), a hiss well above the
	// silence gate, holds no voice.
	noise := testsignal.Pink(rand.New(rand.NewPCG(8, 9)), int(2*rate))
	testsignal.Normalize(noise, 0.1)
	s := hear(t, noise, Config{}, 0, 2)
	if s.frames == 0 || s.phantoms > 0 {
		t.Errorf("pink noise: %d voices in %d frames", s.phantoms, s.frames)
	}
}

// Settings it cannot work with are refused with a reason, never a panic.
func TestNewRefuses(t *testing.T) {
	for _, tc := range []struct {
		rate        float64
		window, hop int
		cfg         Config
	}{
		{4000, 0, 0, Config{}}, {rate, 1000, 0, Config{}}, {rate, 4096, 5000, Config{}},
		{rate, 0, 0, Config{MaxVoices: 9}}, {rate, 0, 0, Config{MaxVoices: -1}},
		{rate, 0, 0, Config{MinHz: 10}}, {rate, 0, 0, Config{MinHz: 500, MaxHz: 400}}, {rate, -1, 0, Config{}},
	} {
		if _, err := New(tc.rate, tc.window, tc.hop, tc.cfg); err == nil {
			t.Errorf("New(%g, %d, %d, %+v) accepted", tc.rate, tc.window, tc.hop, tc.cfg)
		}
	}
	if e, err := New(48000, 0, 0, Config{}); err != nil || e.Window() != 16384 || e.Hop() != 4096 {
		t.Errorf("48 kHz defaults: %v", err)
	}
}
