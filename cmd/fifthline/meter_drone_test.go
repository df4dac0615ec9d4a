package main

import (
	"math"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"fifthline/internal/vmic"
)

// The drone inside the live meter, on the real audio stack: `listen` in
// tmux, its output and its microphone one private null sink, so the drone
// leaks into the input at full strength. In G major, ¼-comma meantone,
// A4 = 440 Hz (ISO 16), from the temperament's definition (every fifth
// 5^(1/4)): D4 = 440 / 5^(1/4), G3 = 440 / 5^(1/2), and B3 = 440 · 5^(1/2) / 4,
// a pure major third (5/4) above G3.
func TestListenDroneKeySoundsTheTargetsAndTheMeterStillReadsTheNote(t *testing.T) {
	p := vmic.Isolate(t)
	g3, d4, b3 := 440/math.Sqrt(5), 440/qcFifth, 440*math.Sqrt(5)/4
	journal := filepath.Join(t.TempDir(), "rehearsal.csv")
	m := startTmux(t, 80, 24, []string{"PULSE_SINK=" + p.Sink, "PULSE_SOURCE=" + p.Source},
		"listen", "--key", "G major", "--temperament", "meantone:1/4", "--log", journal)
	m.waitFor(`listening to default`, `drone: off`, `d drone`)
	if s := m.screen(); strings.Contains(s, "caution") {
		t.Errorf("a caution before any sound:\n%s", s)
	}
	m.tmux("send-keys", "-t", "meter", "d")
	m.waitFor(`drone: G3 at −18 dBFS`, `caution: keep your headphone or speaker volume low and stop at once if it hurts`)
	m.tmux("send-keys", "-t", "meter", "d")
	m.waitFor(`drone: G3\+D4 at −18 dBFS`, `caution: keep your headphone`)

	// The drone as the sink carries it, measured apart from the detector
	// (steadyHz), past the fades (the drone's 0.5 s, the recording's own).
	time.Sleep(600 * time.Millisecond)
	rate, stop := recording(t)
	time.Sleep(2600 * time.Millisecond)
	x := stop()
	if len(x) < int(2.4*rate) {
		t.Fatalf("recorded %d samples", len(x))
	}
	x = x[int(0.5*rate):]
	for _, f := range []float64{g3, d4} {
		if c := 1200 * math.Log2(steadyHz(x, rate, f)/f); math.Abs(c) > 0.1 {
			t.Errorf("drone partial %.4f Hz sounds %+.3f ¢ away", f, c)
		} else {
			t.Logf("drone partial %.4f Hz: %+.4f ¢", f, c)
		}
	}

	// A note played into the same sink while the drone sounds (sox's sine
	// at B3, 12 dB louder than the drone — each of the drone and the
	// reference has half the −18 dBFS level, −24 dBFS — as an instrument is
	// louder at the microphone than the speaker's drone) is read on its
	// target, and only it.
	vmic.Play(t, fadedTone(t, b3, -12))()
	m.waitFor(`last note: B3 is (on its target|0\.[0-9] ¢)`)

	// s sounds the last note's target over the drone.
	rate, stop = recording(t)
	m.tmux("send-keys", "-t", "meter", "s")
	m.waitFor(`reference: B3 at 245\.97 Hz`)
	time.Sleep(1800 * time.Millisecond)
	if f, c := b3, 1200*math.Log2(steadyHz(stop(), rate, b3)/b3); math.Abs(c) > 0.1 {
		t.Errorf("reference %.4f Hz sounds %+.3f ¢ away", f, c)
	} else {
		t.Logf("reference %.4f Hz: %+.4f ¢", f, c)
	}

	// The drone follows the tonic.
	m.tmux("send-keys", "-t", "meter", "Right")
	m.waitFor(`drone: D3\+A3 at −18 dBFS`)
	m.quitCleanly()
	data, rows := readCSVFile(t, journal)
	if len(rows) != 1 || rows[0]["note"] != "B3" {
		t.Fatalf("want the one note played, B3; the journal holds:\n%s", data)
	}
	near(t, "B3 cents with the drone sounding", rows[0]["cents"], 0, 1)
}

// fadedTone writes a 2 s sine with sox (its synth frequency is the
// reference pitch), 50 ms fades as a played note has, at gain dBFS, after
// half a second of silence and with a second after.
func fadedTone(t *testing.T, hz, gain float64) string {
	t.Helper()
	wav := filepath.Join(t.TempDir(), "note.wav")
	if out, err := exec.Command("sox", "-n", "-r", "48000", "-c", "1", "-b", "16", wav, "synth", "2", "sine", strconv.FormatFloat(hz, 'f', 4, 64),
		"fade", "h", "0.05", "2", "0.05", "gain", strconv.FormatFloat(gain, 'f', -1, 64), "pad", "0.5", "1").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v\n%s", err, out)
	}
	return wav
}

// demo --drone (as listen --drone) starts the meter with the tonic and
// fifth sounding, at the default −18 dBFS with the caution on the screen,
// as two presses of d would (docs/interface.md, "Additions"): the demo's
// G minor gives G3 and D4. Its output is a null sink of the test's own.
func TestDemoDroneStartsWithTheDroneSounding(t *testing.T) {
	t.Parallel()
	sink, _, _ := privateMic(t)
	m := startTmux(t, 80, 24, []string{"PULSE_SINK=" + sink}, "demo", "--drone")
	m.waitFor(`drone: G3\+D4 at −18 dBFS`, `caution: keep your headphone`)
	m.tmux("send-keys", "-t", "meter", "d")
	m.waitFor(`drone: off`)
	m.quitCleanly()
}

// Without an output device the meter still runs and says so; too loud a
// drone is refused before anything starts.
func TestMeterSoundWithoutAnOutputAndAboveTheLimit(t *testing.T) {
	t.Parallel()
	m := startTmux(t, 80, 24, nil, "demo", "--output", "no-such-output-xyz")
	m.waitFor(heldWords)
	m.tmux("send-keys", "-t", "meter", "d")
	m.waitFor(`no sound: no such output device "no-such-output-xyz"`, heldWords)
	m.quitCleanly()
	for _, args := range [][]string{
		{"listen", "--drone-level", "-3"},
		{"demo", "--drone-level", "0"},
		{"listen", "--drone-level", "loud"},
	} {
		code, _, stderr := runCLI(t, args...)
		checkError(t, code, 2, stderr)
		if args[2] != "loud" && !strings.Contains(stderr, "-6 dBFS limit") {
			t.Errorf("%v: the message does not name the -6 dBFS limit: %q", args, stderr)
		}
	}
}

// An output that goes away while the drone sounds (its private sink
// suspended; the microphone is another sink and goes on) is reported on
// the status line, and listening goes on.
func TestMeterSaysWhenTheDroneOutputIsLost(t *testing.T) {
	out, mic := vmic.Isolate(t), vmic.Isolate(t) // the later one is where vmic.Play plays
	m := startTmux(t, 80, 24, []string{"PULSE_SINK=" + out.Sink, "PULSE_SOURCE=" + mic.Source}, "listen")
	m.waitFor(`listening to default`, `drone: off`)
	m.tmux("send-keys", "-t", "meter", "d")
	m.waitFor(`drone: C3 at −18 dBFS`)
	time.Sleep(time.Second)
	out.Suspend()
	deadline := time.Now().Add(hangPatience)
	for !strings.Contains(m.screen(), "no sound: output device lost") {
		if time.Now().After(deadline) {
			t.Fatalf("no word of the lost output:\n%s", m.screen())
		}
		time.Sleep(100 * time.Millisecond)
	}
	vmic.Play(t, fadedTone(t, 440, -12))()
	m.waitFor(`A4`)
	m.quitCleanly()
}
