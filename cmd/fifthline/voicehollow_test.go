package main

import (
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"fifthline/internal/testsignal"
)

// A lone violin is one voice: the string quartet's first violin (C5, then
// D5, bowed with vibrato), rendered by fluidsynth from FluidR3 (Debian
// fluid-soundfont-gm) at 48 kHz, gives its two notes and nothing under the
// violin's lowest string, G3 = 196 Hz (common practice). It gave a B♭1
// (59.6 Hz) from 4.61 to 5.12 s: the D5's vibrato trough, whose partials
// lie on that B♭1's 10th, 20th, 30th, … (multipitch/subharmonic.go); its
// partials under the D5 held 0.01 to 0.4 % of its fitted power, measured.
func TestALoneViolinHasNoVoiceUnderItsLowestString(t *testing.T) {
	t.Parallel()
	i := slices.IndexFunc(ensembleScenes(), func(sc scene) bool { return sc.name == "string quartet" })
	part := ensembleScenes()[i].parts[3]
	dir := t.TempDir()
	wav := renderMIDIAt(t, dir, "violin", testsignal.MIDIParts([]testsignal.MIDIPart{part}), 48000)
	mono := filepath.Join(dir, "violin.mono.wav")
	monoSum(t, wav, mono)
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", mono)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	var notes []string
	for _, r := range rows {
		f, err := strconv.ParseFloat(r["hz"], 64)
		if err != nil {
			t.Fatalf("hz %q: %v", r["hz"], err)
		}
		if f < 196 {
			t.Errorf("a note at %.2f Hz, under the violin's G3 (196 Hz): %v", f, r)
		}
		notes = append(notes, r["note"])
	}
	if !slices.Equal(notes, []string{"C5", "D5"}) {
		t.Errorf("notes %v, want [C5 D5]:\n%s", notes, out)
	}
}
