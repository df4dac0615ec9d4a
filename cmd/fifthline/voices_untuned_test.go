package main

import (
	"os/exec"
	"testing"

	"fifthline/internal/testsignal"
)

// Scenes of our own that no part of the estimator or the tracker was tuned
// on: other instruments, other keys and voicings, quicker chords, wider
// detunings, a meantone key. They are rendered, mixed and read exactly as
// TestVoicesOfRenderedEnsembles's (voices_mix_test.go: FluidR3 with a pitch
// bend per channel, summed to one channel, sox's white noise at 35–45 dB
// SNR; truth from each part's lone render by three readers), and held to
// the figures, or to what they reach with the reason why. Each
// scene also names its chords (common practice) where they sound.
func TestVoicesOfUntunedScenes(t *testing.T) {
	t.Parallel()
	if _, err := exec.LookPath("fluidsynth"); err != nil {
		t.Fatalf("fluidsynth not found (make test installs it): %v", err)
	}
	for _, sc := range untunedScenes() {
		t.Run(sc.name, func(t *testing.T) { holdScene(t, sc) })
	}
}

// General MIDI programs (0-based, common practice): 40 violin, 41 viola,
// 42 cello, 52 choir aahs, 56 trumpet, 57 trombone, 60 French horn, 68
// oboe, 70 bassoon, 71 clarinet, 73 flute. The bends run from −15 to +15 ¢.
func untunedScenes() []scene {
	return []scene{
		// C major (C3 G3 E4), then F major (F3 A3 C5).
		{name: "brass trio: trombone, horn, trumpet", snr: 40,
			parts:  progression([]int{57, 60, 56}, []float64{4, 9, -12}, []int{48, 55, 64}, []int{53, 57, 72}),
			chords: []heldChord{{1.25, "C major"}, {4.25, "F major"}}},
		// G major (G2 D4 B4 G5), then A minor (A2 E4 C5 A5).
		{name: "woodwind quartet: bassoon, clarinet, oboe, flute", snr: 38,
			parts:  progression([]int{70, 71, 68, 73}, []float64{-15, 4, -9, 12}, []int{43, 62, 71, 79}, []int{45, 64, 72, 81}),
			chords: []heldChord{{1.25, "G major"}, {4.25, "A minor"}}},
		// Two voices a sixth apart: A3 over C3, then B3 over D3.
		{name: "sixths: cello and choir aahs", snr: 42, vibrato: true,
			parts: progression([]int{42, 52}, []float64{6, -14}, []int{48, 57}, []int{50, 59})},
		// Close voicing within one octave: E♭4 G4 B♭4, then A♭ major over
		// the held E♭4 (E♭4 A♭4 C5).
		{name: "close voicing in Eb major: viola, clarinet, flute", snr: 40, vibrato: true, key: "Eb major",
			names:  map[int]string{63: "Eb4", 68: "Ab4", 70: "Bb4"},
			parts:  progression([]int{41, 71, 73}, []float64{-5, 15, -2}, []int{63, 67, 70}, []int{63, 68, 72}),
			chords: []heldChord{{1.25, "Eb major"}, {4.25, "Ab major"}}},
		// Open voicing over two octaves, the horn's G4 held through the
		// change: C3 G4 E5, then E3 G4 B5.
		{name: "open voicing, common tone held: trombone, horn, flute", snr: 44,
			parts:  progression([]int{57, 60, 73}, []float64{7, -10, 11}, []int{48, 67, 76}, []int{52, 67, 83}),
			chords: []heldChord{{1.25, "C major"}, {4.25, "E minor"}}},
		// Three chords of 1.2 s, one after another: C major (C3 E4 G4), F
		// major (F3 F4 A4), G major (G3 D4 B4).
		{name: "three quick chords: bassoon, clarinet, oboe", snr: 40,
			parts:  progressionEvery(1.2, 1.2, []int{70, 71, 68}, []float64{10, -13, 5}, []int{48, 64, 67}, []int{53, 65, 69}, []int{55, 62, 71}),
			chords: []heldChord{{0.6, "C major"}, {1.8, "F major"}, {3.0, "G major"}}},
		// G minor (G2 D4 B♭4), then D major (D3 A3 F♯4), each note bent to
		// its ¼-comma meantone target.
		{name: "G minor in quarter-comma meantone: cello, viola, violin", snr: 36, vibrato: true, key: "G minor", temperament: "meantone",
			names:  map[int]string{70: "Bb4", 66: "F#4"},
			parts:  meantoneBends(progression([]int{42, 41, 40}, []float64{0, 0, 0}, []int{43, 62, 70}, []int{50, 57, 66})),
			chords: []heldChord{{1.25, "G minor"}, {4.25, "D major"}}},
	}
}

// meantoneBends bends each note to its ¼-comma meantone target at A4 = 440
// Hz: a fifth of 3/2 narrowed by a quarter of the syntonic comma 81/80
// (696.578 ¢; the temperament's definition), so a note n fifths above A
// lies n·(696.578 − 700) ¢ from equal temperament. Sharps and flats as G
// minor spells them: B♭ five fifths below A, F♯ three above.
func meantoneBends(parts []testsignal.MIDIPart) []testsignal.MIDIPart {
	fromA := map[int]int{7: -2, 2: -1, 10: -5, 9: 0, 6: 3, 0: -3, 3: -6, 5: -4}
	for p := range parts {
		for i := range parts[p].Notes {
			n := &parts[p].Notes[i]
			n.Cents = float64(fromA[n.Key%12]) * (quarterComma - 700)
		}
	}
	return parts
}

// misnamed counts the scene's chords not named as they sound: no chord row
// at the time, or a row under another name.
func misnamed(t *testing.T, sc scene, rows []map[string]string) (wrong int) {
	t.Helper()
	for _, c := range sc.chords {
		var names []string
		starts := map[string]bool{} // one name a chord, however many roots sound
		for _, r := range rows {
			if num(r, "start_s") <= c.at && c.at <= num(r, "end_s") && !starts[r["start_s"]] {
				starts[r["start_s"]] = true
				names = append(names, r["chord"])
			}
		}
		if len(names) != 1 || names[0] != c.name {
			wrong++
			t.Logf("%s: at %.2f s want %s, heard %v", sc.name, c.at, c.name, names)
		}
	}
	return wrong
}

// heldChord is a chord's name (analyze's chord column) sounding at a time.
type heldChord struct {
	at   float64
	name string
}

// spell is a key's name in the scene's key.
func (sc scene) spell(key int) string {
	if n, ok := sc.names[key]; ok {
		return n
	}
	return spelled(key)
}

// musical are analyze's flags for the scene's key and temperament.
func (sc scene) musical() []string {
	var f []string
	if sc.key != "" {
		f = append(f, "--key", sc.key)
	}
	if sc.temperament != "" {
		f = append(f, "--temperament", sc.temperament)
	}
	return f
}
