package main

import (
	"math"
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
// syntonic comma 81/80 (its published definition: 701.955 − 21.506/4 =
// 696.578 ¢), so C lies three such fifths below A (10.265 ¢ above equal
// temperament's), G one fifth above C (+6.843 ¢) and E one above A, less an
// octave (−3.422 ¢): the equal-tempered notes read −10.27, −6.84, +3.42 and
// −10.27 ¢. Both chords' third sits 13.69 ¢ above just (400 − 386.31 ¢, 5/4:
// common practice), whatever the temperament.
func TestGroupMeterChordsKeepTheirTuning(t *testing.T) {
	mic := vmic.IsolateChannels(t, fourChannels...)
	take, _ := soxParts(t, [][]soxNote{
		{{130.8128, 0.2, 1.5, 0.3}}, {{195.9977, 0.2, 1.5, 0.3}}, {{329.6276, 0.2, 1.5, 0.3}}, {{523.2511, 0.2, 1.5, 0.3}},
	})
	journal := filepath.Join(t.TempDir(), "rehearsal.csv")
	m := startTmux(t, 80, 24, mic.Env(),
		"listen", "--players", "vc,vla,vl2,vl1", "--key", "C major", "--temperament", "equal", "--a4", "440", "--chords", "--log", journal)
	m.waitFor(`no chord yet`, `input +(silent|−[0-9]+ dBFS)`)
	play := func() {
		if err := mic.PlayChannels(take)(); err != nil {
			t.Fatal(err)
		}
	}
	play()
	// Four notes, then the chord's four memberships, while listening goes
	// on: the rows are in the journal before anything else happens.
	m.waitFor(`chord C major`, `journal: 4 notes, 1 chord`)
	m.tmux("send-keys", "-t", "meter", "t")
	m.waitFor(`meantone`)
	play()
	m.waitFor(`journal: 8 notes, 2 chords`)
	m.quitCleanly()
	checkChordsInTheirTuning(t, journal, "C major", []map[string]float64{
		{"C3": 0, "G3": 0, "E4": 0, "C5": 0},
		{"C3": -10.265, "G3": -6.843, "E4": 3.422, "C5": -10.265},
	}, 13.69)
}

// checkChordsInTheirTuning holds that the journal has one chord for each
// of want, all named chord, each member's cents against the temperament
// within 1 ¢ (a --plain reading's figure) of want's for its note, and the
// third's just_cents within 1 ¢ of third.
func checkChordsInTheirTuning(t *testing.T, journal, name string, want []map[string]float64, third float64) {
	t.Helper()
	data, rows := readCSVFile(t, journal)
	chord := -1
	var last string
	for _, r := range rows {
		if r["heard_chord"] == "" {
			continue
		}
		if r["start_s"] != last {
			chord, last = chord+1, r["start_s"]
		}
		if chord >= len(want) || r["heard_chord"] != name {
			t.Errorf("chord %d: %s %s, want %s %d times", chord+1, r["heard_chord"], r["note"], name, len(want))
			continue
		}
		cents, _ := strconv.ParseFloat(r["cents"], 64)
		target, ok := want[chord][r["note"]]
		if !ok || math.Abs(cents-target) > 1 {
			t.Errorf("chord %d (%s): %s %s ¢, want %+.2f ¢", chord+1, r["temperament"], r["note"], r["cents"], target)
		}
		if just, _ := strconv.ParseFloat(r["just_cents"], 64); r["member"] == "third" && math.Abs(just-third) > 1 {
			t.Errorf("chord %d: the third %s ¢ from just, want %+.2f", chord+1, r["just_cents"], third)
		}
	}
	if chord != len(want)-1 {
		t.Errorf("%d chords in the journal, want %d:\n%s", chord+1, len(want), data)
	}
}

// The same with --voices 3 on one microphone (a private null sink): sox's
// sawtooth C4 (261.63 Hz, equal temperament at A4 = 440 Hz, ISO 16) with
// E4 and G4 just above it (5/4, 3/2: common practice), before and after t.
// Equal temperament: C4 +0.03 ¢ (261.63 against 261.6256 Hz), E4 −13.66 ¢
// (386.31 − 400, plus C4's 0.03), G4 +1.99 ¢. ¼-comma meantone from A4 =
// 440 Hz (as above: C4 +10.265, E4 −3.422, G4 +6.843 ¢ from equal
// temperament): C4 −10.24, E4 −10.24, G4 −4.86 ¢; the third just (0 ¢)
// both times. A voice's chord waits for lostSeconds past its end (a voice
// lost under it may come back), and still comes while listening goes on.
func TestVoicesMeterChordsKeepTheirTuning(t *testing.T) {
	t.Parallel()
	_, env, play := privateMic(t)
	wav := sox(t, "chord.wav", "-r", "48000", "-b", "16", "synth 2 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8 pad 0.5 1")
	journal := filepath.Join(t.TempDir(), "rehearsal.csv")
	m := startTmux(t, 80, 24, env, "listen", "--voices", "3", "--key", "C major", "--temperament", "equal", "--a4", "440", "--chords", "--log", journal)
	m.waitFor(`no chord yet`, `input +(silent|−[0-9]+ dBFS)`)
	play(wav)
	m.waitFor(`chord C major`, `journal: 3 notes, 1 chord`) // three notes, one chord's three memberships
	m.tmux("send-keys", "-t", "meter", "t")
	m.waitFor(`meantone`)
	play(wav)
	m.waitFor(`journal: 6 notes, 2 chords`)
	m.quitCleanly()
	checkChordsInTheirTuning(t, journal, "C major", []map[string]float64{
		{"C4": 0.03, "E4": -13.66, "G4": 1.99},
		{"C4": -10.24, "E4": -10.24, "G4": -4.86},
	}, 0)
}
