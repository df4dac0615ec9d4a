package main

import (
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

// ¼-comma meantone at A4 = 440 Hz: A♭4 421.09 Hz and G♯4 411.22 Hz, a
// lesser diesis (128/125, 41.06 ¢) apart (published definition; common
// practice; pitchdetect/step_test.go derives them). C4 and E3 in equal
// temperament from A4 = 440 Hz (ISO 16).
const (
	meantoneAb4, meantoneGs4 = 421.0914, 411.2209
	stepC4, stepE3           = 261.6256, 164.8138
)

// On one microphone, as for a player alone (pitchdetect/step.go), a voice's
// step that holds on both sides is two notes, however small against the
// jump a track follows: a voice moving between A♭4 and G♯4 over a held C4
// or E3 without a break, and 30 ¢ down, gives the held voice one note and
// the moving one two, each within 0.5 ¢ of its pitch; a 20 ¢ step, under
// the syntonic comma (81/80, 21.51 ¢: common practice) a held note is
// tuned by, stays one note. Each side is a sox sawtooth held 0.6 s
// (sox: a reference tool), the sides joined by sox and mixed with the
// held voice by sox -m.
func TestAVoicesHeldStepIsTwoNotes(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	saw := func(name string, hz float64, seconds float64) string {
		path := filepath.Join(dir, name+".wav")
		soxTB(t, "-n", "-r", "48000", "-b", "24", "-c", "1", path, "synth", fmt.Sprint(seconds), "sawtooth", fmt.Sprintf("%.4f", hz), "vol", "0.3")
		return path
	}
	for _, tc := range []struct {
		name   string
		held   float64
		hz     [2]float64
		notes  int
		source string
	}{
		{"A♭4 to G♯4 over C4", stepC4, [2]float64{meantoneAb4, meantoneGs4}, 2, "lesser diesis, 41.06 ¢"},
		{"G♯4 to A♭4 over E3", stepE3, [2]float64{meantoneGs4, meantoneAb4}, 2, "the diesis up"},
		{"30 ¢ down over C4", stepC4, [2]float64{meantoneAb4, meantoneAb4 * math.Exp2(-30.0/1200)}, 2, "over StepCents, 25 ¢"},
		{"20 ¢ down over E3", stepE3, [2]float64{meantoneAb4, meantoneAb4 * math.Exp2(-20.0/1200)}, 1, "under the syntonic comma"},
	} {
		held := saw(tc.name+" held", tc.held, 1.2)
		moving := filepath.Join(dir, tc.name+" moving.wav")
		soxTB(t, saw(tc.name+" 1", tc.hz[0], 0.6), saw(tc.name+" 2", tc.hz[1], 0.6), moving)
		mix := filepath.Join(dir, tc.name+".wav")
		soxTB(t, "-m", held, moving, mix)
		upper := voiceNotes(t, tc.name, mix, tc.held)
		if len(upper) != tc.notes {
			t.Errorf("%s (%s): the moving voice gave %d notes, want %d: %v", tc.name, tc.source, len(upper), tc.notes, upper)
			continue
		}
		for i, hz := range upper {
			if want := tc.hz[i]; tc.notes == 2 && math.Abs(testsignal.Cents(hz, want)) > 0.5 {
				t.Errorf("%s: note %d at %.4f Hz, %+.2f ¢ from %.4f Hz", tc.name, i+1, hz, testsignal.Cents(hz, want), want)
			}
		}
	}
}

// A voice's vibrato swings through any held stretch: A♭4 with a ±40 ¢
// vibrato at 5.5 Hz (wider than sung or bowed vibrato usually swings:
// common practice, from memory) over a held C4 is one note.
func TestAVoicesVibratoIsNoStep(t *testing.T) {
	t.Parallel()
	const rate = 48000.0
	n := int(1.2 * rate)
	x := testsignal.Tone(rate, n, testsignal.Saw, 0.3, testsignal.Vibrato(meantoneAb4, 80, 5.5))
	for i, s := range testsignal.Tone(rate, n, testsignal.Saw, 0.3, testsignal.Steady(stepC4)) {
		x[i] += s
	}
	path := monoWAV(t, filepath.Join(t.TempDir(), "vibrato"), x)
	if upper := voiceNotes(t, "vibrato", path, stepC4); len(upper) != 1 {
		t.Errorf("the vibrato voice gave %d notes, want 1: %v", len(upper), upper)
	}
}

// voiceNotes runs analyze --voices auto on path and gives the pitches of
// the notes above the held voice at held Hz, which must be one note.
func voiceNotes(t *testing.T, name, path string, held float64) []float64 {
	t.Helper()
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", path)
	if code != 0 {
		t.Fatalf("%s: exit %d: %s", name, code, stderr)
	}
	_, rows := readCSV(t, out)
	var lower int
	var upper []float64
	for _, r := range rows {
		hz := parseF(r["hz"])
		if math.Abs(testsignal.Cents(hz, held)) < 50 {
			lower++
			continue
		}
		upper = append(upper, hz)
	}
	if lower != 1 {
		t.Errorf("%s: the held voice gave %d notes, want 1:\n%s", name, lower, out)
	}
	return upper
}

// A bowed vibrato (±13 ¢) is no step either, though the estimator's hop
// is about half its cycle, so its frames alternate crest and trough and
// their beat can hold either for three frames: the string quartet's first
// violin (voices_mix_test.go, FluidR3 via fluidsynth) alone, C5 then D5,
// is two notes, and so begun 23, 46 and 70 ms later.
func TestALoneViolinsVibratoIsNoStep(t *testing.T) {
	t.Parallel()
	i := slices.IndexFunc(ensembleScenes(), func(sc scene) bool { return sc.name == "string quartet" })
	part := ensembleScenes()[i].parts[3]
	dir := t.TempDir()
	wav := renderMIDI(t, dir, "violin", testsignal.MIDIParts([]testsignal.MIDIPart{part}))
	mono := filepath.Join(dir, "violin.mono.wav")
	monoSum(t, wav, mono)
	for _, ms := range []int{0, 23, 46, 70} {
		late := filepath.Join(dir, fmt.Sprintf("violin%d.wav", ms))
		soxTB(t, mono, late, "pad", fmt.Sprintf("%.3f", float64(ms)/1000), "0")
		code, out, stderr := runCLI(t, "analyze", "--voices", "auto", late)
		if code != 0 {
			t.Fatalf("%d ms: exit %d: %s", ms, code, stderr)
		}
		if _, rows := readCSV(t, out); len(rows) != 2 {
			t.Errorf("begun %d ms later: %d notes, want 2 (C5, D5):\n%s", ms, len(rows), out)
		}
	}
}

// A bowed vibrato on either side of a held step is no obstacle either
// (pitchdetect/step.go: a side too sparse to fit a vibrato to is judged
// by the mean of each two frames): FluidR3's violin and cello alone
// (diesisPair), both ways, are two notes about key 68, each within 5 ¢ of
// its pitch (their steady sides alone split neither violin pair nor one of
// the cello's: measured). Notes elsewhere are TestASplitNotesPartials'.
func TestAVoicesBowedVibratoStepIsTwoNotes(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, p := range []diesisPlayer{{"violin", 40}, {"cello", 42}} {
		for _, c := range diesisBends {
			near, _ := diesisPair(t, dir, p, c)
			if len(near) != 2 {
				t.Errorf("%s %+.2f ¢ then %+.2f ¢: %d notes about key 68, want 2", p.name, c[0], c[1], len(near))
				continue
			}
			for i, n := range near {
				cents := testsignal.Cents(n.hz, 415.3047)
				if want := testsignal.BendCents(c[i]); math.Abs(cents-want) > 5 {
					t.Errorf("%s %+.2f ¢ then %+.2f ¢: note %d at %+.2f ¢, want %+.2f", p.name, c[0], c[1], i, cents, want)
				}
			}
		}
	}
}

// One instrument plays one note: a held note's partials and octave are no
// voices, also where a step splits it (voicesurfaced.go, foldOctave). The
// diesis pairs of FluidR3's violin, viola, cello, oboe and voice oohs
// (diesisPair), both ways, give no note besides those about key 68 that
// sounds past the step; before the rule held through the step they gave 9
// (the violin's and viola's 5th and 4th partials spanning it, the cello's,
// oboe's and oohs' surfacing after it; measured). A partial read as a voice
// from the held note's attack, within half a window, stays a voice by the
// rule (a voice struck with a note on its partial is one): 5 such notes in
// the ten pairs, the cello's octave and 5th, the oboe's 4th and the oohs'
// 3rd (measured; 14 notes besides the pairs' before).
func TestASplitNotesPartials(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var phantoms int
	for _, p := range []diesisPlayer{{"violin", 40}, {"viola", 41}, {"cello", 42}, {"oboe", 68}, {"oohs", 53}} {
		for _, c := range diesisBends {
			near, others := diesisPair(t, dir, p, c)
			phantoms += len(others)
			if len(near) != 2 {
				t.Errorf("%s %+.2f ¢ then %+.2f ¢: %d notes about key 68, want 2", p.name, c[0], c[1], len(near))
				continue
			}
			for _, o := range others {
				// A hop (85 ms) is the frames' grain: past the step by more
				// than half of one.
				if o.end > near[1].start+0.04 {
					t.Errorf("%s %+.2f ¢ then %+.2f ¢: a note at %.2f Hz, %.3f–%.3f s, sounds past the step (%.3f s)", p.name, c[0], c[1], o.hz, o.start, o.end, near[1].start)
				}
			}
		}
	}
	if phantoms > 5 {
		t.Errorf("%d notes besides the pairs', want at most 5 (measured)", phantoms)
	}
}

// diesisPlayer is a FluidR3 instrument by its General MIDI program (0-based).
type diesisPlayer struct {
	name    string
	program int
}

// diesisBends: ¼-comma meantone's A♭4 and G♯4 as bends of MIDI key 68
// (415.30 Hz in equal temperament: ISO 16), +24.03 and −17.03 ¢, a lesser
// diesis apart (published definition), one way and the other.
var diesisBends = [][2]float64{{24.03, -17.03}, {-17.03, 24.03}}

// stepNote is a row of analyze's output: its pitch and span.
type stepNote struct{ hz, start, end float64 }

// diesisPair renders player p alone (fluidsynth, 48 kHz) holding key 68
// bent by c[0] for 0.8 s, then by c[1] for 0.8 s without a break, reads
// it with analyze --voices auto, and gives the notes within 100 ¢ of key
// 68 and the others.
func diesisPair(t *testing.T, dir string, p diesisPlayer, c [2]float64) (near, others []stepNote) {
	t.Helper()
	name := fmt.Sprintf("%s%+.0f", p.name, c[0])
	wav := renderMIDIAt(t, dir, name, testsignal.MIDIParts([]testsignal.MIDIPart{{Program: p.program, Notes: []testsignal.TimedNote{
		{Key: 68, Start: 0.2, Seconds: 0.8, Cents: c[0]}, {Key: 68, Start: 1.0, Seconds: 0.8, Cents: c[1]}}}}), 48000)
	mono := filepath.Join(dir, name+".mono.wav")
	monoSum(t, wav, mono)
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", mono)
	if code != 0 {
		t.Fatalf("%s: exit %d: %s", name, code, stderr)
	}
	_, rows := readCSV(t, out)
	for _, r := range rows {
		n := stepNote{parseF(r["hz"]), parseF(r["start_s"]), parseF(r["end_s"])}
		if math.Abs(testsignal.Cents(n.hz, 415.3047)) < 100 {
			near = append(near, n)
		} else {
			others = append(others, n)
		}
	}
	if len(near) != 2 || len(others) > 0 {
		t.Logf("%s:\n%s", name, out)
	}
	return near, others
}
