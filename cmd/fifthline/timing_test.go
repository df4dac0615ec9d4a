package main

import (
	"encoding/csv"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"fifthline/multipitch"
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

// oneChannelInput is a stand-in for a live input of one channel whose
// converter clock starts at clockStart s (the real one, PortAudio's, runs
// in BenchmarkListenVoicesChordLatency): samples handed out in reads of
// 1000 frames.
type oneChannelInput struct {
	samples    []float32
	read       int
	clockStart float64
}

func (in *oneChannelInput) SampleRate() float64 { return 48000 }
func (in *oneChannelInput) Channels() int       { return 1 }
func (in *oneChannelInput) Read(dst []float32) (int, error) {
	return in.ReadChannels([][]float32{dst})
}
func (in *oneChannelInput) ReadChannels(dst [][]float32) (int, error) {
	n := copy(dst[0][:min(len(dst[0]), 1000)], in.samples[in.read:])
	in.read += n
	if n == 0 {
		return 0, io.EOF
	}
	return n, nil
}
func (in *oneChannelInput) ADCTime(frame int64) (float64, bool) {
	return in.clockStart + float64(frame)/48000, true
}
func (in *oneChannelInput) StreamTime() float64 { return in.clockStart + float64(in.read)/48000 }

// With --voices the timing log has a row per voice read, named "voice N"
// from the lowest, its amplitude in dBFS (20·log10), with the stream clock
// when written; a frame of no voice is one unvoiced row. The one channel's
// onsets are found as it is read through Read and named "voices", timed at
// the converter: a tone starting 0.5 s in (frame 24000, in the 128-frame
// chunk from 23936) reached it at clockStart + 23936/48000 s. That chunk
// holds 64 frames of the tone (a sine of amplitude 0.5, -9.0 dBFS): about
// 3 dB less, -12.6 dBFS at those 64 samples' phases.
func TestTimingLogsVoicesAndTheOneChannelsOnsets(t *testing.T) {
	path := filepath.Join(t.TempDir(), "timing.csv")
	t.Setenv("FIFTHLINE_TIMING", path)
	tl, err := openTiming(48000)
	if err != nil {
		t.Fatal(err)
	}
	in := &oneChannelInput{samples: make([]float32, 48000), clockStart: 100}
	for i := 24000; i < len(in.samples); i++ {
		in.samples[i] = float32(0.5 * math.Sin(2*math.Pi*440*float64(i)/48000))
	}
	src := tl.withClockOne(in, "voices")
	buf := make([]float32, 4096)
	for {
		if _, err := src.Read(buf); err != nil {
			break
		}
	}
	tl.voicesFrame(multipitch.Frame{Time: 0.1, Level: -80})
	tl.voicesFrame(multipitch.Frame{Time: 0.6, Voices: []multipitch.Voice{{Hz: 261.63, Amplitude: 0.1}, {Hz: 392, Amplitude: 0.01}}})
	tl.close()
	// Columns: time_s, hz, level_dbfs, voiced, player, clock_s,
	// onset_adc_s.
	var got [][]string
	for _, r := range timingRows(t, path) {
		got = append(got, []string{r[1], r[2], r[3], r[4], r[7], r[8], r[9]})
	}
	want := [][]string{
		{"0.4987", "", "-12.6", "", "voices", "", "100.498667"},
		{"0.1000", "0.00", "-80.0", "false", "", "", ""},
		{"0.6000", "261.63", "-20.0", "true", "voice 1", "101.000000", ""},
		{"0.6000", "392.00", "-40.0", "true", "voice 2", "101.000000", ""},
	}
	if !slices.EqualFunc(got, want, slices.Equal) {
		t.Errorf("timing log rows\n%v\nwant\n%v", got, want)
	}
}

// timingRows are the FIFTHLINE_TIMING log's frame rows (its two heading
// lines left out).
func timingRows(tb testing.TB, path string) [][]string {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	return recs[min(2, len(recs)):]
}
