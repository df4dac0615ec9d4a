package main

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/mattn/go-runewidth"
)

// tmuxMeter is the built command running in a detached tmux session of its
// own (a private server socket), the way a player's terminal runs it.
type tmuxMeter struct {
	t              testing.TB
	socket, rcFile string
}

// startTmux runs `fifthline args…` in a w × h tmux window, with env added
// to its environment; the wrapper writes the command's exit status to a
// file when it ends.
func startTmux(t testing.TB, w, h int, env []string, args ...string) *tmuxMeter {
	t.Helper()
	if _, err := exec.LookPath("tmux"); err != nil {
		t.Fatalf("tmux not found (apt-get install tmux): %v", err)
	}
	m := &tmuxMeter{t: t, socket: fmt.Sprintf("fifthline-test-%d-%d", os.Getpid(), time.Now().UnixNano()%1e6),
		rcFile: filepath.Join(t.TempDir(), "exit-status")}
	quoted := []string{fifthlineBinary(t)}
	for _, a := range args {
		quoted = append(quoted, "'"+a+"'")
	}
	script := strings.Join(quoted, " ") + "; echo $? > " + m.rcFile
	session := []string{"new-session", "-d", "-s", "meter", "-x", fmt.Sprint(w), "-y", fmt.Sprint(h)}
	for _, e := range env {
		session = append(session, "-e", e)
	}
	m.tmux(append(session, script)...)
	t.Cleanup(func() { _ = exec.Command("tmux", "-L", m.socket, "kill-server").Run() })
	return m
}

func (m *tmuxMeter) tmux(args ...string) string {
	m.t.Helper()
	out, err := exec.Command("tmux", append([]string{"-L", m.socket}, args...)...).CombinedOutput()
	if err != nil {
		m.t.Fatalf("tmux %v: %v\n%s", args, err, out)
	}
	return string(out)
}

func (m *tmuxMeter) screen() string { return m.tmux("capture-pane", "-p", "-t", "meter") }

// waitFor polls the screen until every pattern matches, and returns it.
func (m *tmuxMeter) waitFor(patterns ...string) string {
	m.t.Helper()
	deadline := time.Now().Add(hangPatience)
	for {
		s := m.screen()
		missing := ""
		for _, p := range patterns {
			if !regexp.MustCompile(p).MatchString(s) {
				missing = p
				break
			}
		}
		if missing == "" {
			return s
		}
		if time.Now().After(deadline) {
			m.t.Fatalf("screen never showed %q:\n%s", missing, s)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// exitStatus waits for the command to end and returns its exit status.
func (m *tmuxMeter) exitStatus() string {
	m.t.Helper()
	deadline := time.Now().Add(hangPatience)
	for time.Now().Before(deadline) {
		if data, err := os.ReadFile(m.rcFile); err == nil && len(data) > 0 {
			return strings.TrimSpace(string(data))
		}
		time.Sleep(50 * time.Millisecond)
	}
	m.t.Fatalf("the command did not end:\n%s", m.screen())
	return ""
}

// quit presses q, waits for the command to end and gives its exit status.
func (m *tmuxMeter) quit() string {
	m.t.Helper()
	m.tmux("send-keys", "-t", "meter", "q")
	return m.exitStatus()
}

// quitCleanly presses q, which must end the command with exit status 0.
func (m *tmuxMeter) quitCleanly() {
	m.t.Helper()
	if rc := m.quit(); rc != "0" {
		m.t.Errorf("q: exit status %s, want 0", rc)
	}
}

// The spelled note and its cents, as the words under the large glyphs say them.
const heldWords = `[A-G][♯♭𝄪𝄫]?[0-9] is (on its target|[0-9]+\.[0-9] ¢ (sharp|flat)(, toward [A-G][♯♭𝄪𝄫]?[0-9])? [▲▼])`

func TestDemoMeterInTmux(t *testing.T) {
	t.Parallel()
	m := startTmux(t, 80, 24, nil, "demo", "--log", filepath.Join(t.TempDir(), "rehearsal.csv"))
	// The score's own tuning (G minor, ¼-comma meantone, A4 = 415 Hz).
	s := m.waitFor(heldWords, `G minor · 1/4-comma meantone · A4 = 415\.0 Hz · sounding pitch`, `\[[A-G][♯♭]?\]`)
	if !strings.Contains(s, "███") {
		t.Errorf("no large glyphs:\n%s", s)
	}
	m.tmux("send-keys", "-t", "meter", "Right")
	m.waitFor(`D minor · 1/4-comma meantone`, `key D minor \(1 flat\)`)
	m.tmux("send-keys", "-t", "meter", "t")
	m.waitFor(`D minor · 1/6-comma meantone`)
	m.tmux("send-keys", "-t", "meter", "Up")
	m.waitFor(`A4 = 416\.0 Hz`)
	m.tmux("send-keys", "-t", "meter", "?")
	m.waitFor(`fifthline meter — keys`, `tonic one fifth up the line`)
	m.tmux("send-keys", "-t", "meter", "Escape")
	m.waitFor(`from ET`, heldWords)

	for _, size := range [][2]int{{100, 30}, {60, 18}, {80, 24}} {
		m.tmux("resize-window", "-t", "meter", "-x", fmt.Sprint(size[0]), "-y", fmt.Sprint(size[1]))
		s := m.waitFor(`D minor · 1/6-comma`, heldWords)
		lines := strings.Split(strings.TrimRight(s, "\n"), "\n")
		if len(lines) > size[1] {
			t.Errorf("%dx%d: %d lines", size[0], size[1], len(lines))
		}
		for _, l := range lines {
			if runewidth.StringWidth(l) > size[0] {
				t.Errorf("%dx%d: line wider than the window: %q", size[0], size[1], l)
			}
		}
	}

	m.waitFor(`journal: [1-9][0-9]* notes? → .*rehearsal\.csv`)
	m.quitCleanly()
}

func TestListenMeterInTmuxShowsTheOtherSpellingTheInputAndALostDevice(t *testing.T) {
	t.Parallel()
	sink, env, play := privateMic(t)
	m := startTmux(t, 80, 24, env, "listen", "--key", "C major", "--temperament", "meantone:1/4", "--a4", "415")
	m.waitFor(`listening to default`, `input +(silent|−[0-9]+ dBFS)`, `journal: off`)
	play(toneWAV(t, qcGFlat4))
	// The G♭ tone, read in C major: F♯4 a diesis sharp, sitting on G♭4,
	// which stands at the left end of the line (it lies below E♭).
	s := m.waitFor(`last note: F♯4 is 41\.[01] ¢ sharp ▲ · sits on G♭4 \((−0\.1|0\.0|\+0\.1) ¢\)`, `◂ \[G♭4\]`, `input +(silent|−[0-9]+ dBFS)`)
	if strings.Contains(s, "CLIPPING") {
		t.Errorf("a −12 dBFS tone reported as clipping:\n%s", s)
	}
	// A tone driven 3 dB past full scale (sox clips it) raises the warning,
	// in words. Nothing is audible: the sink is a null sink.
	loud := filepath.Join(t.TempDir(), "loud.wav")
	if out, err := exec.Command("sox", "-n", "-r", "48000", "-c", "1", "-b", "16", loud, "synth", "1", "sine", "440", "gain", "3").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	play(loud)
	m.waitFor(`CLIPPING — turn the input down`)
	// The input vanishes (its sink suspended): the meter closes, exit 1.
	if out, err := exec.Command("pactl", "suspend-sink", sink, "1").CombinedOutput(); err != nil {
		t.Fatalf("pactl suspend-sink: %v %s", err, out)
	}
	if rc := m.exitStatus(); rc != "1" {
		t.Errorf("lost device: exit status %s, want 1", rc)
	}
}

// The meter's own cost: `demo` drawing at 80 × 24 in tmux, CPU share of one
// core over 10 s and the largest VmRSS (as in BenchmarkListenPlainLive).
//
//	go test -run XXX -bench DemoMeterInTmux ./cmd/fifthline/
func BenchmarkDemoMeterInTmux(b *testing.B) { benchMeterInTmux(b, heldWords, "demo") }

// benchMeterInTmux measures `fifthline args…` at 80 × 24 for 10 s once
// the screen shows ready.
func benchMeterInTmux(b *testing.B, ready string, args ...string) {
	for range b.N {
		m := startTmux(b, 80, 24, nil, args...)
		m.waitFor(ready)
		reportCost(b, meterPid(b, m), func() { time.Sleep(10 * time.Second) })
		m.quit()
	}
}

// meterPid is the command's process: the child of the pane's shell.
func meterPid(b *testing.B, m *tmuxMeter) int {
	shell := strings.TrimSpace(m.tmux("display-message", "-p", "-t", "meter", "#{pane_pid}"))
	out, err := exec.Command("pgrep", "-P", shell).Output()
	if err != nil {
		b.Fatalf("pgrep -P %s: %v", shell, err)
	}
	pid, err := strconv.Atoi(strings.Fields(string(out))[0])
	if err != nil {
		b.Fatal(err)
	}
	return pid
}

// Without a terminal (setsid: no controlling tty) the meter cannot start:
// one line pointing to --plain, exit 1.
func TestMeterWithoutATerminalIsAOneLineError(t *testing.T) {
	t.Parallel()
	cmd := exec.Command("setsid", "-w", fifthlineBinary(t), "demo")
	var stderr strings.Builder
	cmd.Stderr = &stderr
	_ = cmd.Run()
	checkError(t, cmd.ProcessState.ExitCode(), 1, stderr.String())
	if !strings.Contains(stderr.String(), "--plain") {
		t.Errorf("stderr %q does not point to --plain", stderr.String())
	}
}

// hangPatience is how long a test waits for the screen to show something
// or the command to end before calling it a hang. It is no measure of
// speed (that is make bench's): a machine with both cores busy may take
// many seconds to start a stream or close one.
const hangPatience = 30 * time.Second
