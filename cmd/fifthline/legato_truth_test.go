package main

import (
	"fmt"
	"math"
	"os/exec"
	"slices"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
)

// The truth of a quick note: what its key sounds rendered alone, read by
// an outside reader (aubio's yin, Debian aubio-tools).

// soundedPitch is what the render of one key sounds, Hz: the pitch it
// settles on when held, and the pitch the same sound has over a quick
// note's span.
type soundedPitch struct {
	settled, span float64
	q             [5]float64 // the span's 10th, 25th, 50th (span), 75th and 90th percentiles
	rings         [5]float64 // the same for a last note, which rings on after its release
}

// Settled pitch: each key rendered alone (2 s, then 0.5 s of silence), the mean
// of its frames from settleFrom to settleTo seconds after the onset — its
// steady part, the vibrato centre over several cycles — as aubio's yin
// (Debian aubio-tools) reads it, so the truth does not come from the
// detector under test.
const (
	settleFrom = 0.5
	settleTo   = 1.7
)

// aubioWindow is the window aubioYin reads with, seconds.
const aubioWindow = 2048.0 / 48000

// renderedPitch measures, for each key, what fluidsynth renders: its settled
// pitch, and for each of seconds the pitch of the same key rendered
// alone for that long (then 1 s of silence): the percentiles of aubio's yin
// frames whose window starts within the note's span, onset to release —
// the note sounds on a little while the next one's attack rises (a
// violin's takes some 30 ms), and a frame begun inside the note reads
// mostly the note — and for a run's last note, which rings on after its
// release, until it dies away. A slurred note's own sound is that:
// fluidsynth starts each note's sample afresh at its note-on, and the note
// before it only fades under it.
// FluidR3's samples do not start on their settled pitch. Measured (frames of
// each key held alone, cents from its settled pitch over the first 0.15 s):
// the trumpet's attack rises 25–45 ¢ and settles after 0.11–0.15 s (G4, A4,
// B♭4 after 0.17–0.2 s; D5 and C5 overshoot by 7–8 ¢); the violin's vibrato
// (about 5–6 Hz, ±12–25 ¢) starts at once; the flute sits 5–13 ¢ off (B5 and
// C6 13 ¢ flat; D6 starts 17 ¢ sharp); the oboe glides down 10–17 ¢ (D4,
// E4, C♯5, D5) or falls 11 ¢ below (A4, B4); the clarinet's G4, E4 and C5
// start 8–15 ¢ flat; the violin's A5 and B5 start 27 ¢ below where they
// settle.
func renderedPitch(t *testing.T, dir string, program int, keys []int, seconds []float64) map[float64]map[int]soundedPitch {
	t.Helper()
	var distinct []int
	seen := map[int]bool{}
	for _, k := range keys {
		if !seen[k] {
			seen[k] = true
			distinct = append(distinct, k)
		}
	}
	alone := func(seconds, rest float64) []pitchFrame {
		var phrase []testsignal.MIDINote
		for _, k := range distinct {
			phrase = append(phrase, testsignal.MIDINote{Key: k, Seconds: seconds, Rest: rest})
		}
		return aubioYin(t, fluidRender(t, dir, fmt.Sprintf("alone-%d-%gs", program, seconds), program, phrase, false))
	}
	held := alone(2, 0.5)
	truth := map[float64]map[int]soundedPitch{}
	for _, seconds := range seconds {
		truth[seconds] = map[int]soundedPitch{}
		quick := alone(seconds, 1)
		for i, k := range distinct {
			et := 440 * math.Exp2(float64(k-69)/12) // ISO 16 and equal temperament
			on := leadIn + 2.5*float64(i)
			settled, ok := meanNear(held, on+settleFrom, on+settleTo, et)
			if !ok {
				t.Fatalf("program %d key %d: aubio's yin finds no settled pitch", program, k)
			}
			on = leadIn + (seconds+1)*float64(i)
			q, ok := percentilesNear(quick, on+aubioWindow, on+seconds+aubioWindow, settled)
			if !ok {
				t.Fatalf("program %d key %d: aubio's yin reads nothing over a %g s note", program, k, seconds)
			}
			rings, _ := percentilesNear(quick, on+aubioWindow, on+seconds+1, settled)
			truth[seconds][k] = soundedPitch{settled: settled, span: q[2], q: q, rings: rings}
		}
	}
	return truth
}

// pitchFrame is one frame of a pitch track; hz is 0 where unvoiced.
type pitchFrame struct{ at, hz float64 }

// meanNear is the mean pitch of the frames from..to within 50 ¢ of near.
func meanNear(track []pitchFrame, from, to, near float64) (float64, bool) {
	sum, n := 0.0, 0
	for _, f := range track {
		if f.at >= from && f.at <= to && f.hz > 0 && math.Abs(testsignal.Cents(f.hz, near)) <= 50 {
			sum += testsignal.Cents(f.hz, near)
			n++
		}
	}
	return near * math.Exp2(sum/float64(max(n, 1))/1200), n > 0
}

// percentilesNear is the 10th, 25th, 50th (median), 75th and 90th
// percentiles of the pitch of the frames from..to within a semitone (100 ¢)
// of near: a quick note's attack may lie 45 ¢ from where it settles, and a
// misread frame an octave off is no part of it.
func percentilesNear(track []pitchFrame, from, to, near float64) ([5]float64, bool) {
	var hz []float64
	for _, f := range track {
		if f.at >= from && f.at <= to && f.hz > 0 && math.Abs(testsignal.Cents(f.hz, near)) <= 100 {
			hz = append(hz, f.hz)
		}
	}
	if len(hz) == 0 {
		return [5]float64{}, false
	}
	slices.Sort(hz)
	at := func(q float64) float64 { // linear between order statistics
		x := q * float64(len(hz)-1)
		i := int(x)
		if i+1 >= len(hz) {
			return hz[i]
		}
		return hz[i] + (x-float64(i))*(hz[i+1]-hz[i])
	}
	return [5]float64{at(0.1), at(0.25), at(0.5), at(0.75), at(0.9)}, true
}

// aubioYin is aubio's yin pitch track of a file's first channel, the one
// analyze reads (Debian aubio-tools; sox takes the channel out, as aubio
// would mix both). A frame's time is the end of its window (sox sines
// changing from 440 to 660 Hz at 0.8 s read 440 Hz until 0.811 s and 660 Hz
// from 0.837 s: measured).
func aubioYin(t *testing.T, wav string) []pitchFrame { return aubioTrack(t, wav, "yin") }

// aubioTrack is aubio's pitch track by method (yin, yinfft) of a file's
// first channel, as aubioYin.
func aubioTrack(t *testing.T, wav, method string) []pitchFrame {
	t.Helper()
	first := strings.TrimSuffix(wav, ".wav") + ".ch1.wav"
	if out, err := exec.Command("sox", wav, first, "remix", "1").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	out, err := exec.Command("aubiopitch", "-i", first, "-p", method, "-B", "2048", "-H", "256").Output()
	if err != nil {
		t.Fatalf("aubiopitch (make test installs aubio-tools): %v", err)
	}
	var track []pitchFrame
	for _, line := range strings.Split(string(out), "\n") {
		if f := strings.Fields(line); len(f) == 2 {
			at, _ := strconv.ParseFloat(f[0], 64)
			hz, _ := strconv.ParseFloat(f[1], 64)
			track = append(track, pitchFrame{at, hz})
		}
	}
	return track
}
