package main

import (
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
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
// root (common practice), played once the input's stream has run a second
// (streamRunning). The screen is read every 10 ms; a chord's time is from the
// moment paplay began plus the chord's offset in the file to the first
// screen naming it as the chord sounding now ("chord F major", not "last
// chord"). That figure is an upper bound: it includes paplay's start-up and
// PulseAudio's bursts of 42.7 ms (BENCH.md) as well as the reading.
//
// onset→named times the same screens from when each chord's first samples
// reached the input's converter, both on PortAudio's clock, as
// FIFTHLINE_TIMING logs them (timing.go): the onset found in the captured
// channel, and the screen's moment (when its capture returned: late by up
// to the 10 ms poll and the capture) moved onto that clock by the log's
// rows, each written with both clocks. onset→read is to the first frame of
// the voices holding all three notes of the chord (within 50 ¢), on the
// same clock: the meter's input.
func BenchmarkListenVoicesChordLatency(b *testing.B) {
	for range b.N {
		_, env, play := privateMic(b)
		wav, onsets := chordLatencyWAV(b)
		timing := filepath.Join(b.TempDir(), "timing.csv")
		env = append(env, "FIFTHLINE_TIMING="+timing)
		m := startTmux(b, 80, 24, env, "listen", "--voices", "auto", "--key", "C major", "--chords")
		m.waitFor(`no chord yet`)
		streamRunning(b, timing, 1)
		done := make(chan struct{})
		played := time.Now()
		go func() {
			defer close(done)
			play(wav)
		}()
		names := []string{"C major", "F major", "G major"}
		seen := make([]time.Duration, len(names))
		seenAt := make([]time.Time, len(names))
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
					seen[i], seenAt[i] = at, played.Add(at)
				}
			}
		}
		m.quit()
		var ms []float64
		for i, at := range seen {
			if at == 0 {
				b.Fatalf("the meter never named %s:\n%s", names[i], last)
			}
			ms = append(ms, float64(at-onsets[i])/float64(time.Millisecond))
		}
		b.Logf("chord start (paplay's start + offset) → named on the meter, ms: %.0f", ms)
		b.ReportMetric(median(ms), "chord→named_ms")
		b.ReportMetric(slices.Max(ms), "chord→named_max_ms")
		named, read := chordLatencies(b, timing, seenAt)
		b.Logf("onset at the input → named on the meter, ms: %.0f", named)
		b.Logf("onset at the input → first frame reading the chord, ms: %.0f", read)
		b.ReportMetric(median(named), "onset→named_ms")
		b.ReportMetric(slices.Max(named), "onset→named_max_ms")
		b.ReportMetric(median(read), "onset→read_ms")
		b.ReportMetric(slices.Max(read), "onset→read_max_ms")
		reportLoad(b)
	}
}

// streamRunning waits until the timing log holds a frame from secs into the
// input's stream. The meter shows before the input delivers (1–2 s on a
// loaded machine), and a chord played at once was read late: the first
// chord of a run, played half a second after the meter showed, was read
// 339–403 ms after its onset against 96–178 ms for the later ones (load
// 10–12), the samples before it read 264 ms after they reached the
// converter (measured from the log), a lag gone by the next chord.
func streamRunning(b *testing.B, path string, secs float64) {
	b.Helper()
	for deadline := time.Now().Add(30 * time.Second); time.Now().Before(deadline); time.Sleep(50 * time.Millisecond) {
		data, _ := os.ReadFile(path)
		lines := strings.Split(string(data), "\n") // the last is partial or empty
		for _, l := range lines[:max(0, len(lines)-1)] {
			if f := strings.Split(l, ","); len(f) > 1 {
				if t, err := strconv.ParseFloat(f[1], 64); err == nil && t >= secs {
					return
				}
			}
		}
	}
	b.Fatalf("the input's stream did not reach %g s within 30 s", secs)
}

// chordLatencies reads the timing log of the benchmark's three chords: for
// each, from its onset at the input (the log's onset rows in order, one per
// chord after its second of silence) to the moment the meter named it
// (named: wall-clock moments) and to the first frame whose voices hold
// the chord's three notes within 50 ¢, in ms on PortAudio's clock.
func chordLatencies(b *testing.B, path string, named []time.Time) (toNamed, toRead []float64) {
	recs := timingRows(b, path)
	var onsets, offsets []float64 // onsets: on PortAudio's clock, stream time
	var onsetsT []float64
	type row struct{ t, hz, clock float64 }
	var rows []row
	for _, r := range recs {
		switch {
		case r[9] != "":
			onsets, onsetsT = append(onsets, parseNum(r[9])), append(onsetsT, parseNum(r[1]))
		case r[8] != "":
			ns, _ := strconv.ParseInt(r[0], 10, 64)
			offsets = append(offsets, float64(ns)/1e9-parseNum(r[8]))
			rows = append(rows, row{parseNum(r[1]), parseNum(r[2]), parseNum(r[8])})
		}
	}
	if len(onsets) != len(named) || len(offsets) == 0 {
		b.Fatalf("%d onsets found at the input and %d readings logged; want %d onsets", len(onsets), len(offsets), len(named))
	}
	// Wall clock minus PortAudio's: the rows' spread is the scheduling
	// between the two readings of the clocks, so the median.
	offset := median(offsets)
	b.Logf("wall clock − PortAudio's over the run: median %.6f s, spread %.1f ms", offset, 1000*(slices.Max(offsets)-slices.Min(offsets)))
	for i, root := range []float64{261.63, 261.63 * 2 / 3, 261.63 * 3 / 4} {
		toNamed = append(toNamed, 1000*(float64(named[i].UnixNano())/1e9-offset-onsets[i]))
		// A frame's window reaches past its time: frames from half a
		// second before the onset count, the chord before long ended.
		heard := make([]bool, 3)
		for k, r := range rows {
			if r.t < onsetsT[i]-0.5 || (k > 0 && rows[k-1].t != r.t) {
				clear(heard)
			}
			for j, ratio := range []float64{1, 5.0 / 4, 3.0 / 2} {
				heard[j] = heard[j] || (r.t >= onsetsT[i]-0.5 && math.Abs(1200*math.Log2(r.hz/(root*ratio))) <= 50)
			}
			if !slices.Contains(heard, false) {
				toRead = append(toRead, 1000*(r.clock-onsets[i]))
				break
			}
		}
		if len(toRead) != i+1 {
			b.Fatalf("no frame read chord %d's three notes", i+1)
		}
	}
	return toNamed, toRead
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
