package main

import (
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"fifthline/internal/vmic"
)

// The group meter with --chords writes each chord as it ends, read in the
// tuning in force while it sounded: a temperament changed afterwards (the
// meter's t key) does not re-read it. The same C major chord, sawtooth
// parts that sox synthesises at their equal-tempered pitches (A4 = 440 Hz,
// ISO 16: C3, G3, E4, C5) through a 4-channel null sink of the test's own
// with each microphone hearing the others (soxMix), is played in equal
// temperament, then again after t has moved to ¼-comma meantone. Targets,
// A4 kept at 440 Hz: equal temperament puts every member on its target
// (0 ¢); ¼-comma meantone's fifth is 3/2 narrowed by a quarter of the
// syntonic comma 81/80 (Zarlino's definition: 701.955 − 21.506/4 =
// 696.578 ¢), so C lies three such fifths below A (10.265 ¢ above equal
// temperament's), G one fifth above C (+6.843 ¢) and E one above A, less an
// octave (−3.422 ¢): the equal-tempered notes read −10.27, −6.84, +3.42 and
// −10.27 ¢. Both chords' third sits 13.69 ¢ above just (400 − 386.31 ¢, 5/4:
// common practice), whatever the temperament.
func TestGroupMeterChordsKeepTheirTuning(t *testing.T) {
	mic := vmic.IsolateChannels(t, "front-left", "front-right", "rear-left", "rear-right")
	take, _ := soxParts(t, [][]soxNote{
		{{130.8128, 0.2, 1.5, 0.3}}, {{195.9977, 0.2, 1.5, 0.3}}, {{329.6276, 0.2, 1.5, 0.3}}, {{523.2511, 0.2, 1.5, 0.3}},
	})
	journal := filepath.Join(t.TempDir(), "rehearsal.csv")
	m := startTmux(t, 80, 24, []string{"PULSE_SOURCE=" + mic.Source, "PULSE_SINK=" + mic.Sink},
		"listen", "--players", "vc,vla,vl2,vl1", "--key", "C major", "--temperament", "equal", "--a4", "440", "--chords", "--log", journal)
	m.waitFor(`no chord yet`, `lost: 0 overflows, 0 dropped`)
	play := func() {
		if err := mic.PlayChannels(take)(); err != nil {
			t.Fatal(err)
		}
	}
	play()
	// Four notes, then the chord's four memberships, while listening goes
	// on: the rows are in the journal before anything else happens.
	m.waitFor(`chord C major`, `journal: 8 notes`)
	m.tmux("send-keys", "-t", "meter", "t")
	m.waitFor(`meantone`)
	play()
	m.waitFor(`journal: 16 notes`)
	m.tmux("send-keys", "-t", "meter", "q")
	if rc := m.exitStatus(); rc != "0" {
		t.Errorf("q: exit status %s, want 0", rc)
	}
	data, err := os.ReadFile(journal)
	if err != nil {
		t.Fatal(err)
	}
	_, rows := readCSV(t, string(data))
	want := []map[string]float64{
		{"C3": 0, "G3": 0, "E4": 0, "C5": 0},
		{"C3": -10.265, "G3": -6.843, "E4": 3.422, "C5": -10.265},
	}
	chord := -1
	var last string
	for _, r := range rows {
		if r["heard_chord"] == "" {
			continue
		}
		if r["start_s"] != last {
			chord, last = chord+1, r["start_s"]
		}
		if chord >= len(want) || r["heard_chord"] != "C major" {
			t.Errorf("chord %d: %s %s, want C major twice", chord+1, r["heard_chord"], r["note"])
			continue
		}
		cents, _ := strconv.ParseFloat(r["cents"], 64)
		target, ok := want[chord][r["note"]]
		if !ok || math.Abs(cents-target) > 1 {
			t.Errorf("chord %d (%s): %s %s ¢, want %+.2f ¢ (within the 1 ¢ of a --plain reading)", chord+1, r["temperament"], r["note"], r["cents"], target)
		}
		if just, _ := strconv.ParseFloat(r["just_cents"], 64); r["member"] == "third" && math.Abs(just-13.69) > 1 {
			t.Errorf("chord %d: the third %s ¢ from just, want +13.69", chord+1, r["just_cents"])
		}
	}
	if chord != 1 {
		t.Errorf("%d chords in the journal, want 2:\n%s", chord+1, data)
	}
}
