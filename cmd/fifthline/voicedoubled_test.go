package main

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"fifthline/harmony"
	"fifthline/internal/testsignal"
	"fifthline/multipitch"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// soxChord makes a 48 kHz one-channel take of tones held 2 s together, each
// of four equal sine partials (sox synth, mixed by remix, peaks near
// -18 dBFS), at the given pitches.
func soxChord(t *testing.T, hz ...float64) string {
	t.Helper()
	return soxChordAt(t, "vol 0.15", hz...)
}

// soxChordAt is soxChord with level, sox effects that set its level (a
// volume, or gain -n to a peak in dBFS), in place of vol 0.15.
func soxChordAt(t *testing.T, level string, hz ...float64) string {
	t.Helper()
	var synth []string
	for _, f := range hz {
		for k := 1.0; k <= 4; k++ {
			synth = append(synth, fmt.Sprintf("sine %.4f", k*f))
		}
	}
	return sox(t, "chord.wav", "-r", "48000", "-b", "24", "synth 2 "+strings.Join(synth, " ")+" remix - "+level+" fade 0.03 2 0.03 pad 0 0.4")
}

// Equal temperament from A4 = 440 Hz (ISO 16): E3, B3, E4, G♯4.
const e3Hz, b3Hz, e4Hz, gs4Hz = 164.8138, 246.9417, 329.6276, 415.3047

// docs/interface.md, "Additions of this repository": note rows of analyze
// --voices carry doubled, true where another voice sounds an octave above;
// a note an octave above a louder voice's note is not a voice of its own.
// E4 over E3 in the chord E3 B3 E4 G♯4 lays all its partials on E3's even
// ones: three voices, E3 doubled on its note row and its chord row; the
// same chord without E4 marks nothing.
func TestAnalyzeVoicesMarksADoublingInAChord(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name    string
		hz      []float64
		doubled string // E3's mark
	}{
		{"E3 B3 E4 G♯4", []float64{e3Hz, b3Hz, e4Hz, gs4Hz}, "true"},
		{"E3 B3 G♯4", []float64{e3Hz, b3Hz, gs4Hz}, "false"},
	} {
		path := soxChord(t, tc.hz...)
		want := []string{"E3 " + tc.doubled, "B3 false", "G#4 false"}
		code, out, stderr := runCLI(t, "analyze", "--voices", "auto", path)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, stderr)
		}
		_, rows := readCSV(t, out)
		if got := noteMarks(rows); !equalStrings(got, want) {
			t.Errorf("%s: notes %v, want %v", tc.name, got, want)
		}
		code, out, stderr = runCLI(t, "analyze", "--voices", "auto", "--chords", path)
		if code != 0 {
			t.Fatalf("%s --chords: exit %d: %s", tc.name, code, stderr)
		}
		_, rows = readCSV(t, out)
		if got := noteMarks(rows); !equalStrings(got, want) || rows[0]["chord"] != "E major" {
			t.Errorf("%s --chords: %v, want E major with %v:\n%s", tc.name, got, want, out)
		}
	}
}

// With fewer voices asked for than sound (--voices 2 on E3 B3 E4 G♯4; the
// contract says "up to N" and is silent on more) the two loudest are
// reported — E3, louder for its doubling, marked doubled — and a chord is
// named only as the whole chord is named, never from what is left of it
// (B3 and G♯4 alone would read G♯ minor); stderr says voices were left out.
func TestAnalyzeFewerVoicesThanSound(t *testing.T) {
	t.Parallel()
	path := soxChord(t, e3Hz, b3Hz, e4Hz, gs4Hz)
	code, out, stderr := runCLI(t, "analyze", "--voices", "2", "--chords", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	for _, r := range rows {
		if r["chord"] != "E major" {
			t.Errorf("chord row %v: want E major or no row", r)
		}
	}
	if !strings.Contains(stderr, "3 voices sounded at once, more than the 2 asked for") {
		t.Errorf("stderr %q: want the voices left out said", stderr)
	}
	code, out, stderr = runCLI(t, "analyze", "--voices", "2", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	_, rows = readCSV(t, out)
	if got := noteMarks(rows); len(got) != 2 || got[0] != "E3 true" {
		t.Errorf("notes %v, want E3 doubled and one more", got)
	}
}

// noteMarks are the rows' notes with their doubled marks.
func noteMarks(rows []map[string]string) []string {
	var out []string
	for _, r := range rows {
		out = append(out, r["note"]+" "+r["doubled"])
	}
	return out
}

func equalStrings(a, b []string) bool { return strings.Join(a, ",") == strings.Join(b, ",") }

// The mark follows a member into the chord rows written while listening
// (listen --plain --voices --chords): C3 doubled under E3 and G3, held
// together 2 s (equal temperament from A4 = 440 Hz, ISO 16).
func TestLiveVoiceChordRowsCarryTheDoubling(t *testing.T) {
	tu := target.Default()
	vo := voiceOptions{chords: true, seventh: target.DefaultSeventh}
	var got []string
	live := vo.liveChords(session.NewTunings(tu), func(c harmony.Chord, voices []int, doubled []bool, _ target.Tuning) error {
		for _, row := range voiceChordRows(c, voices, doubled) {
			rec := row.record(false)
			got = append(got, row.Note+" "+rec[len(rec)-1])
		}
		return nil
	}, func(voiceNote) error { return nil })
	for i, hz := range []float64{130.8128, 164.8138, 195.9977} {
		live.note(voiceNote{Event: session.Event{Held: pitchdetect.Held{Start: 0, End: 2, Hz: hz}, Reading: tu.Classify(hz), Tuning: tu}, voice: i + 1, doubled: i == 0})
	}
	live.ready(math.Inf(1), math.Inf(1), nil)
	if want := []string{"C3 true", "E3 false", "G3 false"}; !equalStrings(got, want) {
		t.Errorf("chord rows %v, want %v", got, want)
	}
}

// Listening holds --voices N to the same rule as the file: with E3, B3 and
// G♯4 sounding (equal temperament, ISO 16) and two voices asked for, the two
// loudest are heard; E3 with G♯4 is E major as the whole is, B3 with G♯4
// would be G♯ minor and is not named.
func TestLiveChordsOfFewerVoicesThanSound(t *testing.T) {
	tu := target.Default()
	for _, tc := range []struct {
		name string
		amps [3]float64 // E3, B3, G♯4
		want string
	}{
		{"E3 and G♯4 loudest", [3]float64{0.2, 0.1, 0.15}, "E major"},
		{"B3 and G♯4 loudest", [3]float64{0.1, 0.2, 0.15}, ""},
	} {
		vo := voiceOptions{chords: true, seventh: target.DefaultSeventh, max: 2}
		var got []string
		live := vo.liveChords(session.NewTunings(tu), func(c harmony.Chord, _ []int, _ []bool, _ target.Tuning) error {
			got = append(got, c.Name())
			return nil
		}, func(voiceNote) error { return nil })
		var kept []multipitch.Voice
		for at := 0.0; at <= 2; at += 0.1 {
			kept = vo.left.cap(at, []multipitch.Voice{{Hz: e3Hz, Amplitude: tc.amps[0]}, {Hz: b3Hz, Amplitude: tc.amps[1]}, {Hz: gs4Hz, Amplitude: tc.amps[2]}})
		}
		for i, v := range kept {
			live.note(voiceNote{Event: session.Event{Held: pitchdetect.Held{Start: 0, End: 2, Hz: v.Hz}, Reading: tu.Classify(v.Hz), Tuning: tu}, voice: i + 1})
		}
		live.ready(math.Inf(1), math.Inf(1), nil)
		if strings.Join(got, ",") != tc.want {
			t.Errorf("%s: chords %q, want %q", tc.name, got, tc.want)
		}
	}
}

// doubledUnder is a row marked doubled sounding at time at an octave or
// two under hz, within 50 ¢, or -1: a doubling the contract reports once,
// on the lower note ("doubled": another voice an octave or two above, which
// one microphone cannot part from it; docs/interface.md).
func doubledUnder(rows []map[string]string, at, hz float64) int {
	for j, r := range rows {
		for _, m := range []float64{2, 4} {
			if r["doubled"] == "true" && num(r, "start_s") <= at && at <= num(r, "end_s") && math.Abs(testsignal.Cents(m*num(r, "hz"), hz)) < 50 {
				return j
			}
		}
	}
	return -1
}
