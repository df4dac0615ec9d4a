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

// soundedPitch is the range of pitches a note sounds, Hz.
type soundedPitch struct{ lo, hi float64 }

// renderedPitch measures, for each key, the pitches fluidsynth renders over
// the first seconds of a note: each key is rendered alone (1.5 s, then 1 s
// of silence), and its range is that of the frames from the first with
// three quarters of its window after the onset to the last centred within
// that many seconds of it. FluidR3's samples do not hold one pitch there: a trumpet's
// attack rises some 10 ¢ in its first 0.1 s, the violin's vibrato starts at
// once, so a quick note's pitch is the stretch of them it lasts.
func renderedPitch(t *testing.T, dir string, program int, keys []int, seconds float64) map[int]soundedPitch {
	t.Helper()
	var phrase []testsignal.MIDINote
	seen := map[int]bool{}
	for _, k := range keys {
		if !seen[k] {
			seen[k] = true
			phrase = append(phrase, testsignal.MIDINote{Key: k, Seconds: 1.5, Rest: 1})
		}
	}
	wav := fluidRender(t, dir, fmt.Sprintf("alone-%d", program), program, phrase, false)
	code, out, stderr := runCLI(t, "analyze", "--frames", wav)
	if code != 0 {
		t.Fatalf("analyze --frames: exit %d: %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	det, err := pitchdetect.New(48000, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	half, hop := float64(det.Span())/48000/2, float64(det.Hop())/48000
	truth := map[int]soundedPitch{}
	for i, n := range phrase {
		on := leadIn + 2.5*float64(i)
		p := soundedPitch{lo: math.Inf(1)}
		for _, r := range rows {
			at, _ := strconv.ParseFloat(r["time_s"], 64)
			hz, err := strconv.ParseFloat(r["hz"], 64)
			et := 440 * math.Exp2(float64(n.Key-69)/12) // ISO 16 and equal temperament
			if err != nil || at < on+half/2 || at > on+max(seconds, half+2*hop) || math.Abs(testsignal.Cents(hz, et)) > 50 {
				continue
			}
			p.lo, p.hi = min(p.lo, hz), max(p.hi, hz)
		}
		if p.hi == 0 {
			t.Fatalf("program %d key %d: no frames at its pitch", program, n.Key)
		}
		truth[n.Key] = p
	}
	return truth
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
		for _, sec := range legatoSeconds {
			var phrase []testsignal.MIDINote
			for _, k := range in.keys {
				phrase = append(phrase, testsignal.MIDINote{Key: k, Seconds: sec})
			}
			name := fmt.Sprintf("%s-%gs", in.name, sec)
			run := legatoRun{name: name, keys: in.keys, wav: fluidRender(t, dir, name, in.program, phrase, false)}
			truth := renderedPitch(t, dir, in.program, in.keys, sec)
			for _, k := range in.keys {
				run.truth = append(run.truth, truth[k])
			}
			runs = append(runs, run)
		}
	}
	return runs
}

// checkLegato checks held-note rows against a run: every note heard once,
// in order, with its spelling and within legatoCents of the pitches it
// sounds.
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
	var off []string
	for i, r := range rows {
		hz, _ := strconv.ParseFloat(r["hz"], 64)
		p := run.truth[i]
		below, above := testsignal.Cents(p.lo, hz), testsignal.Cents(hz, p.hi)
		if below > legatoCents || above > legatoCents {
			off = append(off, fmt.Sprintf("%s %.2f Hz, sounds %.2f…%.2f", r["note"], hz, p.lo, p.hi))
		}
	}
	if len(off) > 0 {
		t.Errorf("%s %s: read more than %g ¢ outside the pitches the note sounds: %s", how, run.name, legatoCents, strings.Join(off, "; "))
	}
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
