package multipitch

import (
	"testing"

	"fifthline/internal/testsignal"
)

// BenchmarkFourVoices reads a held four-voice chord (testsignal spectra,
// 40 dB SNR); the metric is seconds of audio per second of CPU on one core,
// and the allocations are the per-frame path's (BENCH.md).
func BenchmarkFourVoices(b *testing.B) {
	x := testsignal.Float32(chord(3, 40, 1, steady(testsignal.WeakFund, et(-14)), steady(testsignal.OddOnly, b3),
		steady(testsignal.Saw, d4), steady(testsignal.StrongSecond, f4)))
	e, err := New(rate, 0, 0, Config{})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		e.Feed(x, func(Frame) {})
	}
	b.ReportMetric(3*float64(b.N)/b.Elapsed().Seconds(), "x_realtime")
}
