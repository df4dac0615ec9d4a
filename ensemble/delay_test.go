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

// A flute holding B5 (its period 48.8 samples at 48 kHz) over a bassoon's
// C3, F3, G3, the two microphones hearing each other 25 dB down and
// 5.6 ms late (268 whole samples, as record mixes them; the ensemble
// issue's figures for the farthest pair). The flute's partials alone fit
// every delay 48.8 samples apart; the bassoon's, whose period is longer
// than any delay, fit one. Both directions are learned at the delay
// mixed in. (Each direction alone: the bassoon's channel heard the flute
// 25 samples late, five periods early.) Equal temperament at A4 = 440 Hz
// (ISO 16).
func TestBothWaysBetweenTwoMicrophonesAgreeOnTheDelay(t *testing.T) {
	c3 := 440 * math.Exp2(-21.0/12)
	et := func(s float64) float64 { return c3 * math.Exp2(s/12) }
	parts := []part{
		{"bn", testsignal.Saw, []tone{{et(0), 0.1, 1.0, 0, 0}, {et(5), 1.1, 2.0, 0, 0}, {et(7), 2.1, 3.0, 0, 0}}},
		{"fl", testsignal.Saw, []tone{{et(35), 0.1, 3.0, 0, 0}}}, // B5
	}
	var learned Bleed
	if err := Run(context.Background(), record(parts, 3.2, -25, 5.6), Options{Players: []Player{{"bn", 0}, {"fl", 1}},
		Bleed: &learned, Tunings: session.NewTunings(target.Default())}); err != nil {
		t.Fatal(err)
	}
	want := math.Pow(10, -25.0/20)
	for c := range 2 {
		p := learned.m.pair(c, 1-c)
		t.Logf("channel %d hears channel %d at gain %.4f, %.2f samples late", c+1, 2-c, p.gain, p.delay)
		if math.Abs(p.delay-268) > 0.5 || math.Abs(p.gain-want) > 0.1*want {
			t.Errorf("channel %d hears channel %d at gain %.4f, %.2f samples late; mixed at %.4f, 268", c+1, 2-c, p.gain, p.delay, want)
		}
	}
}

// Which candidate delays of the two directions are taken: the pair within
// reciprocalMs of each other standing highest together; without such a
// pair, or a direction without candidates, each direction's highest.
// Lags in samples, reciprocalLag 48 (1 ms at 48 kHz).
func TestReciprocalDelays(t *testing.T) {
	flute := []lagPeak{{25, 1}, {74, 0.99}, {122, 0.99}, {268, 0.96}, {317, 0.94}}
	for _, c := range []struct {
		name string
		a, b []lagPeak
		i, j int
	}{
		{"one direction a period apart, the other not", flute, []lagPeak{{268, 1}}, 3, 0},
		{"both a period apart, one pair close", []lagPeak{{110, 1}, {256, 0.97}, {546, 0.82}}, []lagPeak{{102, 1}, {320, 0.93}, {540, 0.8}}, 0, 0},
		{"none close", []lagPeak{{100, 0.9}, {300, 1}}, []lagPeak{{500, 1}}, 1, 0},
		{"one direction unheard", flute, nil, 0, -1},
	} {
		if i, j := reciprocal(c.a, c.b, 48); i != c.i || j != c.j {
			t.Errorf("%s: took %d, %d; want %d, %d", c.name, i, j, c.i, c.j)
		}
	}
}

// The candidates are peaks within the lags searched: evidence of a delay
// longer than maxBleedMs, whose correlation still rises at the last lag,
// gives none (its parabola once put the delay 27 samples beyond the
// samples kept, and cleaning the block panicked).
func TestNoCandidateBeyondTheLongestDelay(t *testing.T) {
	m := newBleedModel(4096, 2)
	p := m.pair(0, 1)
	maxLag := int(maxBleedMs / 1000 * rate)
	for b := 20; b < 700; b++ {
		w := 2 * math.Pi * float64(b) / 4096
		p.a[b] = cmplx.Rect(1, -w*float64(maxLag+30))
	}
	p.b, p.frames = 1, minBleedFrames
	for _, c := range m.candidates(nil, p, maxLag) {
		if c.lag > float64(maxLag)+0.5 {
			t.Errorf("candidate delay %.2f samples beyond the longest, %d", c.lag, maxLag)
		}
	}
}
