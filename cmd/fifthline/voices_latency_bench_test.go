package main

import (
	"regexp"
	"slices"
	"strconv"
	"testing"
	"time"
)

// How soon the group meter of `listen --voices auto --chords` names a
// chord after it starts (the voices issue's bar: 300 ms), through a
// private virtual microphone and the meter's own screen in tmux:
//
//	go test -run XXX -bench ListenVoicesChordLatency -benchtime 1x ./cmd/fifthline/
//
// Three just triads of sox sawtooths, each after a second of silence: C
// major on C4 (261.63 Hz), F major on F3 and G major on G3 (a just fifth
// and a just fourth below C4), the third and fifth 5/4 and 3/2 above each
// root (common practice). The screen is read every 10 ms; a chord's time is from the
// moment paplay began plus the chord's offset in the file to the first
// screen naming it as the chord sounding now ("chord F major", not "last
// chord"). The figure is an upper bound: it includes paplay's start-up and
// PulseAudio's bursts of 42.7 ms (BENCH.md) as well as the reading.
func BenchmarkListenVoicesChordLatency(b *testing.B) {
	for range b.N {
		_, env, play := privateMic(b)
		wav, onsets := chordLatencyWAV(b)
		m := startTmux(b, 80, 24, env, "listen", "--voices", "auto", "--key", "C major", "--chords")
		m.waitFor(`no chord yet`)
		time.Sleep(500 * time.Millisecond) // the stream settles
		done := make(chan struct{})
		played := time.Now()
		go func() {
			defer close(done)
			play(wav)
		}()
		names := []string{"C major", "F major", "G major"}
		seen := make([]time.Duration, len(names))
		patterns := make([]*regexp.Regexp, len(names))
		for i, n := range names {
			patterns[i] = regexp.MustCompile(`(?m)(^|[^ t]) *chord ` + n)
		}
		last := ""
		for polling := true; polling; {
			select {
			case <-done:
				polling = false
			case <-time.After(10 * time.Millisecond):
			}
			s, at := m.screen(), time.Since(played)
			last = s
			for i, p := range patterns {
				if seen[i] == 0 && p.MatchString(s) {
					seen[i] = at
				}
			}
		}
		m.tmux("send-keys", "-t", "meter", "q")
		m.exitStatus()
		var ms []float64
		for i, at := range seen {
			if at == 0 {
				b.Fatalf("the meter never named %s:\n%s", names[i], last)
			}
			ms = append(ms, float64(at-onsets[i])/float64(time.Millisecond))
		}
		b.Logf("chord start → named on the meter, ms: %.0f", ms)
		b.ReportMetric(median(ms), "chord→named_ms")
		b.ReportMetric(slices.Max(ms), "chord→named_max_ms")
	}
}

// chordLatencyWAV writes the benchmark's chords at 48 kHz, each 2.5 s after
// 1 s of silence, and returns when each starts in the file.
func chordLatencyWAV(b *testing.B) (string, []time.Duration) {
	dir := b.TempDir()
	f := func(x float64) string { return strconv.FormatFloat(x, 'f', 4, 64) }
	var parts []string
	var onsets []time.Duration
	for i, root := range []float64{261.63, 261.63 * 2 / 3, 261.63 * 3 / 4} {
		part := dir + "/chord" + strconv.Itoa(i) + ".wav"
		soxTB(b, "-n", "-r", "48000", "-c", "1", "-b", "16", part, "synth", "2.5", "sawtooth", f(root), "sawtooth", f(root*5/4), "sawtooth", f(root*3/2),
			"remix", "1,2,3", "gain", "-10", "pad", "1", "0")
		parts = append(parts, part)
		onsets = append(onsets, time.Duration(float64(i)*3.5*float64(time.Second))+time.Second)
	}
	wav := dir + "/chords.wav"
	soxTB(b, append(append(parts, wav), "pad", "0", "1")...)
	return wav, onsets
}
