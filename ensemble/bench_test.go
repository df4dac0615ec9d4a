package ensemble

import (
	"context"
	"math"
	"syscall"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/session"
	"fifthline/target"
)

// BenchmarkReadQuartet reads a 4-channel take with bleed 20 dB down and
// reports how many times faster than real time one core reads it (the
// ensemble issue asks at least 20× offline): x-realtime by the clock,
// x-realtime-cpu by the process's CPU time, which other work on a shared
// machine does not inflate. Run it with GOMAXPROCS=1 for one core.
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
	cpu0 := cpuSeconds()
	for range b.N {
		tk.pos = 0
		if err := Run(context.Background(), tk, Options{Players: players, Tunings: session.NewTunings(target.Default())}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(5.3*float64(b.N)/b.Elapsed().Seconds(), "x-realtime")
	b.ReportMetric(5.3*float64(b.N)/(cpuSeconds()-cpu0), "x-realtime-cpu")
}

// cpuSeconds is this process's user and system time so far (getrusage(2)).
func cpuSeconds() float64 {
	var u syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &u); err != nil {
		return math.NaN()
	}
	return float64(u.Utime.Nano()+u.Stime.Nano()) / 1e9
}
