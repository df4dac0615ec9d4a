package capture

import (
	"errors"
	"io"
	"testing"
	"time"
)

// BenchmarkWAVRead streams a 24-bit stereo file made by sox, first channel.
func BenchmarkWAVRead(b *testing.B) {
	path := soxFile(b, b.TempDir(), "bench.wav", []string{"-r", "48000", "-b", "24", "-c", "2"}, "10", "sine", "440", "sine", "660")
	buf := make([]float32, 4096)
	start := time.Now()
	var samples int64
	for b.Loop() {
		w, err := OpenWAV(path)
		if err != nil {
			b.Fatal(err)
		}
		for {
			n, err := w.Read(buf)
			samples += int64(n)
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
		}
		w.Close()
	}
	b.ReportMetric(float64(samples)/time.Since(start).Seconds()/48000, "x-realtime")
}

// BenchmarkPerformance renders one second of the demo voice at 48 kHz with
// vibrato; x-realtime says how many times faster than played.
func BenchmarkPerformance(b *testing.B) {
	buf := make([]float32, 48000)
	start := time.Now()
	for b.Loop() {
		p := NewPerformance(48000, []Tone{{Hz: 392, Seconds: 1, VibratoCents: 15, VibratoHz: 5.5}}, false)
		if n, _ := p.Read(buf); n != len(buf) {
			b.Fatalf("rendered %d samples", n)
		}
	}
	b.ReportMetric(float64(b.N)/time.Since(start).Seconds(), "x-realtime")
}
