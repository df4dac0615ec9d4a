package main

import (
	"bytes"
	"fmt"
	"math"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"fifthline/internal/testsignal"
)

// equalScale is G4 A4 B4 C5 D5 E5 F#5 G5 in equal temperament at a4, from
// its definition (each semitone 2^(1/12); G4 two semitones below A4).
func equalScale(a4 float64) []float64 {
	var hz []float64
	for _, s := range []int{-2, 0, 2, 3, 5, 7, 9, 10} {
		hz = append(hz, a4*math.Exp2(float64(s)/12))
	}
	return hz
}

// A G major scale played at A4 = 415 Hz (Baroque pitch, common practice)
// but analysed at the default 440 reads as F♯, G♯, B♭…: analyze says so and
// names the key and reference that fit.
func TestAForgottenReferenceIsNoticed(t *testing.T) {
	t.Parallel()
	take := toneWAV(t, equalScale(415)...)
	code, out, stderr := runCLI(t, "analyze", "--key", "G major", take)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if want := "these notes fit G major at A4 ≈ 415.0 Hz"; !strings.Contains(stderr, want) {
		t.Errorf("stderr %q does not say %q", stderr, want)
	}
	if !strings.Contains(stderr, "5 of 8 notes lie outside G major") {
		t.Errorf("stderr %q does not count the notes outside the key", stderr)
	}
	if _, rows := readCSV(t, out); len(rows) != 8 {
		t.Errorf("%d notes, want 8", len(rows))
	}
	// Declared right, the same take passes without a warning.
	code, _, stderr = runCLI(t, "analyze", "--key", "G major", "--a4", "415", "--temperament", "equal", take)
	if code != 0 || stderr != "" {
		t.Errorf("exit %d, stderr %q; want nothing said", code, stderr)
	}
}

// Notes a steady 20 ¢ sharp in the declared key: a reference of
// 440·2^(20/1200) = 445.11 Hz fits them.
func TestASteadyOffsetIsNoticed(t *testing.T) {
	t.Parallel()
	take := toneWAV(t, equalScale(440*math.Exp2(20.0/1200))...)
	_, _, stderr := runCLI(t, "analyze", "--key", "G major", "--a4", "440", take)
	for _, want := range []string{"sit a steady 20.0 ¢ sharp", "these notes fit G major at A4 ≈ 445.1 Hz"} {
		if !strings.Contains(stderr, want) {
			t.Errorf("stderr %q does not say %q", stderr, want)
		}
	}
}

// The table ends with a line per take: notes within ±5 ¢, notes on the
// other spelling, and the drift from the first half to the second.
func TestTheTableSumsUpEachTake(t *testing.T) {
	qc := math.Pow(5, 0.25) // ¼-comma meantone fifth, by definition
	a := 440.0              // ISO 16
	// In ¼-comma meantone, C major, A4 = 440: E4 = 440/qc^5·4... built from
	// A4 by fifths: D4 = A4/qc, G4 = A4/qc²·2, E5 = A4·qc, and G♭4 (nine
	// fifths below A4) = A4·32/qc^9. The last two notes are played 6 ¢ flat.
	flat := math.Exp2(-6.0 / 1200)
	take := toneWAV(t, a/qc, a/(qc*qc)*2, a*32/math.Pow(qc, 9), a*qc*flat, a*flat)
	code, out, stderr := runCLI(t, "analyze", "--format", "table", "--temperament", "meantone:1/4", take)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	// G♭4 is read as F♯4 sitting on G♭4 (41.06 ¢ sharp, the lesser diesis;
	// contract: within a quarter of the gap); it is left out of the drift.
	// Drift: mean of the later half (−6, −6) less the earlier (0, 0).
	want := take + ": 2 of 5 notes within ±5 ¢; 1 on the other spelling; drifted 6 ¢ flat"
	if !strings.Contains(out, want) {
		t.Errorf("table does not end with %q:\n%s", want, out)
	}
	if first := strings.SplitN(out, "\n", 2)[0]; !strings.Contains(first, "1/4-comma meantone") || !strings.Contains(first, "key, a4 by default") {
		t.Errorf("table header %q", first)
	}
}

// Ctrl-C during a long analysis prints the table of what was heard so far
// (the held note is finished where the reading stopped) and says it was
// interrupted.
func TestInterruptedTablePrintsTheNotesSoFar(t *testing.T) {
	t.Parallel()
	long := filepath.Join(t.TempDir(), "long.wav")
	// Ten minutes of A4 = 440 Hz at 8 kHz: far longer than the interrupt
	// takes to come.
	if out, err := exec.Command("sox", "-n", "-r", "8000", "-b", "16", long, "synth", "600", "sine", "440", "gain", "-6").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	out, errb := interruptAnalyze(t, time.Second, "--format", "table", long)
	if !strings.Contains(out.String(), "A4") || !strings.Contains(out.String(), long+": 1 of 1 note within ±5 ¢") {
		t.Errorf("no notes so far on stdout:\n%s", out.String())
	}
	if !strings.Contains(errb.String(), "interrupted") {
		t.Errorf("stderr %q", errb.String())
	}
}

// In a folder with a saved tuning, analyze needs no flags.
func TestAnalyzeReadsTheFoldersTuning(t *testing.T) {
	dir, config := t.TempDir(), t.TempDir()
	if code, _, stderr := inFolder(t, dir, config, "tuning", "--save", "--key", "G major", "--a4", "415"); code != 0 {
		t.Fatal(stderr)
	}
	take := toneWAV(t, equalScale(415)...)
	code, out, stderr := inFolder(t, dir, config, "analyze", take)
	if code != 0 || strings.Contains(stderr, "warning") || !strings.Contains(stderr, "key, a4 from ./fifthline.toml") {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	_, rows := readCSV(t, out)
	if got := strings.Join(column(rows, "note"), " "); got != "G4 A4 B4 C5 D5 E5 F#5 G5" {
		t.Errorf("notes %s", got)
	}
}

// The same on a real timbre: fluidsynth (Debian) renders a G major scale on
// the FluidR3 violin (fluid-soundfont-gm) at A4 = 440 Hz, and sox's speed
// effect moves it to A4 = 415 Hz by resampling (every frequency times
// 415/440). Analysed with nothing declared, the take is named G major at
// A4 ≈ 415 Hz, within the cent or so to which fluidsynth and FluidR3's
// samples are tuned (TestAnalyzeHearsEachNoteOfRenderedScales).
func TestAForgottenReferenceIsNoticedOnARenderedViolin(t *testing.T) {
	var phrase []testsignal.MIDINote
	for _, st := range []int{0, 2, 4, 5, 7, 9, 11, 12} {
		// MIDI key 67 is G4 (MIDI 1.0 with scientific pitch notation; common practice).
		phrase = append(phrase, testsignal.MIDINote{Key: 67 + st, Seconds: 0.5, Rest: 0.15})
	}
	at440 := fluidWAV(t, testsignal.MIDI(40, phrase), "-ni", "-q", "-g", "0.6", "-r", "48000")
	at415 := filepath.Join(t.TempDir(), "g415.wav")
	if out, err := exec.Command("sox", at440, at415, "speed", fmt.Sprint(415.0/440)).CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	code, _, stderr := runCLI(t, "analyze", at415)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var a4 float64
	i := strings.Index(stderr, "these notes fit G major at A4 ≈ ")
	if i < 0 {
		t.Fatalf("stderr %q names no fit in G major", stderr)
	}
	fmt.Sscanf(stderr[i+len("these notes fit G major at A4 ≈ "):], "%g", &a4)
	if c := 1200 * math.Log2(a4/415); math.Abs(c) > 3 {
		t.Errorf("fit at A4 ≈ %g Hz, %.1f ¢ from 415 Hz", a4, c)
	}
	t.Log(strings.TrimSpace(stderr))
}

// An A♭ major scale at A4 = 440 Hz (equal temperament by definition)
// analysed with no key given reads mostly outside C major; it fits G major
// a semitone up (A4 ≈ 466.2 Hz) and A♭ major at 440 alike, and since no
// key was given the one that keeps the reference is named too. With --key
// given the key is kept, and only the first is named.
func TestAForgottenKeyIsNamedBesideAMovedReference(t *testing.T) {
	t.Parallel()
	var hz []float64
	for _, s := range []int{-1, 1, 3, 4, 6, 8, 10, 11} {
		hz = append(hz, 440*math.Exp2(float64(s)/12))
	}
	take := toneWAV(t, hz...)
	_, _, stderr := runCLI(t, "analyze", take)
	if !strings.Contains(stderr, "these notes fit G major at A4 ≈ 466.2 Hz, or Ab major at A4 ≈ 440.0 Hz") {
		t.Errorf("no key given: %q", stderr)
	}
	_, _, stderr = runCLI(t, "analyze", "--key", "G major", take)
	if !strings.Contains(stderr, "these notes fit G major at A4 ≈ 466.2 Hz (") {
		t.Errorf("--key G major: %q", stderr)
	}
}

// Ctrl-C during a group's analysis, even before its first note (a group's
// take is read twice, its first minute learnt first), still gives the CSV
// header, the interface contract's promise to scripts, and says it was
// interrupted (exit 1).
func TestInterruptedGroupAnalysisStillGivesTheHeader(t *testing.T) {
	t.Parallel()
	long := filepath.Join(t.TempDir(), "long.wav")
	// Ten minutes of four players on A3 C#4 E4 A4 (ISO 16) at 8 kHz: far
	// longer than the interrupt takes to come.
	if out, err := exec.Command("sox", "-n", "-r", "8000", "-b", "16", long, "synth", "600",
		"sawtooth", "220", "sawtooth", "277.1826", "sawtooth", "329.6276", "sawtooth", "440", "gain", "-12").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	out, errb := interruptAnalyze(t, 2*time.Second, "--players", "vc,vla,vl2,vl1", long)
	if !strings.HasPrefix(out.String(), "start_s,end_s,note,hz,target_hz,cents,alt_note,alt_cents,") {
		t.Errorf("stdout does not begin with the CSV header:\n%s", out.String())
	}
	if !strings.Contains(errb.String(), long+": interrupted") {
		t.Errorf("stderr %q", errb.String())
	}
}

// interruptAnalyze runs analyze with args, sends it Ctrl-C's SIGINT after
// the wait, and gives its stdout and stderr once it has exited 1, as an
// interrupted reading does.
func interruptAnalyze(t *testing.T, wait time.Duration, args ...string) (stdout, stderr *bytes.Buffer) {
	t.Helper()
	cmd := exec.Command(fifthlineBinary(t), append([]string{"analyze"}, args...)...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	time.Sleep(wait)
	cmd.Process.Signal(syscall.SIGINT)
	err := cmd.Wait()
	if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != 1 {
		t.Fatalf("exit %v, want 1 (interrupted); stderr %q", err, errb.String())
	}
	return &out, &errb
}
