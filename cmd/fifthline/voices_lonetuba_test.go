package main

import (
	"fmt"
	"math"
	"os/exec"
	"testing"

	"fifthline/internal/testsignal"
)

// A lone tuba, read with --voices auto, is one voice at its own pitch: not
// an octave low, not marked doubled, nothing read an octave under it.
// FluidR3's tuba (General MIDI program 59, 0-based 58: common practice)
// plays two takes: F1 B♭1 D2 F2 B♭2 D3 F3 across its range, 2 s each, and
// the brass quartet's part (F2, D3 a just third under B♭, G2 two just
// fifths over F: voices_unseen2_test.go) in F major. The truth of each note is
// the median of the one-voice detector and aubio's yin and yinfft on the
// same render (loneTruth). Its samples sound faint lines at the odd
// multiples of half the fundamental, together 36 to 43 dB under its own
// partials' power (measured), which read the quartet's D3 as D2 (no note
// on D3) and the first take's D3 with a short D2 at its release, before
// multipitch/subharmonic.go raised such a voice to its octave
// (raiseSubOctaves). F1 (43.6 Hz) and B♭1 are logged, not held: F1's
// partials 2, 3, 5 and 7 are read as four voices, B♭1 is marked doubled
// (before and after).
func TestVoicesReadALoneTubaAtItsOwnPitch(t *testing.T) {
	t.Parallel()
	if _, err := exec.LookPath("fluidsynth"); err != nil {
		t.Fatalf("fluidsynth not found (make test installs it): %v", err)
	}
	across := testsignal.MIDIPart{Program: 58}
	for i, key := range []int{29, 34, 38, 41, 46, 50, 53} {
		across.Notes = append(across.Notes, testsignal.TimedNote{Key: key, Start: 2.5 * float64(i), Seconds: 2})
	}
	quartet := justBends(progression([]int{58}, []float64{0}, []int{41}, []int{50}, []int{43}),
		map[int]float64{50: -13.686, 43: 2 * 1.955})[0]
	for _, take := range []struct {
		name  string
		part  testsignal.MIDIPart
		flags []string
		loose map[int]bool // keys logged, not held
	}{
		{"across its range", across, nil, map[int]bool{29: true, 34: true}},
		{"the brass quartet's part", quartet, []string{"--key", "F major"}, nil},
	} {
		mono, truth, apart, _ := loneTruth(t, t.TempDir(), "tuba", "lone tuba", take.part)
		code, out, stderr := runLong(t, append(append([]string{"analyze", "--voices", "auto"}, take.flags...), mono)...)
		if code != 0 {
			t.Fatalf("--voices: exit %d: %s", code, stderr)
		}
		_, rows := readCSV(t, out)
		for i, n := range take.part.Notes {
			got, ok := loneTubaNote(rows, n, truth[i])
			t.Logf("lone tuba, %s, key %d: --voices reads %s (truth %.3f Hz, readers %.2f ¢ apart at worst)", take.name, n.Key, got, truth[i], apart)
			if !ok && !take.loose[n.Key] {
				t.Errorf("lone tuba, %s, key %d: --voices reads %s; want its truth within 3 ¢, not doubled, nothing an octave under it\n%s", take.name, n.Key, got, out)
			}
		}
	}
}

// loneTubaNote says how the rows read note n of truth hz, and whether that
// is one voice on it: a row within 3 ¢, not doubled, and no row an octave
// under it while it sounds.
func loneTubaNote(rows []map[string]string, n testsignal.TimedNote, hz float64) (string, bool) {
	low := 0
	for _, r := range rows {
		if num(r, "start_s") < n.Start+n.Seconds && num(r, "end_s") > n.Start && math.Abs(testsignal.Cents(num(r, "hz"), hz/2)) < 50 {
			low++
		}
	}
	j := matchNote(rows, make([]bool, len(rows)), n.Start+n.Seconds/2, hz)
	if j < 0 {
		return fmt.Sprintf("no note on it, %d an octave under it", low), false
	}
	c := testsignal.Cents(num(rows[j], "hz"), hz)
	return fmt.Sprintf("%+.2f ¢, doubled %s, %d notes an octave under it", c, rows[j]["doubled"], low),
		math.Abs(c) <= 3 && rows[j]["doubled"] == "false" && low == 0
}
