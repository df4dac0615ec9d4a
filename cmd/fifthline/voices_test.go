package main

import (
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// A held chord of three sawtooth voices that sox sums onto one channel
// (C4 and a just E4 and G4 above it: 261.63 × 5/4 = 327.0375 and × 3/2 =
// 392.445 Hz, from the ratios; sox's synth is the reference generator).
// Each voice is one held note with its voice number, lowest first, read
// within 0.5 ¢ of what sox was asked for.
func TestAnalyzeVoicesFromSoxChord(t *testing.T) {
	t.Parallel()
	path, out := soxVoices(t, "synth 2 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8")
	header, rows := readCSV(t, out)
	if strings.Join(header[len(header)-2:], ",") != "voice,doubled" || len(rows) != 3 {
		t.Fatalf("header %v, %d rows:\n%s", header, len(rows), out)
	}
	for i, want := range []struct {
		note string
		hz   float64
	}{{"C4", 261.63}, {"E4", 327.0375}, {"G4", 392.445}} {
		r := rows[i]
		hz, _ := strconv.ParseFloat(r["hz"], 64)
		if r["note"] != want.note || r["voice"] != strconv.Itoa(i+1) || r["doubled"] != "false" || math.Abs(1200*math.Log2(hz/want.hz)) > 0.5 {
			t.Errorf("row %d: %v, want %s voice %d at %g Hz", i, r, want.note, i+1, want.hz)
		}
	}

	// The same chord as chord rows: C major, the third read against just
	// above the root actually sounding (0 ¢ by construction, within 0.5 ¢),
	// and against equal temperament 13.69 ¢ low (386.31 − 400 ¢, from the
	// definitions). Each row ends with the voice and its doubled mark.
	code, out, stderr := runCLI(t, "analyze", "--voices", "3", "--chords", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	header, rows = readCSV(t, out)
	if len(header) != 10 || header[7] != "just_cents" || header[8] != "voice" || header[9] != "doubled" || len(rows) != 3 {
		t.Fatalf("header %v, %d rows:\n%s", header, len(rows), out)
	}
	for i, member := range []string{"root", "third", "fifth"} {
		r := rows[i]
		just, _ := strconv.ParseFloat(r["just_cents"], 64)
		if r["chord"] != "C major" || r["member"] != member || math.Abs(just) > 0.5 {
			t.Errorf("chord row %d: %v", i, r)
		}
	}
	if c, _ := strconv.ParseFloat(rows[1]["cents"], 64); math.Abs(c+13.69) > 0.5 {
		t.Errorf("third %v ¢ against equal temperament, want -13.69", c)
	}
}

// Bad --voices values are usage errors, one line, exit 2 (interface
// contract); so is --chords without --voices or --players.
func TestVoicesUsageErrors(t *testing.T) {
	path := sox(t, "a.wav", "-r", "44100", "-b", "16", "synth 0.5 sine 440")
	for _, args := range [][]string{
		{"--voices", "0"}, {"--voices", "9"}, {"--voices", "abc"}, {"--voices", "1"},
		{"--voices", "2", "--players", "vc,vla"}, {"--chords"}, {"--voices", "2", "--seventh", "3/2"},
		{"--voices", "2", "--frames"},
	} {
		code, _, stderr := runCLI(t, append(append([]string{"analyze"}, args...), path)...)
		checkError(t, code, 2, stderr)
	}
	// listen refuses the same before it opens any device.
	for _, args := range [][]string{{"--voices", "0"}, {"--voices", "9"}, {"--voices", "abc"}, {"--voices", "2", "--players", "vc,vla"}} {
		code, _, stderr := runCLI(t, append([]string{"listen", "--plain"}, args...)...)
		checkError(t, code, 2, stderr)
	}
	// Files it cannot read are one line, exit 1, nothing on stdout: a
	// missing file, an empty one, a rate the estimator cannot work at.
	slow := sox(t, "slow.wav", "-r", "4000", "-b", "16", "synth 0.5 sine 220")
	for _, p := range []string{filepath.Join(t.TempDir(), "missing.wav"), os.DevNull, slow} {
		code, out, stderr := runCLI(t, "analyze", "--voices", "auto", p)
		checkError(t, code, 1, stderr)
		if out != "" {
			t.Errorf("%s: stdout %q", p, out)
		}
	}
}

// listen --plain --voices hears the same chord live through a private
// virtual microphone (PulseAudio null sink, PortAudio input): one line per
// voice, lowest first, each within 0.5 ¢ of what sox was asked for.
func TestListenVoicesThroughTheVirtualMicrophone(t *testing.T) {
	t.Parallel()
	out := voicesHeardLive(t, sox(t, "chord.wav", "-r", "48000", "-b", "16", "synth 2 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8 pad 0.5 1"))
	_, rows := readCSV(t, out)
	if len(rows) != 3 {
		t.Fatalf("want 3 voices' notes:\n%s", out)
	}
	for i, want := range []float64{261.63, 327.0375, 392.445} {
		hz, _ := strconv.ParseFloat(rows[i]["hz"], 64)
		if rows[i]["voice"] != strconv.Itoa(i+1) || math.Abs(1200*math.Log2(hz/want)) > 0.5 {
			t.Errorf("row %d: %v, want voice %d at %g Hz", i, rows[i], i+1, want)
		}
	}
}

// parseVoices never panics, and what it accepts is 2 to 4 voices.
func FuzzParseVoices(f *testing.F) {
	for _, s := range []string{"2", "4", "auto", "0", "9", "abc", "+3", "03"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		n, err := parseVoices(s)
		if err == nil && (n < 2 || n > 4) {
			t.Fatalf("%q → %d voices", s, n)
		}
		if err != nil && !strings.HasPrefix(err.Error(), "--voices") {
			t.Fatalf("%q: error %q", s, err)
		}
	})
}

// An octave doubling (sox: sawtooths on C3 and C4 under E4) is one note,
// C3, marked doubled; no voice is invented for C4.
func TestAnalyzeVoicesMarksAnOctaveDoubling(t *testing.T) {
	t.Parallel()
	_, out := soxVoices(t, "synth 2 sawtooth 130.81 sawtooth 261.63 square 327.04 remix 1,2,3 gain -8")
	_, rows := readCSV(t, out)
	if len(rows) != 2 || rows[0]["note"] != "C3" || rows[0]["doubled"] != "true" || rows[1]["note"] != "E4" || rows[1]["doubled"] != "false" {
		t.Errorf("want C3 doubled and E4:\n%s", out)
	}
}

// A real voice a just twelfth above the bass (sox: sawtooths on C3, E4 =
// 5/2 and G4 = 3/1 of it, from the ratios), every partial of G4 on one of
// C3's, is a voice: C3's partials 3k stand out of their envelope
// (multipitch/smoothness.go), where a lone voice's own 3rd partial would
// not. (C3 is marked doubled: G4's even partials lift C3's even ones.)
func TestAnalyzeVoicesHearsATwelfthAbove(t *testing.T) {
	t.Parallel()
	_, out := soxVoices(t, "synth 2 sawtooth 130.81 sawtooth 327.025 sawtooth 392.43 remix 1,2,3 gain -8")
	_, rows := readCSV(t, out)
	if len(rows) != 3 || rows[0]["note"] != "C3" || rows[1]["note"] != "E4" || rows[2]["note"] != "G4" {
		t.Errorf("want C3, E4 and G4:\n%s", out)
	}
}

// soxVoices makes a 44.1 kHz WAV from sox synth arguments and returns it
// with what analyze --voices auto prints for it.
func soxVoices(t *testing.T, synth string) (path, out string) {
	t.Helper()
	path = sox(t, "voices.wav", "-r", "44100", "-b", "16", synth)
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	return path, out
}

// voicesHeardLive plays wav into a private virtual microphone while
// `listen --plain --voices auto` listens, stops it as a musician would
// (Ctrl-C) and gives what it wrote, which must end with exit status 0.
func voicesHeardLive(t *testing.T, wav string) string {
	t.Helper()
	_, env, play := privateMic(t)
	wait, proc := startPlainProcess(t, env, "--voices", "auto", "--duration", "60s")
	play(wav)
	return stopPlain(t, proc, wait)
}
