package ensemble

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// Which pitches share a period a delay may be off by: one within 30 ¢ of
// a whole multiple of the other. Equal temperament at A4 = 440 Hz (ISO 16).
func TestHarmonicallyRelated(t *testing.T) {
	et := func(semitones float64) float64 { return 440 * math.Exp2(semitones/12) }
	for _, c := range []struct {
		name string
		a, b float64
		want bool
	}{
		{"the same pitch", et(0), et(0), true},
		{"an octave (A4, A5)", et(0), et(12), true},
		{"a tempered twelfth (G2, D4), 2 ¢ from 3:1", et(-26), et(-7), true},
		{"a fourth (F4, B♭4)", et(-4), et(1), false},
		{"a whole tone (A5, G5)", et(12), et(10), false},
		{"a semitone (D4, C♯4)", et(-7), et(-8), false},
	} {
		if got := harmonicallyRelated(c.a, c.b); got != c.want {
			t.Errorf("%s: %.2f and %.2f Hz related %v; want %v", c.name, c.a, c.b, got, c.want)
		}
	}
}

// A pair whose delay one pitch settled among near-tie lags a period apart
// (an oboe's F4 on the clarinet's channel) is period-ambiguous, to be
// judged before it is subtracted, while the neighbour sounds a pitch that
// shares no period with it (B♭4), until the evidence has chosen one lag:
// the first evidence at B♭4 leaves F4's near-ties standing while F4's
// fades (the woodwinds read once, a period of F4 off for 0.4 s). At the
// same pitch or its octave it is not, nor is a pair whose one pitch gave
// a single clear lag.
func TestADelayOnePitchSettledWaitsForASecond(t *testing.T) {
	f4, f5, bb4 := 349.23, 698.46, 466.16 // ISO 16 equal temperament
	m := newBleedModel(4096, 2)
	p := m.pair(0, 1)
	p.gain, p.delay, p.ties = 0.1, 131, 2
	p.heardAt(f4)
	for _, c := range []struct {
		name      string
		now       float64
		ambiguous bool
	}{
		{"the neighbour silent", 0, false},
		{"the same pitch", f4, false},
		{"its octave", f5, false},
		{"a fourth above", bb4, true},
	} {
		m.sounding[1] = c.now
		if got := m.periodAmbiguous(0, 1); got != c.ambiguous {
			t.Errorf("%s: period-ambiguous %v; want %v", c.name, got, c.ambiguous)
		}
	}
	m.sounding[1] = bb4
	p.ties = 1
	if m.periodAmbiguous(0, 1) {
		t.Error("a single clear lag from one pitch: held back at a second pitch")
	}
	p.ties = 2
	p.heardAt(bb4)
	if !m.periodAmbiguous(0, 1) {
		t.Error("evidence at B♭4 as well as F4, two near-tie lags still: subtracted unjudged")
	}
	p.ties = 1
	if m.periodAmbiguous(0, 1) {
		t.Error("evidence at B♭4 as well as F4 has chosen one lag: still held back")
	}
}

// judgePhase at a new pitch: an oboe's B♭4 (466.16 Hz, ISO 16) heard on
// the clarinet's channel 20 dB down and 269 samples late (5.6 ms at
// 48 kHz), the pair's delay learned from her F4 alone. At the true delay
// it subtracts in phase; a period of F4 later (137 samples, a third of a
// period of B♭4 off) it would leave the channel louder, and is held back.
func TestJudgePhaseAtTheNeighboursNewPitch(t *testing.T) {
	const n, late = 4096, 269
	f4, bb4 := 349.23, 466.16
	long := testsignal.Tone(rate, n+late, testsignal.Saw, 0.3, testsignal.Steady(bb4))
	heard := make([]float64, n)
	for i := range heard {
		heard[i] = 0.1 * long[i]
	}
	for _, c := range []struct {
		name       string
		delay      float64
		outOfPhase bool
	}{
		{"the true delay", late, false},
		{"a period of F4 late", late + rate/f4, true},
	} {
		o := NewOwner(rate, n, 2)
		o.Set(0, heard, nil)
		o.Set(1, long[late:], nil)
		m := newBleedModel(n, 2)
		f := newFrameReadings(2)
		f.hz[1], f.read[1] = bb4, bb4
		f.level[0], f.level[1] = -40, -20 // the clarinet's channel hears only the bleed
		m.sounding[1] = bb4
		p := m.pair(0, 1)
		p.gain, p.delay, p.ties = 0.1, c.delay, 2
		p.heardAt(f4)
		m.judgePhase(o, f, 0, 1)
		if p.outOfPhase != c.outOfPhase {
			t.Errorf("%s (%.1f samples): out of phase %v; want %v", c.name, c.delay, p.outOfPhase, c.outOfPhase)
		}
	}
}
