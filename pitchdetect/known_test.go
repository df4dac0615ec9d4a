package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A drone on A3 (220 Hz, ISO 16 A4 = 440 Hz an octave up) as loud as the
// player, who holds E4 two cents above the just fifth 3:2 (330 Hz ·
// 2^(2/1200)): the player's even partials sit within a fraction of a bin of
// the drone's partials 3, 6, 9 … Declared as a known tone, the drone is
// removed and the player's pitch read from the rest.
func TestKnownToneIsRemoved(t *testing.T) {
	rate := 48000.0
	n := int(rate * 0.6)
	drone := testsignal.Tone(rate, n, testsignal.Saw, 0.3, testsignal.Steady(220))
	player := 330 * math.Pow(2, 2.0/1200)
	x := testsignal.Tone(rate, n, testsignal.Saw, 0.3, testsignal.Steady(player))
	for i := range x {
		x[i] += drone[i]
	}
	d, _ := New(rate, 0, 0)
	d.SetKnownTones([]float64{220})
	m := measure(d.Feed(testsignal.Float32(x), nil), player)
	if m.gross > 0 || m.voiced < m.frames*9/10 || m.median > 0.05 {
		t.Errorf("player over drone: %d/%d voiced, %d gross, median %.4f ¢, max %.4f ¢", m.voiced, m.frames, m.gross, m.median, m.max)
	}
	// The drone alone, declared, leaves no pitch.
	d.Reset()
	for _, e := range d.Feed(testsignal.Float32(drone), nil) {
		if e.Voiced {
			t.Fatalf("drone alone: pitch %.2f Hz at %.2f s", e.Hz, e.Time)
		}
	}
	// Cleared, the detector hears the drone again.
	d.SetKnownTones(nil)
	d.Reset()
	if m := measure(d.Feed(testsignal.Float32(drone), nil), 220); m.median > 0.02 {
		t.Errorf("drone after clearing: median %.4f ¢", m.median)
	}
}

func BenchmarkFeedWithKnownTones(b *testing.B) {
	rate := 48000.0
	x := testsignal.Float32(testsignal.Tone(rate, int(rate), testsignal.Saw, 0.5, testsignal.Steady(220)))
	d, _ := New(rate, 0, 0)
	d.SetKnownTones([]float64{146.8324, 220}) // a D3–A3 drone
	out := make([]Estimate, 0, 16)
	hop := d.Hop()
	d.Feed(x[:d.Span()], out[:0])
	b.ReportAllocs()
	i := 0
	for b.Loop() {
		if i+hop > len(x) {
			i = 0
		}
		out = d.Feed(x[i:i+hop], out[:0])
		i += hop
	}
}
