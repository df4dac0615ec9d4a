package ensemble

import (
	"context"
	"math"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/session"
	"fifthline/target"
)

// BenchmarkReadQuartet reads a 4-channel take with bleed 20 dB down and
// reports how many times faster than real time one core reads it (the
// ensemble issue asks at least 20× offline).
func BenchmarkReadQuartet(b *testing.B) {
	c3 := 440 * math.Exp2(-21.0/12)
	et := func(s float64) float64 { return c3 * math.Exp2(s/12) }
	parts := []part{
		{"vc", testsignal.Saw, []tone{{et(0), 0.2, 2.5, 0, 0}, {et(-5), 2.6, 5, 0, 0}}},
		{"vla", testsignal.Saw, []tone{{et(7), 0.2, 5, 0, 0}}},
		{"vl2", testsignal.Saw, []tone{{et(16), 0.2, 2.5, 0, 0}, {et(14), 2.6, 5, 0, 0}}},
		{"vl1", testsignal.Saw, []tone{{et(24), 1.2, 2.5, 0, 0}, {et(23), 2.6, 5, 0, 0}}},
	}
	tk := record(parts, 5.3, -20, 3)
	players := []Player{{"vc", 0}, {"vla", 1}, {"vl2", 2}, {"vl1", 3}}
	b.ResetTimer()
	for range b.N {
		tk.pos = 0
		if err := Run(context.Background(), tk, Options{Players: players, Tunings: session.NewTunings(target.Default())}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(5.3*float64(b.N)/b.Elapsed().Seconds(), "x-realtime")
}
