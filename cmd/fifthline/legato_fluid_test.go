package main

import (
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
)

// Quick legato runs of our own on five instruments of the FluidR3 soundfont
// (Debian's fluid-soundfont-gm), rendered by Debian's fluidsynth with reverb
// and chorus off: sixteenths at ♩ = 100 (0.15 s) and eighths (0.3 s), each
// note slurred into the next. Steps, thirds, fourths, fifths, sixths and
// octaves; the clarinet's G4 slurred to D5 is the twelfth whose shared
// frames repeat at G3.
var legatoRuns = []struct {
	name    string
	program int   // General MIDI program, 0-based
	keys    []int // MIDI keys, 60 = C4
}{
	{"clarinet", 71, []int{55, 57, 59, 60, 62, 67, 74, 72, 71, 69, 67, 64, 62, 59, 62, 67}},
	{"flute", 73, []int{74, 76, 78, 79, 81, 83, 86, 84, 81, 79, 76, 74, 72, 76, 79, 84}},
	{"oboe", 68, []int{62, 64, 66, 67, 69, 71, 73, 74, 69, 66, 62, 67, 71, 74, 76, 74}},
	{"violin", 40, []int{55, 59, 62, 67, 71, 74, 79, 76, 72, 69, 66, 62, 64, 66, 67, 71}},
	{"trumpet", 56, []int{58, 60, 62, 63, 65, 67, 69, 70, 65, 62, 58, 65, 70, 74, 72, 70}},
}

// legatoSeconds: sixteenths at ♩ = 100 last 60/100/4 = 0.15 s, eighths 0.3 s.
var legatoSeconds = []float64{0.15, 0.3}

// legatoCents is how far outside the pitches it sounds a quick note may be
// read.
const legatoCents = 2.0

// leadIn is the silence before each render, as a recording has.
const leadIn = 0.3

// fluidSynth returns the paths of Debian's fluidsynth and of the FluidR3
// soundfont (fluid-soundfont-gm), failing the test without them.
func fluidSynth(t testing.TB) (fluid, sf2 string) {
	t.Helper()
	sf2 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"
	fluid, err := exec.LookPath("fluidsynth")
	if err != nil {
		t.Fatalf("fluidsynth not found (make test installs it): %v", err)
	}
	if _, err := os.Stat(sf2); err != nil {
		t.Fatalf("FluidR3 soundfont missing (make test installs fluid-soundfont-gm): %v", err)
	}
	return fluid, sf2
}

// fluidRender renders a phrase with fluidsynth at 48 kHz (reverb and chorus
// off unless reverb) and pads it with leadIn seconds of silence (sox).
func fluidRender(t testing.TB, dir, name string, program int, phrase []testsignal.MIDINote, reverb bool) string {
	t.Helper()
	fluid, sf2 := fluidSynth(t)
	mid, raw, wav := filepath.Join(dir, name+".mid"), filepath.Join(dir, name+".raw.wav"), filepath.Join(dir, name+".wav")
	if err := os.WriteFile(mid, testsignal.MIDI(program, phrase), 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{"-ni", "-q", "-g", "0.6", "-r", "48000"}
	if !reverb {
		args = append(args, "-R", "0", "-C", "0")
	}
	if out, err := exec.Command(fluid, append(args, "-F", raw, sf2, mid)...).CombinedOutput(); err != nil {
		t.Fatalf("fluidsynth: %v\n%s", err, out)
	}
	if out, err := exec.Command("sox", raw, wav, "pad", strconv.FormatFloat(leadIn, 'f', 3, 64), "0").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	return wav
}

// spelledInC names a MIDI key as C major spells it (its window runs E♭ … G♯;
// the contract) in scientific pitch notation (MIDI key 60 is C4; common
// practice).
func spelledInC(key int) string {
	names := [12]string{"C", "C#", "D", "Eb", "E", "F", "F#", "G", "G#", "A", "Bb", "B"}
	return fmt.Sprintf("%s%d", names[key%12], key/12-1)
}

// soundedPitch is what the render of one key sounds, Hz: the range of
// pitches over a note's length, and the pitch it settles on when held.
// settles says the key is at its settled pitch (within legatoCents) over the
// second half of a note's length, so the note can be read there.
type soundedPitch struct {
	lo, hi, settled float64
	settles         bool
}

// Settled pitch: each key rendered alone (2 s, then 0.5 s of silence), the mean
// of its frames from settleFrom to settleTo seconds after the onset — its
// steady part, the vibrato centre over several cycles — as aubio's yin
// (Debian aubio-tools) reads it, so the truth does not come from the
// detector under test. (Our own frames' mean agrees within 0.8 ¢ except on
// the violin's G4, F♯4 and B3, where the detector leaves the top of each
// vibrato cycle unvoiced and reads 4.5–4.8 ¢ low: measured.)
const (
	settleFrom = 0.5
	settleTo   = 1.7
)

// renderedPitch measures, for each key, what fluidsynth renders: its settled
// pitch, and for each of legatoSeconds the range over a note that long, from the first frame
// with three quarters of its window after the onset to the last centred
// within that many seconds of it. FluidR3's samples do not start on their
// settled pitch. Measured (fifthline's frames of each key held alone, cents
// from its settled pitch over the first 0.15 s): the trumpet's attack rises
// 25–45 ¢ and settles after 0.11–0.15 s (G4, A4, B♭4 after 0.17–0.2 s; D5
// and C5 overshoot by 7–8 ¢); the violin's vibrato (about 6 Hz, ±12–15 ¢)
// starts at once; the flute sits 5–13 ¢ off (B5 and C6 13 ¢ flat; D6 starts
// 17 ¢ sharp); the oboe glides down 10–17 ¢ (D4, E4, C♯5, D5) or falls 11 ¢
// below (A4, B4); the clarinet's G4, E4 and C5 start 8–15 ¢ flat. A quick
// note's pitch is then the stretch of them it lasts.
func renderedPitch(t *testing.T, dir string, program int, keys []int) map[float64]map[int]soundedPitch {
	t.Helper()
	var phrase []testsignal.MIDINote
	seen := map[int]bool{}
	for _, k := range keys {
		if !seen[k] {
			seen[k] = true
			phrase = append(phrase, testsignal.MIDINote{Key: k, Seconds: 2, Rest: 0.5})
		}
	}
	wav := fluidRender(t, dir, fmt.Sprintf("alone-%d", program), program, phrase, false)
	code, out, stderr := runCLI(t, "analyze", "--frames", wav)
	if code != 0 {
		t.Fatalf("analyze --frames: exit %d: %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	ours := make([]pitchFrame, 0, len(rows))
	for _, r := range rows {
		at, _ := strconv.ParseFloat(r["time_s"], 64)
		hz, _ := strconv.ParseFloat(r["hz"], 64)
		ours = append(ours, pitchFrame{at, hz})
	}
	theirs := aubioYin(t, wav)
	det, err := pitchdetect.New(48000, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	half, hop := float64(det.Span())/48000/2, float64(det.Hop())/48000
	truth := map[float64]map[int]soundedPitch{}
	for _, seconds := range legatoSeconds {
		truth[seconds] = map[int]soundedPitch{}
	}
	for i, n := range phrase {
		on := leadIn + 2.5*float64(i)
		et := 440 * math.Exp2(float64(n.Key-69)/12) // ISO 16 and equal temperament
		settled, ok := meanNear(theirs, on+settleFrom, on+settleTo, et)
		if !ok {
			t.Fatalf("program %d key %d: aubio's yin finds no settled pitch", program, n.Key)
		}
		for _, seconds := range legatoSeconds {
			p := soundedPitch{lo: math.Inf(1), settled: settled, settles: true}
			end := on + max(seconds, half+2*hop)
			for _, f := range ours {
				if f.at < on+half/2 || f.at > end || math.Abs(testsignal.Cents(f.hz, et)) > 50 {
					continue
				}
				p.lo, p.hi = min(p.lo, f.hz), max(p.hi, f.hz)
				if f.at >= on+seconds/2 && math.Abs(testsignal.Cents(f.hz, settled)) > legatoCents {
					p.settles = false
				}
			}
			if p.hi == 0 {
				t.Fatalf("program %d key %d: no frames at its pitch", program, n.Key)
			}
			truth[seconds][n.Key] = p
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

// aubioYin is aubio's yin pitch track of a file's first channel, the one
// analyze reads (Debian aubio-tools; sox takes the channel out, as aubio
// would mix both). Its frames are timed differently from ours by a fraction
// of a window, which does not matter to a mean over more than a second.
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

// legatoRun is one rendered run with what it must be heard as.
type legatoRun struct {
	name, wav string
	keys      []int
	truth     []soundedPitch // each note's
}

// renderLegatoRuns renders every run at every speed with its truth.
func renderLegatoRuns(t *testing.T) []legatoRun {
	t.Helper()
	dir := t.TempDir()
	var runs []legatoRun
	for _, in := range legatoRuns {
		truth := renderedPitch(t, dir, in.program, in.keys)
		for _, sec := range legatoSeconds {
			var phrase []testsignal.MIDINote
			for _, k := range in.keys {
				phrase = append(phrase, testsignal.MIDINote{Key: k, Seconds: sec})
			}
			name := fmt.Sprintf("%s-%gs", in.name, sec)
			run := legatoRun{name: name, keys: in.keys, wav: fluidRender(t, dir, name, in.program, phrase, false)}
			for _, k := range in.keys {
				run.truth = append(run.truth, truth[sec][k])
			}
			runs = append(runs, run)
		}
	}
	return runs
}

// checkLegato checks held-note rows against a run: every note heard once,
// in order, with its spelling, within legatoCents of the pitches it sounds.
// How far each note reads from its settled pitch is logged, not asserted:
// most FluidR3 samples are not at their settled pitch within 0.3 s (see
// renderedPitch), and of the notes whose render is (within legatoCents over
// the second half of the note), some still read 2.0–2.1 ¢ off.
func checkLegato(t *testing.T, how string, run legatoRun, rows []map[string]string) {
	t.Helper()
	var got, want []string
	for _, r := range rows {
		got = append(got, r["note"])
	}
	for _, k := range run.keys {
		want = append(want, spelledInC(k))
	}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("%s %s: heard %v, want %v", how, run.name, got, want)
		return
	}
	var off, missed, unsettled []string
	held, sum := 0, 0.0
	for i, r := range rows {
		hz, _ := strconv.ParseFloat(r["hz"], 64)
		p := run.truth[i]
		below, above := testsignal.Cents(p.lo, hz), testsignal.Cents(hz, p.hi)
		dev := testsignal.Cents(hz, p.settled)
		sum += math.Abs(dev)
		switch {
		case below > legatoCents || above > legatoCents:
			off = append(off, fmt.Sprintf("%s %.2f Hz, sounds %.2f…%.2f", r["note"], hz, p.lo, p.hi))
		case p.settles && math.Abs(dev) > legatoCents:
			missed = append(missed, fmt.Sprintf("%s %+.1f", r["note"], dev))
		case p.settles:
			held++
		default:
			unsettled = append(unsettled, fmt.Sprintf("%s %+.1f", r["note"], dev))
		}
	}
	if len(off) > 0 {
		t.Errorf("%s %s: read more than %g ¢ off: %s", how, run.name, legatoCents, strings.Join(off, "; "))
	}
	t.Logf("%s %s: %.1f ¢ from the settled pitch on average; settled in time and read within %g ¢ of it: %d of %d; settled but read off (¢): %s; not settled in time (¢ from it): %s",
		how, run.name, sum/float64(len(rows)), legatoCents, held, len(rows), strings.Join(missed, ", "), strings.Join(unsettled, ", "))
}

func TestAnalyzeHearsEveryNoteOfQuickLegatoRuns(t *testing.T) {
	for _, run := range renderLegatoRuns(t) {
		code, out, stderr := runCLI(t, "analyze", run.wav)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", run.name, code, stderr)
		}
		_, rows := readCSV(t, out)
		checkLegato(t, "analyze", run, rows)
	}
}

// The same runs played live, one after another, into a private virtual
// microphone (PulseAudio null sink, PortAudio capture) and heard by
// `listen --plain`: together they must be heard note for note.
func TestListenHearsEveryNoteOfQuickLegatoRuns(t *testing.T) {
	t.Parallel()
	_, env, play := privateMic(t)
	runs := renderLegatoRuns(t)
	wait, proc := startPlainProcess(t, env, "--duration", "5m")
	all := legatoRun{name: "all runs"}
	for _, run := range runs {
		play(run.wav)
		all.keys = append(all.keys, run.keys...)
		all.truth = append(all.truth, run.truth...)
	}
	_, rows := readCSV(t, interruptPlain(t, proc, wait))
	checkLegato(t, "listen", all, rows)
}

// interruptPlain stops `listen --plain` with Ctrl-C (SIGINT), checks that it
// ended cleanly, saying nothing but the tuning in force, and returns its
// output.
func interruptPlain(t *testing.T, proc *os.Process, wait func() (int, string, string)) string {
	t.Helper()
	if err := proc.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := wait()
	if code != 0 || (stderr != "" && (strings.Count(stderr, "\n") != 1 || !strings.HasPrefix(stderr, "fifthline: tuning "))) {
		t.Errorf("exit %d, stderr %q", code, stderr)
	}
	return out
}
