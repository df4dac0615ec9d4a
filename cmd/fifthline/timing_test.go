package main

import (
	"math"
	"slices"
	"testing"
)

// The timing log's onsets, found in captured samples read in pieces of any
// length: a channel's note is an onset after 0.2 s of quiet, found at the
// 128-frame chunk it starts in; bleed 20 dB under the note (-37 dBFS, as
// in the live benchmark) is quiet, a note's fade-in is traced back to its
// start, and a note after too short a rest is not an onset. Levels are
// RMS: a sine of amplitude a is a²/2.
func TestOnsetFinderFindsNotesAfterQuiet(t *testing.T) {
	const rate = 48000
	sine := func(dst []float32, from, to int, dbfs float64) {
		a := math.Sqrt(2) * math.Pow(10, dbfs/20)
		for i := from; i < to; i++ {
			dst[i] = float32(a * math.Sin(2*math.Pi*440*float64(i)/rate))
		}
	}
	total := 2 * rate
	chans := [][]float32{make([]float32, total), make([]float32, total), make([]float32, total)}
	sine(chans[0], 0, 1000, -17)      // at once: the stream's start counts as quiet
	sine(chans[0], 30000, 60000, -17) // 0.625 s in: after 0.6 s of silence
	sine(chans[0], 65000, 90000, -17) // after 0.1 s of rest: no onset
	sine(chans[1], 0, total, -37)     // bleed all along
	sine(chans[1], 50000, 80000, -17) // a note over the bleed
	sine(chans[1], 80000, total, -37) // and the bleed again
	sine(chans[2], 40000, 60000, -17) // faded in over 20 ms (960 frames), as sox's fade does
	for i := range 960 {
		chans[2][40000+i] *= float32(i) / 960
	}
	type onset struct {
		ch    int
		frame int64
	}
	var got []onset
	f := newOnsetFinder(rate, 3)
	for i, step := 0, 1000; i < total; i, step = i+step, step%1999+7 { // reads of ragged lengths
		n := min(step, total-i)
		f.feed([][]float32{chans[0][i : i+n], chans[1][i : i+n], chans[2][i : i+n]}, n, func(ch int, frame int64, dbfs float64) {
			got = append(got, onset{ch, frame})
			if ch < 2 && (dbfs < -22 || dbfs > -17) { // the chunk starts before the note
				t.Errorf("channel %d's onset at frame %d reads %.1f dBFS, want -22 to -17", ch, frame, dbfs)
			}
		})
	}
	// 30000 and 50000 lie in the 128-frame chunks starting at 29952 and
	// 49920, which hold 80 frames of the notes: -19.0 and -21.7 dBFS.
	// The faded note passes -24 dBFS 8.6 ms in, at frame 40414; its rise
	// began in the chunk starting at 39936.
	want := []onset{{0, 0}, {0, 29952}, {2, 39936}, {1, 49920}}
	if !slices.Equal(got, want) {
		t.Errorf("onsets %v, want %v", got, want)
	}
}
