package capture

import (
	"path/filepath"
	"testing"
	"time"
)

// BenchmarkRecordingRead reads ten seconds of a stereo take, first channel,
// in each format decoded here (BenchmarkWAVRead streams WAV alone); x-realtime says how many times
// faster than played (the analysis itself runs at tens of times real time,
// so a decoder far above that costs nothing noticeable).
func BenchmarkRecordingRead(b *testing.B) {
	dir := b.TempDir()
	wav := soxFile(b, dir, "take.wav", []string{"-r", "48000", "-b", "24", "-c", "2"}, "10", "sine", "440", "sine", "660")
	flac := filepath.Join(dir, "take.flac")
	sox(b, wav, flac)
	mp3 := filepath.Join(dir, "take.mp3")
	ffmpeg(b, "-i", wav, "-c:a", "libmp3lame", "-b:a", "320k", mp3)
	for _, path := range []string{wav, flac, mp3} {
		b.Run(filepath.Ext(path)[1:], func(b *testing.B) {
			start := time.Now()
			samples := 0
			for b.Loop() {
				r, err := OpenRecording(path, 1)
				if err != nil {
					b.Fatal(err)
				}
				samples += len(readAll(b, r, 4096))
				r.Close()
			}
			b.ReportMetric(float64(samples)/time.Since(start).Seconds()/48000, "x-realtime")
		})
	}
}
