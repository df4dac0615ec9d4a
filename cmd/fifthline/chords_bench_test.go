package main

import (
	"flag"
	"io"
	"math"
	"runtime"
	"testing"
	"time"

	"fifthline/capture"
	"fifthline/ensemble"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// chordsSoak is how much of the quartet's cycle BenchmarkLiveChordsMemory
// reads:
//
//	go test -run XXX -bench LiveChordsMemory -benchtime 1x ./cmd/fifthline/ -chords-soak 1h
var chordsSoak = flag.Duration("chords-soak", 10*time.Minute, "how much 4-channel input BenchmarkLiveChordsMemory reads")

// BenchmarkLiveChordsMemory reads the quartet's cycle (the soak's: two
// chords every 4 s, one note held across both) without a break for
// -chords-soak, from memory as fast as it goes, through the path listen
// --chords takes (ensemble.Run feeding the chords kept live), and reports
// the heap in use after a collection every tenth of the way: it should
// stay flat, as only the notes and frames of chords not yet written are
// kept. The real-time soak (BenchmarkListenPlayersChordsSoak) measures the
// process's resident memory the same way, but a few MB over an hour is
// within its noise.
func BenchmarkLiveChordsMemory(b *testing.B) {
	cycle := readCycle(b)
	for range b.N {
		po := playerOptions{chords: true, seventh: target.DefaultSeventh}
		po.players, _ = ensemble.ParsePlayers(cyclePlayers)
		tunings := session.NewTunings(target.Default())
		chords, rows := 0, 0
		live := po.liveChords(tunings, func(ensemble.Chord, target.Tuning) error { chords++; return nil },
			func(playerNote) error { rows++; return nil })
		src := &loopMulti{cycle: cycle, left: int(chordsSoak.Seconds() * 48000)}
		step := src.left / 10
		var heap []float64
		o := ensemble.Options{Name: "soak", Players: po.players, Tunings: tunings, OnNote: func(n ensemble.Note) error { return live.note(playerNote{Note: n}) },
			OnFrame: func(i int, e pitchdetect.Estimate) {
				live.frame(i, e)
				if i == 0 && src.read >= (len(heap)+1)*step {
					heap = append(heap, heapMB())
				}
			},
			OnSounding: live.sound}
		if err := ensemble.Run(b.Context(), src, o); err != nil {
			b.Fatal(err)
		}
		live.ready(true)
		hours := chordsSoak.Hours() * 0.9 // from the first sample to the last
		b.ReportMetric(heap[0], "heap_first_MB")
		b.ReportMetric(heap[len(heap)-1], "heap_last_MB")
		b.ReportMetric((heap[len(heap)-1]-heap[0])/hours, "heap_growth_MB_per_h")
		b.ReportMetric(float64(chords), "chords")
		b.ReportMetric(float64(rows), "note_rows")
		if want := 2 * int(chordsSoak.Seconds()/cycleSeconds); chords != want {
			b.Errorf("%d chords written, want %d (two a cycle)", chords, want)
		}
		b.Logf("heap after each tenth: %.2f MB", heap)
	}
}

func heapMB() float64 {
	runtime.GC()
	var m runtime.MemStats
	runtime.ReadMemStats(&m)
	return float64(m.HeapAlloc) / (1 << 20)
}

// readCycle is the quartet's cycle (quartetCycleWAV), in memory.
func readCycle(b *testing.B) [][]float32 {
	rec, err := capture.OpenRecording(quartetCycleWAV(b, 1), 1)
	if err != nil {
		b.Fatal(err)
	}
	defer rec.Close()
	n := int(math.Round(rec.Duration() * rec.SampleRate()))
	cycle := make([][]float32, rec.Channels())
	for c := range cycle {
		cycle[c] = make([]float32, n)
	}
	for got := 0; got < n; {
		view := make([][]float32, len(cycle))
		for c := range cycle {
			view[c] = cycle[c][got:]
		}
		k, err := rec.ReadChannels(view)
		if got += k; err != nil && (err != io.EOF || got < n) {
			b.Fatalf("the cycle: %d of %d frames read: %v", got, n, err)
		}
	}
	return cycle
}

// loopMulti plays cycle over and over until left frames have gone.
type loopMulti struct {
	cycle    [][]float32
	at, read int
	left     int
}

func (l *loopMulti) SampleRate() float64 { return 48000 }
func (l *loopMulti) Channels() int       { return len(l.cycle) }

func (l *loopMulti) ReadChannels(dst [][]float32) (int, error) {
	if l.left == 0 {
		return 0, io.EOF
	}
	n := min(len(dst[0]), l.left, len(l.cycle[0])-l.at)
	for c := range dst {
		copy(dst[c], l.cycle[c][l.at:l.at+n])
	}
	l.at, l.read, l.left = (l.at+n)%len(l.cycle[0]), l.read+n, l.left-n
	return n, nil
}

// BenchmarkListenPlayersChordsSoak is the soak with the group meter on
// screen and --chords (-soak long): the journal gains every chord's
// memberships as the chord ends, two chords of four a cycle.
func BenchmarkListenPlayersChordsSoak(b *testing.B) {
	for range b.N {
		soakPlayers(b, *soakLength, true, "--chords")
	}
}
