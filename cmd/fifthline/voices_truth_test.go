package main

import (
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
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
// cycles where the detector found a vibrato; over a chord's stretch, the
// detector's frames and the aubio tracks averaged over it, as the chord's
// members are read (partReaders.over). The truth is their median; how
// far they lie apart is logged, and is how far the truth itself can be
// trusted. (The estimator under test, reading the lone part, is logged
// beside them but is no reader of the truth.)
//
// A fourth reader is logged beside them and kept out of the median: the
// time average of the partials' instantaneous frequencies
// (voices_phase_test.go), exact on additive saws with a vibrato of up to
// ±16 ¢ (within 0.015 ¢), where YIN-type readers weigh a vibrato's moments
// by loudness. On the rendered parts, measured: bowed strings' truths are
// fair, it lies within 0.8 ¢ of the median for the quartet's D3, A3, B3, F4
// and D5 and the meantone scene's D3, D4, A3, B♭4, F♯4; but a sample's loop
// whose ends do not meet in phase steps every partial's phase where it
// wraps, and steps too small to tell from a vibrato stay in its average: it
// reads the cellos' G2 2.0 and 2.1 ¢ over the median, the violin's C5 1.8 ¢
// under (3.5 ¢ with its track begun and ended 0.1 s further out), a
// chorused A3 (choir aahs) 7.9 ¢ over yin. Taken into the median (of four,
// the mean of the middle two) it moved the string quartet to median 0.69 ¢,
// worst 1.79, just 2.62 (from 0.99, 1.91, 2.90), the choir to 2.28, 3.69,
// 6.29 (from 1.82, 3.72, 6.47), the cello-and-choir sixths' worst 8.27 →
// 5.52 ¢ but their median 1.65 → 2.17, the meantone strings' worst 2.30 →
// 2.94 ¢: no better a truth where the parts are chorused or looped off
// phase, so the truth stays the three readers' median. For a chorused part
// the readers, this one included, lie up to 3.2 ¢ apart (the choir's D4):
// its truth is no finer than that.

// loneTruth renders part alone (file names its files in dir, name it in
// the log) and returns its one-channel render, each note's truth, with the
// widest disagreement of the readers over its notes in cents, and the
// readers' tracks, for the truth over a stretch (partReaders.over).
func loneTruth(t *testing.T, dir, file, name string, part testsignal.MIDIPart) (mono string, truth []float64, spread float64, readers partReaders) {
	t.Helper()
	wav := renderMIDI(t, dir, file, testsignal.MIDIParts([]testsignal.MIDIPart{part}))
	mono = filepath.Join(dir, file+".mono.wav")
	monoSum(t, wav, mono)
	code, out, stderr := runLong(t, "analyze", mono)
	if code != 0 {
		t.Fatalf("%s alone: exit %d: %s", name, code, stderr)
	}
	_, rows := readCSV(t, out)
	readers = partReaders{detector: detectorTrack(t, mono), yin: aubioTrack(t, mono, "yin"), yinfft: aubioTrack(t, mono, "yinfft")}
	samples := monoSamples(t, mono)
	for _, n := range part.Notes {
		// The note read longest while it sounds: an attack or a sample's
		// release may read as a short note of its own, and the note before
		// may ring into it (chords one after another).
		var row map[string]string
		longest := 0.0
		for _, r := range rows {
			if d := math.Min(num(r, "end_s"), n.Start+n.Seconds) - math.Max(num(r, "start_s"), n.Start); d > longest {
				row, longest = r, d
			}
		}
		if row == nil {
			t.Fatalf("%s alone: no note at %g s:\n%s", name, n.Start, out)
		}
		det := num(row, "hz")
		from, to := num(row, "start_s")+0.1, num(row, "end_s")-0.1
		vr := num(row, "vibrato_hz")
		readers.vibrato = append(readers.vibrato, vr)
		to = wholeCycles(from, to, vr)
		readings := []float64{det}
		words := fmt.Sprintf("detector %.4f Hz", det)
		for _, tr := range []struct {
			name  string
			track []pitchFrame
		}{{"yin", readers.yin}, {"yinfft", readers.yinfft}} {
			if hz, ok := meanNear(tr.track, from, to, det); ok {
				readings = append(readings, hz)
				words += fmt.Sprintf(", aubio %s %+.2f ¢", tr.name, testsignal.Cents(hz, det))
			} else {
				words += fmt.Sprintf(", aubio %s none", tr.name)
			}
		}
		if hz, ok := meanNear(phaseTrack(samples, 44100, det, from-0.1, to+0.1), from, to, det); ok {
			words += fmt.Sprintf("; beside them, phase %+.2f ¢", testsignal.Cents(hz, det))
		}
		hz, apart := medianReading(readings)
		spread = math.Max(spread, apart)
		truth = append(truth, hz)
		asked := 440 * math.Exp2(float64(n.Key-69)/12+testsignal.BendCents(part.Cents+n.Cents)/1200)
		t.Logf("%s %s alone: %s; truth %.4f Hz (readers %.2f ¢ apart), %+.2f ¢ from the asked pitch", name, spelled(n.Key), words, hz, apart, testsignal.Cents(hz, asked))
	}
	return mono, truth, spread, readers
}

// medianReading is the readers' median (of two, their mean in cents) and
// how far they lie apart in cents.
func medianReading(readings []float64) (hz, apart float64) {
	slices.Sort(readings)
	hz = readings[len(readings)/2]
	if len(readings) == 2 {
		hz = math.Sqrt(readings[0] * readings[1])
	}
	return hz, testsignal.Cents(readings[len(readings)-1], readings[0])
}

// partReaders are the three readers' frame tracks of a lone part, and the
// vibrato rate (Hz, 0 for none) the detector found in each of its notes.
type partReaders struct {
	detector, yin, yinfft []pitchFrame
	vibrato               []float64
}

// wholeCycles ends from..to on a whole number of cycles of a vibrato of
// rate Hz (none: to itself), so that a vibrato's part cycle does not pull
// the mean.
func wholeCycles(from, to, rate float64) float64 {
	if rate <= 0 {
		return to
	}
	return from + math.Floor((to-from)*rate)/rate
}

// over is the truth of note i over a stretch shorter than the note (a
// chord's, whose members are read over it alone): the median of the
// readers' means over from..to, on whole cycles of the note's vibrato, of
// the frames within 50 ¢ of near, the note's truth. A chorused sample's
// pitch wanders by cents within a note and its release reads sharper (the
// choir's E3 +3.9 ¢ after its note-off by aubio's yin, measured), so a
// stretch's truth is not its note's. 0 when no reader voiced a frame
// there.
func (pr partReaders) over(i int, from, to, near float64) float64 {
	to = wholeCycles(from, to, pr.vibrato[i])
	var readings []float64
	for _, tr := range [][]pitchFrame{pr.detector, pr.yin, pr.yinfft} {
		if hz, ok := meanNear(tr, from, to, near); ok {
			readings = append(readings, hz)
		}
	}
	if len(readings) == 0 {
		return 0
	}
	hz, _ := medianReading(readings)
	return hz
}

// detectorTrack is fifthline's single-voice frame track of a file (analyze
// --frames), its voiced frames only.
func detectorTrack(t *testing.T, wav string) []pitchFrame {
	t.Helper()
	code, out, stderr := runLong(t, "analyze", "--frames", wav)
	if code != 0 {
		t.Fatalf("%s --frames: exit %d: %s", wav, code, stderr)
	}
	_, rows := readCSV(t, out)
	var track []pitchFrame
	for _, r := range rows {
		if r["voiced"] == "true" {
			track = append(track, pitchFrame{num(r, "time_s"), num(r, "hz")})
		}
	}
	return track
}

// monoSum sums a stereo render onto one channel, as a microphone between
// the speakers would (sox remix, each channel at half).
func monoSum(t *testing.T, wav, mono string) {
	t.Helper()
	soxTB(t, "-R", wav, "-b", "32", "-e", "floating-point", mono, "remix", "1v0.5,2v0.5")
}

// renderMIDI renders a MIDI file with fluidsynth and FluidR3 at 44.1 kHz,
// reverb and chorus off, and returns the WAV's path.
func renderMIDI(t *testing.T, dir, name string, mid []byte) string {
	t.Helper()
	return renderMIDIAt(t, dir, name, mid, 44100)
}

// renderMIDIAt is renderMIDI at another sample rate (Hz).
func renderMIDIAt(t *testing.T, dir, name string, mid []byte, rate int) string {
	t.Helper()
	midPath, wav := filepath.Join(dir, name+".mid"), filepath.Join(dir, name+".wav")
	if err := os.WriteFile(midPath, mid, 0o644); err != nil {
		t.Fatal(err)
	}
	if out, err := exec.Command("fluidsynth", "-ni", "-q", "-R", "0", "-C", "0", "-g", "0.5", "-r", strconv.Itoa(rate), "-F", wav, fluidSoundfont, midPath).CombinedOutput(); err != nil {
		t.Fatalf("fluidsynth: %v\n%s", err, out)
	}
	return wav
}

// noisyMono sums a stereo render onto one channel and adds sox's white
// noise (repeatable, -R) snr dB below its RMS over the whole take.
func noisyMono(t *testing.T, dir, wav string, snr float64) string {
	t.Helper()
	mono, noise, out := filepath.Join(dir, "mono.wav"), filepath.Join(dir, "noise.wav"), filepath.Join(dir, "mix.wav")
	monoSum(t, wav, mono)
	secs := soxStat(t, mono, "Length (seconds)")
	soxTB(t, "-R", "-n", "-r", "44100", "-c", "1", "-b", "32", "-e", "floating-point", noise, "synth", strconv.FormatFloat(secs, 'f', 6, 64), "whitenoise", "vol", "0.1")
	gain := soxStat(t, mono, "RMS     amplitude") * math.Pow(10, -snr/20) / soxStat(t, noise, "RMS     amplitude")
	soxTB(t, "-R", "-m", "-v", "1", mono, "-v", strconv.FormatFloat(gain, 'g', 8, 64), noise, "-b", "32", "-e", "floating-point", out)
	return out
}

// soxStat is one figure of sox's stat effect for the file.
func soxStat(t *testing.T, wav, field string) float64 {
	t.Helper()
	out, _ := exec.Command("sox", wav, "-n", "stat").CombinedOutput()
	for _, l := range strings.Split(string(out), "\n") {
		if k, v, ok := strings.Cut(l, ":"); ok && strings.TrimSpace(k) == strings.TrimSpace(field) {
			if f, err := strconv.ParseFloat(strings.TrimSpace(v), 64); err == nil {
				return f
			}
		}
	}
	t.Fatalf("sox stat of %s gave no %q:\n%s", wav, field, out)
	return 0
}
