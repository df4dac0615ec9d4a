package main

import (
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"strconv"
	"time"

	"fifthline/multipitch"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/source"
)

// timingLog is a debugging aid for measuring latency: with FIFTHLINE_TIMING
// set to a file name, listen --plain writes one CSV line per analysis frame
// with the wall-clock time it left the pipeline, so a test can compare it
// with the moment a sound was played into the virtual microphone. With
// --players each player's frames are logged, named in the player column,
// and, the input's clock known (withClock), also the stream clock when each
// voiced frame was written (clock_s) and a row per onset found in the
// captured samples with the time its first frame reached the converter
// (onset_adc_s; hz and voiced left empty), both on PortAudio's clock.
// With --voices the same, each frame's voices a row apiece named "voice N"
// (1 = lowest) in the player column, the channel's onsets named "voices".
type timingLog struct {
	f     *os.File
	w     *csv.Writer
	clock inputClock // nil: frames only
}

// inputClock is a live input's PortAudio clock (device.Input's).
type inputClock interface {
	ADCTime(frame int64) (float64, bool)
	StreamTime() float64
}

func openTiming(rate float64) (*timingLog, error) {
	path := os.Getenv("FIFTHLINE_TIMING")
	if path == "" {
		return &timingLog{}, nil
	}
	f, err := os.Create(path)
	if err != nil {
		return nil, fmt.Errorf("FIFTHLINE_TIMING: %w", err)
	}
	t := &timingLog{f: f, w: csv.NewWriter(f)}
	t.w.Write([]string{"wall_unix_ns", "time_s", "hz", "level_dbfs", "voiced", "holding", "rate", "player", "clock_s", "onset_adc_s"})
	t.w.Write([]string{strconv.FormatInt(time.Now().UnixNano(), 10), "", "", "", "", "", strconv.FormatFloat(rate, 'f', -1, 64), "", "", ""})
	return t, nil
}

func (t *timingLog) frame(f session.Frame) { t.write(f.Estimate, strconv.FormatBool(f.Holding), "") }

// playerFrame logs one player's frame as ensemble reads it, before the
// segmenter: holding is left empty.
func (t *timingLog) playerFrame(player string, e pitchdetect.Estimate) { t.write(e, "", player) }

// voicesFrame logs one frame of the voices as read (the meter's and the
// chords' input): a row per voice, or one unvoiced row when none is.
func (t *timingLog) voicesFrame(f multipitch.Frame) {
	if t.f == nil {
		return
	}
	if len(f.Voices) == 0 {
		t.write(pitchdetect.Estimate{Time: f.Time, Level: f.Level}, "", "")
	}
	for i, v := range f.Voices {
		e := pitchdetect.Estimate{Time: f.Time, Hz: v.Hz, Level: 20 * math.Log10(v.Amplitude), Voiced: true}
		t.write(e, "", "voice "+strconv.Itoa(i+1))
	}
}

func (t *timingLog) write(e pitchdetect.Estimate, holding, player string) {
	if t.f == nil {
		return
	}
	clock := ""
	if t.clock != nil && e.Voiced { // a reading; silence needs no clock
		clock = strconv.FormatFloat(t.clock.StreamTime(), 'f', 6, 64)
	}
	t.w.Write([]string{strconv.FormatInt(time.Now().UnixNano(), 10), strconv.FormatFloat(e.Time, 'f', 4, 64),
		strconv.FormatFloat(e.Hz, 'f', 2, 64), strconv.FormatFloat(e.Level, 'f', 1, 64),
		strconv.FormatBool(e.Voiced), holding, "", player, clock, ""})
	t.w.Flush()
}

// withClock times the log's readings on clock, and reads src on its way to
// the pipeline for onsets on the channels named (by channel; "" for a
// channel not followed), logged with when they reached the converter.
// Without the log it returns src.
func (t *timingLog) withClock(src source.Multi, clock inputClock, names []string) source.Multi {
	if t.f == nil {
		return src
	}
	t.clock = clock
	return &onsetTap{Multi: src, t: t, names: names, find: newOnsetFinder(src.SampleRate(), src.Channels())}
}

// timedInput is a live input of one channel and its clock (capture.Input).
type timedInput interface {
	source.Source
	source.Multi
	inputClock
}

// withClockOne is withClock for an input of one channel read as a Source
// (--voices), its onsets named name.
func (t *timingLog) withClockOne(src timedInput, name string) source.Source {
	if t.f == nil {
		return src
	}
	return t.withClock(src, src, []string{name}).(*onsetTap)
}

// onsetTap passes a source's samples on and logs the onsets in them.
type onsetTap struct {
	source.Multi
	t     *timingLog
	names []string
	find  *onsetFinder
}

// Read is ReadChannels of a one-channel source.
func (o *onsetTap) Read(dst []float32) (int, error) { return o.ReadChannels([][]float32{dst}) }

func (o *onsetTap) ReadChannels(dst [][]float32) (int, error) {
	n, err := o.Multi.ReadChannels(dst)
	o.find.feed(dst, n, func(ch int, frame int64, dbfs float64) {
		if ch >= len(o.names) || o.names[ch] == "" {
			return
		}
		adc, ok := o.t.clock.ADCTime(frame)
		if !ok {
			return
		}
		o.t.w.Write([]string{strconv.FormatInt(time.Now().UnixNano(), 10),
			strconv.FormatFloat(float64(frame)/o.SampleRate(), 'f', 4, 64), "",
			strconv.FormatFloat(dbfs, 'f', 1, 64), "", "", "", o.names[ch], "",
			strconv.FormatFloat(adc, 'f', 6, 64)})
		o.t.w.Flush()
	})
	return n, err
}

func (t *timingLog) close() {
	if t.f != nil {
		t.w.Flush()
		t.f.Close()
	}
}

// An onset in the captured samples, for the timing log: a chunk of
// onsetChunk frames (2.7 ms at 48 kHz) louder than onsetDBFS after at
// least onsetQuiet seconds of chunks at or below it, moved back to where
// its rise began (the earliest of the chunks before it each onsetRise
// louder than the one before, up to onsetBack chunks). The live
// benchmark's notes sound at -17 dBFS and the others' bleed sums to
// -27 dBFS at the most, and its shortest rest is 0.3 s; its notes fade in
// over 20 ms, rising about 5 dB a chunk, so an onset is found within a
// chunk or two of where it starts.
const (
	onsetChunk = 128
	onsetDBFS  = -24.0
	onsetQuiet = 0.2
	onsetRise  = 3.0 // dB
	onsetBack  = 8
)

// onsetFinder reads channels in step, in reads of any length, chunk by
// chunk.
type onsetFinder struct {
	frame int64       // frames fed
	quiet int64       // frames of quiet chunks wanted before an onset
	sums  []float64   // each channel's sum of squares in the current chunk
	still []int64     // each channel's frames of quiet chunks just before it
	last  [][]float64 // each channel's latest chunk levels, dBFS, oldest first
}

func newOnsetFinder(rate float64, channels int) *onsetFinder {
	f := &onsetFinder{quiet: int64(math.Ceil(onsetQuiet * rate)), sums: make([]float64, channels),
		still: make([]int64, channels), last: make([][]float64, channels)}
	for c := range f.last {
		f.last[c] = make([]float64, 0, onsetBack+1)
		f.still[c] = f.quiet // the stream's start counts as after quiet
	}
	return f
}

// feed takes n frames of each channel and calls onset for each onset
// found: the channel, the frame starting the chunk where it began counted
// over all feeds, and that chunk's level.
func (f *onsetFinder) feed(chans [][]float32, n int, onset func(ch int, frame int64, dbfs float64)) {
	for i := 0; i < n; {
		k := min(n-i, onsetChunk-int(f.frame%onsetChunk))
		for c := range f.sums {
			for _, x := range chans[c][i : i+k] {
				f.sums[c] += float64(x) * float64(x)
			}
		}
		i, f.frame = i+k, f.frame+int64(k)
		if f.frame%onsetChunk != 0 {
			continue
		}
		for c, sum := range f.sums {
			dbfs := 10 * math.Log10(sum/onsetChunk) // -Inf for digital silence
			if l := f.last[c]; len(l) > onsetBack {
				f.last[c] = append(l[:copy(l, l[1:])], dbfs)
			} else {
				f.last[c] = append(l, dbfs)
			}
			if dbfs <= onsetDBFS {
				f.still[c] += onsetChunk
			} else {
				if f.still[c] >= f.quiet {
					j, l := len(f.last[c])-1, f.last[c]
					for j > 1 && l[j-1]-l[j-2] >= onsetRise { // NaN from silence to silence
						j--
					}
					onset(c, f.frame-int64(len(l)-j)*onsetChunk, l[j])
				}
				f.still[c] = 0
			}
			f.sums[c] = 0
		}
	}
}
