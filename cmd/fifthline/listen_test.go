package main

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"fifthline/internal/vmic"
	"fifthline/source"
)

// The built command, for tests that run it as a user would (in tmux, on the
// virtual microphone). It is built once per test binary, on first use.
var built struct {
	once sync.Once
	dir  string
	path string
	err  error
}

func TestMain(m *testing.M) {
	// The tests read the tunings they give, not a fifthline.toml the
	// user running them keeps in their configuration folder.
	config, err := os.MkdirTemp("", "fifthline-config-")
	if err == nil {
		os.Setenv("XDG_CONFIG_HOME", config)
	}
	code := m.Run()
	os.RemoveAll(config)
	removeShared()
	if built.dir != "" {
		os.RemoveAll(built.dir)
	}
	os.Exit(code)
}

// fifthlineBinary builds the command once and returns its path.
func fifthlineBinary(t testing.TB) string {
	t.Helper()
	built.once.Do(func() {
		if built.dir, built.err = os.MkdirTemp("", "fifthline-bin-"); built.err != nil {
			return
		}
		built.path = filepath.Join(built.dir, "fifthline")
		out, err := exec.Command("go", "build", "-o", built.path, ".").CombinedOutput()
		if err != nil {
			built.err = fmt.Errorf("go build: %v\n%s", err, out)
		}
	})
	if built.err != nil {
		t.Fatal(built.err)
	}
	return built.path
}

// Reference pitches in ¼-comma meantone at A4 = 415 Hz, from its
// definition: every fifth is 5^(1/4) (four fifths make a pure 5/4 third two
// octaves up; the published definition of quarter-comma meantone). F♯4 is
// three fifths above A4, G♭4 nine fifths below; they lie a lesser diesis,
// 128/125 = 41.06 ¢, apart (handbook value).
var (
	qcFifth   = math.Pow(5, 0.25)
	qcFSharp4 = 415 * math.Pow(qcFifth, 3) / 4  // 346.909 Hz
	qcGFlat4  = 415 / math.Pow(qcFifth, 9) * 32 // 355.235 Hz
	diesis    = 1200 * math.Log2(128.0/125)     // 41.059 ¢
)

// toneWAV writes tones with sox, the reference signal generator (Debian
// sox; its synth frequency is the reference pitch): half a second of
// silence, then each tone for two seconds with a second of silence after,
// at -12 dBFS.
func toneWAV(t *testing.T, hz ...float64) string {
	t.Helper()
	dir := t.TempDir()
	var parts []string
	for i, f := range hz {
		p := filepath.Join(dir, fmt.Sprintf("tone%d.wav", i))
		pad := "0"
		if i == 0 {
			pad = "0.5"
		}
		out, err := exec.Command("sox", "-n", "-r", "48000", "-c", "1", "-b", "16", p,
			"synth", "2", "sine", strconv.FormatFloat(f, 'f', 4, 64), "gain", "-12", "pad", pad, "1").CombinedOutput()
		if err != nil {
			t.Fatalf("sox: %v\n%s", err, out)
		}
		parts = append(parts, p)
	}
	all := filepath.Join(dir, "tones.wav")
	if out, err := exec.Command("sox", append(parts, all)...).CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	return all
}

// startPlain starts `listen --plain` and returns once its CSV header is out
// (the input stream is running), with a func that waits for the rest.
func startPlain(t *testing.T, env []string, args ...string) (wait func() (code int, csv, stderr string)) {
	wait, _ = startPlainProcess(t, env, args...)
	return wait
}

func startPlainProcess(t testing.TB, env []string, args ...string) (wait func() (code int, csv, stderr string), proc *os.Process) {
	t.Helper()
	cmd := exec.Command(fifthlineBinary(t), append([]string{"listen", "--plain"}, args...)...)
	cmd.Env = append(os.Environ(), env...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = cmd.Process.Kill() })
	r := bufio.NewReader(out)
	header, err := r.ReadString('\n')
	if err != nil {
		_ = cmd.Wait()
		t.Fatalf("listen --plain gave no header: %v; stderr %q", err, stderr.String())
	}
	return func() (int, string, string) {
		rest, _ := r.ReadString(0)
		_ = cmd.Wait()
		return cmd.ProcessState.ExitCode(), header + rest, stderr.String()
	}, cmd.Process
}

func near(t *testing.T, what, got string, want, tol float64) {
	t.Helper()
	v, err := strconv.ParseFloat(got, 64)
	if err != nil || math.Abs(v-want) > tol {
		t.Errorf("%s = %s, want %.2f ± %g", what, got, want, tol)
	}
}

// privateMic is a virtual microphone of the test's own: a PulseAudio null
// sink (on the daemon vmic.Ensure runs) whose monitor the command records
// through PortAudio and the ALSA pulse plugin, chosen with PULSE_SOURCE.
// Other tests playing into the shared virtual microphone at the same time
// cannot leak into it. play plays a file into it and waits.
func privateMic(t testing.TB) (sink string, env []string, play func(wav string)) {
	t.Helper()
	return privateMicWith(t)
}

// privateMicWith is privateMic with the null sink's further arguments
// (channels=1: a one-channel microphone, nothing remixed on the way).
func privateMicWith(t testing.TB, args ...string) (sink string, env []string, play func(wav string)) {
	t.Helper()
	vmic.Ensure(t)
	sink = fmt.Sprintf("fifthline_test_%d_%d", os.Getpid(), time.Now().UnixNano()%1e6)
	mod, err := exec.Command("pactl", append([]string{"load-module", "module-null-sink", "sink_name=" + sink, "rate=48000"}, args...)...).Output()
	if err != nil {
		t.Fatalf("pactl load-module: %v", err)
	}
	t.Cleanup(func() { _ = exec.Command("pactl", "unload-module", strings.TrimSpace(string(mod))).Run() })
	return sink, []string{"PULSE_SOURCE=" + sink + ".monitor"}, func(wav string) {
		t.Helper()
		if out, err := exec.Command("paplay", "--device="+sink, wav).CombinedOutput(); err != nil {
			t.Fatalf("paplay: %v %s", err, out)
		}
	}
}

func TestListenPlainHearsSpelledTonesThroughTheVirtualMicrophone(t *testing.T) {
	t.Parallel()
	_, env, play := privateMic(t)
	wav := toneWAV(t, qcFSharp4, qcGFlat4)
	journal := filepath.Join(t.TempDir(), "rehearsal.csv")
	wait, proc := startPlainProcess(t, env, "--duration", "60s", "--key", "C major", "--temperament", "meantone:1/4", "--a4", "415", "--log", journal)
	play(wav) // returns when the file, a second of silence last, has played
	out := interruptPlain(t, proc, wait)
	_, rows := readCSV(t, out)
	if len(rows) != 2 {
		t.Fatalf("want 2 held notes, got:\n%s", out)
	}
	// The F♯ tone reads as F♯4 on its target, G♭4 a diesis above it.
	if r := rows[0]; r["note"] != "F#4" || r["alt_note"] != "Gb4" {
		t.Errorf("first tone read as %s (alt %s)", r["note"], r["alt_note"])
	}
	near(t, "F♯ tone cents", rows[0]["cents"], 0, 1)
	near(t, "F♯ tone alt_cents", rows[0]["alt_cents"], -diesis, 1)
	// The G♭ tone lies outside C major's window: it reads as F♯4 a diesis
	// sharp, sitting on G♭4.
	if r := rows[1]; r["note"] != "F#4" || r["alt_note"] != "Gb4" {
		t.Errorf("second tone read as %s (alt %s)", r["note"], r["alt_note"])
	}
	near(t, "G♭ tone cents", rows[1]["cents"], diesis, 1)
	near(t, "G♭ tone alt_cents", rows[1]["alt_cents"], 0, 1)
	// Seconds from the start of capture: the tones are 3 s apart in the file.
	s0, _ := strconv.ParseFloat(rows[0]["start_s"], 64)
	s1, _ := strconv.ParseFloat(rows[1]["start_s"], 64)
	near(t, "gap between onsets", strconv.FormatFloat(s1-s0, 'f', 3, 64), 3, 0.1)
	if data, err := os.ReadFile(journal); err != nil || strings.Count(string(data), "F#4") != 2 {
		t.Errorf("--log journal has not both notes (%v):\n%s", err, data)
	}
}

func TestListenDurationStopsCleanlyWithTheHeaderWritten(t *testing.T) {
	t.Parallel()
	_, env, _ := privateMic(t)
	start := time.Now()
	code, out, stderr := startPlain(t, env, "--duration", "1s")()
	// stderr holds only the tuning in force, said since no flag set it
	// (and, if the loaded machine lost sound, a line saying so).
	stderr = endWords.ReplaceAllString(stderr, "")
	if code != 0 || strings.Count(stderr, "\n") != 1 || !strings.HasPrefix(stderr, "fifthline: tuning C major · equal temperament · A4 = 440 Hz") ||
		!strings.HasSuffix(stderr, "(key, temperament, a4 by default)\n") ||
		!strings.HasPrefix(out, "start_s,end_s,note,hz,target_hz,cents,alt_note,alt_cents") {
		t.Errorf("exit %d, stderr %q, stdout %q", code, stderr, out)
	}
	if d := time.Since(start); d > hangPatience {
		t.Errorf("--duration 1s took %v", d)
	}
}

// A vanished input: the private microphone's sink is suspended mid-session,
// so its monitor stops delivering. The note already heard
// is kept; the error is one line; the exit status 1.
func TestListenKeepsWhatItHeardWhenTheDeviceVanishes(t *testing.T) {
	t.Parallel()
	sink, env, play := privateMic(t)
	wait := startPlain(t, env, "--duration", "20s", "--key", "C major", "--temperament", "meantone:1/4", "--a4", "415")
	play(toneWAV(t, qcFSharp4))
	if out, err := exec.Command("pactl", "suspend-sink", sink, "1").CombinedOutput(); err != nil {
		t.Fatalf("pactl suspend-sink: %v %s", err, out)
	}
	code, out, stderr := wait()
	checkError(t, code, 1, stderr)
	if !strings.Contains(stderr, "input device lost") {
		t.Errorf("stderr %q does not say the device was lost", stderr)
	}
	if _, rows := readCSV(t, out); len(rows) != 1 || rows[0]["note"] != "F#4" {
		t.Errorf("the note heard before the loss is not kept:\n%s", out)
	}
}

// Ctrl-C (SIGINT) in the middle of a held note: the note is finished and
// written, and the command ends cleanly.
func TestListenInterruptKeepsTheNoteBeingHeld(t *testing.T) {
	t.Parallel()
	sink, env, _ := privateMic(t)
	timing := filepath.Join(t.TempDir(), "timing.csv")
	wait, proc := startPlainProcess(t, append(env, "FIFTHLINE_TIMING="+timing), "--key", "C major", "--temperament", "meantone:1/4", "--a4", "415")
	player := exec.Command("paplay", "--device="+sink, toneWAV(t, qcFSharp4))
	if err := player.Start(); err != nil {
		t.Fatal(err)
	}
	defer func() { _ = player.Process.Kill(); _ = player.Wait() }()
	// Interrupt once the note has been held a while (the frame log says
	// voiced and holding), well before the tone ends.
	waitForTiming(t, timing, ",true,true,", 30, "the tone was never heard")
	out := interruptPlain(t, proc, wait)
	if _, rows := readCSV(t, out); len(rows) != 1 || rows[0]["note"] != "F#4" {
		t.Errorf("the note held at the interrupt is not written:\n%s", out)
	}
}

// waitForTiming waits (up to 10 s) until the FIFTHLINE_TIMING log at path
// holds more than n occurrences of what, else fails with why.
func waitForTiming(t testing.TB, path, what string, n int, why string) {
	t.Helper()
	for deadline := time.Now().Add(10 * time.Second); ; time.Sleep(20 * time.Millisecond) {
		if data, _ := os.ReadFile(path); strings.Count(string(data), what) > n {
			return
		}
		if time.Now().After(deadline) {
			t.Fatal(why)
		}
	}
}

func TestListenUsageErrors(t *testing.T) {
	for _, args := range [][]string{
		{"listen", "--channel", "0"},
		{"listen", "--duration", "-1s"},
		{"listen", "--input-channels", "-1"},
		{"listen", "--channel", "3", "--input-channels", "2"},
		{"listen", "--players", "3=vla,1=vc", "--input-channels", "2"},
		{"listen", "--players", "first violin"},
		{"listen", "--duration", "soon"},
		{"listen", "take.wav"},
		{"listen", "--key", "H"},
		{"demo", "--temperament", "edo:0"},
		{"demo", "extra"},
		{"devices", "extra"},
		// --drone sounds with the one-player meter only (docs/interface.md,
		// "Additions": the group meter plays nothing, --plain has no keys).
		{"listen", "--drone", "--plain"},
		{"listen", "--drone", "--players", "vc,vla"},
		{"listen", "--drone", "--voices", "auto"},
		{"demo", "--drone", "--group"},
		{"listen", "--drone", "--level", "-3"},
	} {
		code, _, stderr := runCLI(t, args...)
		checkError(t, code, 2, stderr)
	}
	// Too few channels opened: the message says how many to give
	// (docs/interface.md, "Additions": listen --input-channels).
	_, _, stderr := runCLI(t, "listen", "--players", "3=vla,1=vc", "--input-channels", "2")
	if !strings.Contains(stderr, "give --input-channels 3 or more") {
		t.Errorf("stderr %q does not say what to give", stderr)
	}
}

func TestListenOnAMissingDeviceIsAOneLineError(t *testing.T) {
	vmic.Ensure(t)
	code, out, stderr := runCLI(t, "listen", "--plain", "--device", "no-such-interface")
	checkError(t, code, 1, stderr)
	if out != "" {
		t.Errorf("stdout %q", out)
	}
}

func TestDevicesMarksTheDefaultInput(t *testing.T) {
	vmic.Ensure(t)
	code, out, stderr := runCLI(t, "devices")
	if code != 0 || !strings.Contains(out, "default input") || !strings.HasPrefix(out, "index") {
		t.Errorf("exit %d, stderr %q:\n%s", code, stderr, out)
	}
}

// stopPlain stops `listen --plain` with Ctrl-C (SIGINT), which must end
// it with exit status 0, and returns its output.
func stopPlain(t *testing.T, proc *os.Process, wait func() (int, string, string)) string {
	t.Helper()
	if err := proc.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := wait()
	if code != 0 {
		t.Fatalf("exit %d, stderr %q\n%s", code, stderr, out)
	}
	return out
}

// interruptPlain stops `listen --plain` with Ctrl-C (SIGINT), checks that it
// ended cleanly, saying nothing but the tuning in force and, as it ends,
// the journal's tally and any gaps in the sound (sayHeard), and returns
// its output.
func interruptPlain(t *testing.T, proc *os.Process, wait func() (int, string, string)) string {
	t.Helper()
	if err := proc.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := wait()
	stderr = endWords.ReplaceAllString(stderr, "")
	if code != 0 || (stderr != "" && (strings.Count(stderr, "\n") != 1 || !strings.HasPrefix(stderr, "fifthline: tuning "))) {
		t.Errorf("exit %d, stderr %q", code, stderr)
	}
	return out
}

// endWords are the lines listen ends with (sayHeard).
var endWords = regexp.MustCompile(`(?m)^fifthline: (journal: .* → .*|[0-9]+ gaps? in the sound .*)\n`)

// As listening ends the screen is gone: a journal's tally and any sound
// lost are said on stderr, the gaps only when there were some (a player
// needs no count of nothing).
func TestListenEndsSayingWhereTheNotesWentAndAnyGap(t *testing.T) {
	var b strings.Builder
	sayHeard(&b, source.InputStats{Blocks: 900}, &journalSink{})
	if b.String() != "" {
		t.Errorf("no journal, nothing lost, yet: %q", b.String())
	}
	path := filepath.Join(t.TempDir(), "rehearsal.csv")
	jf := &journalFlags{log: path}
	j, err := jf.open(&env{stderr: io.Discard})
	if err != nil {
		t.Fatal(err)
	}
	defer j.close()
	sayHeard(&b, source.InputStats{Blocks: 900, Overflows: 1, DroppedBlocks: 2}, j)
	want := "fifthline: journal: 0 notes → " + path + "\n" +
		"fifthline: 3 gaps in the sound (computer too busy): notes across a gap may read wrong\n"
	if b.String() != want {
		t.Errorf("said %q, want %q", b.String(), want)
	}
}
