package main

import (
	"fmt"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
)

// Real instrument timbres with realistic attacks, releases and room
// reverberation: fluidsynth (Debian) renders a C major scale from the
// FluidR3 soundfont (Debian's fluid-soundfont-gm, MIT licence), detached and
// legato, with its default reverb. analyze must hear each scale note once —
// no note split by a wobble, no blip where one note rings into the next, no
// echo counted as a note — and spell it right. fluidsynth's tuning is only
// good to about a cent and FluidR3's samples are tuned by ear, so only the
// spelling (within ±50 ¢ in equal temperament at ISO 16's 440 Hz) is checked.
func TestAnalyzeHearsEachNoteOfRenderedScales(t *testing.T) {
	t.Parallel()
	scale := []string{"C", "D", "E", "F", "G", "A", "B", "C"}
	steps := []int{0, 2, 4, 5, 7, 9, 11, 12}
	for _, in := range []struct {
		name          string
		program, base int // General MIDI program (0-based), MIDI key of the first C
	}{
		{"violin", 40, 60}, {"cello", 42, 36}, {"clarinet", 71, 48}, {"bassoon", 70, 36},
		{"trumpet", 56, 60}, {"flute", 73, 72},
	} {
		for _, legato := range []bool{false, true} {
			var phrase []testsignal.MIDINote
			for _, st := range steps {
				n := testsignal.MIDINote{Key: in.base + st, Seconds: 0.375, Rest: 0.125}
				if legato {
					n.Seconds, n.Rest = 0.5, 0
				}
				phrase = append(phrase, n)
			}
			name := fmt.Sprintf("%s-legato=%v", in.name, legato)
			wav := fluidWAV(t, testsignal.MIDI(in.program, phrase), "-ni", "-q", "-g", "0.6", "-r", "48000")
			code, out, stderr := runLong(t, "analyze", wav)
			if code != 0 {
				t.Fatalf("%s: exit %d: %s", name, code, stderr)
			}
			_, rows := readCSV(t, out)
			got := column(rows, "note")
			var want []string
			for i, st := range steps {
				// MIDI key 60 is C4 (MIDI 1.0 with scientific pitch notation; common practice).
				want = append(want, fmt.Sprintf("%s%d", scale[i], (in.base+st)/12-1))
			}
			if strings.Join(got, " ") != strings.Join(want, " ") {
				t.Errorf("%s: heard %v, want %v", name, got, want)
			}
		}
	}
}
