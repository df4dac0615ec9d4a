package main

import (
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

// A lone part's truth. FluidR3's samples are tuned by ear and their pitch
// moves within a note (the clarinet's E4 rises 3 ¢ and falls 5 ¢ over its
// 2.5 s: aubio's yin, measured), so a note's truth is what independent
// readers hear of its lone render over its steady part, summed to one
// channel exactly as the mixture is (a stereo sample's two channels differ:
// the bassoon's C3 reads 1.4 ¢ apart on the left channel alone and on both,
// measured). The readers: fifthline's single-voice detector, aubio's yin and
// aubio's yinfft (Debian aubio-tools), the two aubio tracks averaged in
// cents over the detector's note less 0.1 s at each end, over whole vibrato
// cycles where the detector found a vibrato. The truth is their median; how
// far they lie apart is logged, and is how far the truth itself can be
// trusted. (The estimator under test, reading the lone part, is logged
// beside them but is no reader of the truth.)

// loneTruth renders part alone (file names its files in dir, name it in
// the log) and returns its one-channel render and each
// note's truth, with the widest disagreement of the readers over its notes
// in cents.
func loneTruth(t *testing.T, dir, file, name string, part testsignal.MIDIPart) (mono string, truth []float64, spread float64) {
	t.Helper()
	wav := renderMIDI(t, dir, file, testsignal.MIDIParts([]testsignal.MIDIPart{part}))
	mono = filepath.Join(dir, file+".mono.wav")
	monoSum(t, wav, mono)
	code, out, stderr := runLong(t, "analyze", mono)
	if code != 0 {
		t.Fatalf("%s alone: exit %d: %s", name, code, stderr)
	}
	_, rows := readCSV(t, out)
	yin, yinfft := aubioTrack(t, mono, "yin"), aubioTrack(t, mono, "yinfft")
	for _, n := range part.Notes {
		// The longest note read while it sounds: an attack or a sample's
		// release may read as a short note of its own.
		var row map[string]string
		longest := 0.0
		for _, r := range rows {
			if d := num(r, "end_s") - num(r, "start_s"); num(r, "start_s") < n.Start+n.Seconds && num(r, "end_s") > n.Start && d > longest {
				row, longest = r, d
			}
		}
		if row == nil {
			t.Fatalf("%s alone: no note at %g s:\n%s", name, n.Start, out)
		}
		det := num(row, "hz")
		from, to := num(row, "start_s")+0.1, num(row, "end_s")-0.1
		if vr := num(row, "vibrato_hz"); vr > 0 {
			to = from + math.Floor((to-from)*vr)/vr
		}
		readings := []float64{det}
		words := fmt.Sprintf("detector %.4f Hz", det)
		for _, tr := range []struct {
			name  string
			track []pitchFrame
		}{{"yin", yin}, {"yinfft", yinfft}} {
			if hz, ok := meanNear(tr.track, from, to, det); ok {
				readings = append(readings, hz)
				words += fmt.Sprintf(", aubio %s %+.2f ¢", tr.name, testsignal.Cents(hz, det))
			} else {
				words += fmt.Sprintf(", aubio %s none", tr.name)
			}
		}
		slices.Sort(readings)
		hz := readings[len(readings)/2]
		if len(readings) == 2 {
			hz = math.Sqrt(readings[0] * readings[1])
		}
		apart := testsignal.Cents(readings[len(readings)-1], readings[0])
		spread = math.Max(spread, apart)
		truth = append(truth, hz)
		asked := 440 * math.Exp2(float64(n.Key-69)/12+testsignal.BendCents(part.Cents)/1200)
		t.Logf("%s %s alone: %s; truth %.4f Hz (readers %.2f ¢ apart), %+.2f ¢ from the asked pitch", name, spelled(n.Key), words, hz, apart, testsignal.Cents(hz, asked))
	}
	return mono, truth, spread
}

// monoSum sums a stereo render onto one channel, as a microphone between
// the speakers would (sox remix, each channel at half).
func monoSum(t *testing.T, wav, mono string) {
	t.Helper()
	soxTB(t, "-R", wav, "-b", "32", "-e", "floating-point", mono, "remix", "1v0.5,2v0.5")
}
