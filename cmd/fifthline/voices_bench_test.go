package main

import (
	"os"
	"path/filepath"
	"testing"
)

// Live cost of `listen --plain --voices auto` at 48 kHz through a virtual
// microphone: held chords of three and four voices, played while the
// command listens.
//
//	go test -run XXX -bench ListenVoicesLive -benchtime 1x ./cmd/fifthline/
//
// cpu_%core and rss_MB as in BenchmarkListenPlainLive (/proc/PID/stat and
// /proc/PID/status over the chords); voice_notes: the voices' held notes
// the command wrote (7 played).
func BenchmarkListenVoicesLive(b *testing.B) {
	for range b.N {
		_, env, play := privateMic(b)
		wav := chordsWAV(b)
		wait, proc := startPlainProcess(b, env, "--voices", "auto", "--duration", "120s")
		reportCost(b, proc.Pid, func() { play(wav) })
		_ = proc.Signal(os.Interrupt)
		code, out, stderr := wait()
		if code != 0 {
			b.Fatalf("exit %d: %s", code, stderr)
		}
		_, rows := readCSV(b, out)
		b.ReportMetric(float64(len(rows)), "voice_notes")
	}
}

// chordsWAV writes the benchmark's chords, sawtooths summed by sox at 48
// kHz, each after half a second of silence: a just C major triad (C4, and
// 5/4 and 3/2 above it) for 6 s, then an equal-tempered G7 (G3 B3 D4 F4;
// ISO 16, common practice) for 6 s.
func chordsWAV(b *testing.B) string {
	dir := b.TempDir()
	triad, g7, wav := filepath.Join(dir, "triad.wav"), filepath.Join(dir, "g7.wav"), filepath.Join(dir, "chords.wav")
	soxTB(b, "-n", "-r", "48000", "-c", "1", "-b", "16", triad, "synth", "6", "sawtooth", "261.63", "sawtooth", "327.0375", "sawtooth", "392.445", "remix", "1,2,3", "gain", "-10", "pad", "0.5", "0")
	soxTB(b, "-n", "-r", "48000", "-c", "1", "-b", "16", g7, "synth", "6", "sawtooth", "196", "sawtooth", "246.94", "sawtooth", "293.66", "sawtooth", "349.23", "remix", "1,2,3,4", "gain", "-12", "pad", "0.5", "1")
	soxTB(b, triad, g7, wav)
	return wav
}

// The same chords heard by `listen --voices auto --chords` with the group
// meter (80 × 24 in tmux), whose screen the voices' frames draw as they
// come (a frame every 85 ms) in place of the periodic redraw:
//
//	go test -run XXX -bench ListenVoicesMeterLive -benchtime 1x ./cmd/fifthline/
func BenchmarkListenVoicesMeterLive(b *testing.B) {
	for range b.N {
		_, env, play := privateMic(b)
		wav := chordsWAV(b)
		m := startTmux(b, 80, 24, env, "listen", "--voices", "auto", "--key", "C major", "--chords")
		m.waitFor(`no chord yet`)
		reportCost(b, meterPid(b, m), func() { play(wav) })
		m.quit()
		reportLoad(b)
	}
}
