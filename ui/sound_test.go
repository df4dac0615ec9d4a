package ui

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"fifthline/drone"
	"fifthline/internal/vmic"
	"fifthline/playback"
	"fifthline/target"
)

// playerSound is a real Player as the meter's Sound, playing into a null
// sink of the test's own (nothing is audible).
type playerSound struct{ *playback.Player }

func (p playerSound) SetDrone(hz []float64) error { p.Player.SetDrone(hz); return nil }
func (p playerSound) Reference(hz float64) error {
	p.Player.Reference(hz, time.Duration(ReferenceSeconds*float64(time.Second)))
	return nil
}

func openSound(t *testing.T) playerSound {
	t.Helper()
	vmic.Isolate(t)
	p, err := playback.NewPlayer(playback.Options{Timbre: drone.Reed, ShareWithReference: true, Fade: 10 * time.Millisecond})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { p.Close() })
	return playerSound{p}
}

// noOutput is the Sound of a machine whose output cannot be opened: every
// request fails with the error a real Player gave for a missing device.
type noOutput struct{ err error }

func missingOutput(t *testing.T) noOutput {
	t.Helper()
	vmic.Ensure(t)
	_, err := playback.NewPlayer(playback.Options{Device: "no-such-output-xyz"})
	if !errors.Is(err, playback.ErrNoDevice) {
		t.Fatalf("opening a missing output: %v", err)
	}
	return noOutput{err}
}

func (s noOutput) SetDrone([]float64) error { return s.err }
func (s noOutput) Reference(float64) error  { return s.err }
func (noOutput) Partials() []float64        { return nil }
func (noOutput) Lost() error                { return nil }

// The sound keys, pressed in turn on C major in ¼-comma meantone at
// A4 = 415 Hz, with a real Player. From the definition (each fifth 5^(1/4),
// A4 three fifths above C4 less an octave): C3 = 415 / 5^(3/4),
// G3 = C3 · 5^(1/4), and after → (G major) G3 and D4 = G3 · 5^(1/4).
func TestSoundKeysDriveTheDroneAndTheReference(t *testing.T) {
	s := openSound(t)
	c3 := 415 / math.Pow(fifthQC, 3)
	g3, d4 := c3*fifthQC, c3*fifthQC*fifthQC
	m := holding(quarterComma(t), fSharp4)
	m.HasSound, m.SoundLevel, m.Caution = true, -18, "caution: keep the volume low"
	m.Holding = false // the note has ended: the reference sounds the last one
	for _, step := range []struct {
		name    string
		press   func()
		say     string    // the hint line after the press
		status  string    // the sound line
		drone   []float64 // fundamentals the player sounds (each its first partial)
		caution bool
	}{
		{"at first", func() {}, "", "drone: off", nil, false},
		{"d: the tonic", func() { m.CycleDrone(s) }, "drone C3", "drone: C3 at −18 dBFS", []float64{c3}, true},
		{"d: tonic and fifth", func() { m.CycleDrone(s) }, "drone C3+G3", "drone: C3+G3 at −18 dBFS", []float64{c3, g3}, true},
		{"→ moves the drone with the tonic", func() {
			m.Tuning, _ = moveTonic(m.Tuning, 1)
			m.Retune(s)
		}, "", "drone: G3+D4 at −18 dBFS", []float64{g3, d4}, true},
		{"d: off", func() { m.CycleDrone(s) }, "drone off", "drone: off", nil, false},
		{"s: the last note's target (fSharp4, ¼-comma's definition)", func() { m.SoundReference(s) }, "reference: F♯4 at 346.91 Hz", "drone: off", []float64{fSharp4}, true},
	} {
		step.press()
		m.Sounding = s.Partials()
		if got := hintLine(m).Text(); step.say != "" && got != step.say {
			t.Errorf("%s: hint %q, want %q", step.name, got, step.say)
		}
		if got := soundLine(m).Text(); got != step.status {
			t.Errorf("%s: sound line %q, want %q", step.name, got, step.status)
		}
		for _, f := range step.drone {
			if !slices.ContainsFunc(m.Sounding, func(p float64) bool { return math.Abs(p-f) < 1e-9 }) {
				t.Errorf("%s: %.4f Hz not among the player's partials %.4f", step.name, f, m.Sounding)
			}
		}
		if step.drone == nil && len(m.Sounding) > 0 {
			t.Errorf("%s: still sounding %.2f", step.name, m.Sounding)
		}
		if got := len(cautionLines(m, 80)) > 0; got != step.caution {
			t.Errorf("%s: caution shown %v, want %v", step.name, got, step.caution)
		}
	}
}

// A meter started with its drone on (listen --drone) sounds the tonic and
// fifth at once, at its level, with the caution on the screen, as two
// presses of d would (the pitches as above, from ¼-comma's definition);
// the next d turns it off.
func TestTheMeterCanStartWithTheDrone(t *testing.T) {
	s := openSound(t)
	c3 := 415 / math.Pow(fifthQC, 3)
	m := holding(quarterComma(t), fSharp4)
	m.HasSound, m.SoundLevel, m.Caution = true, -18, "caution: keep the volume low"
	m.StartDrone(s)
	m.Sounding = s.Partials()
	if got := soundLine(m).Text(); got != "drone: C3+G3 at −18 dBFS" {
		t.Errorf("sound line %q", got)
	}
	for _, f := range []float64{c3, c3 * fifthQC} {
		if !slices.ContainsFunc(m.Sounding, func(p float64) bool { return math.Abs(p-f) < 1e-9 }) {
			t.Errorf("%.4f Hz not among the player's partials %.4f", f, m.Sounding)
		}
	}
	if len(cautionLines(m, 80)) == 0 {
		t.Error("no caution on the screen while the drone sounds")
	}
	m.CycleDrone(s)
	if got := soundLine(m).Text(); got != "drone: off" {
		t.Errorf("after d: sound line %q, want the drone off", got)
	}
}

func TestSoundKeysSayWhyNothingPlays(t *testing.T) {
	none := missingOutput(t)
	m := newModel(quarterComma(t), "x")
	m.HasSound = true
	m.SoundReference(none)
	if got := hintLine(m).Text(); !strings.HasPrefix(got, "no note yet") {
		t.Errorf("reference before any note: %q", got)
	}
	m.CycleDrone(none)
	if m.Drone != droneOff || soundLine(m).Text() != "no sound: "+none.err.Error() || soundLine(m)[0].Role != warn {
		t.Errorf("failed drone: state %d, line %q", m.Drone, soundLine(m).Text())
	}
	if got := hintLine(m).Text(); !strings.HasPrefix(got, "no sound: ") {
		t.Errorf("hint %q", got)
	}
	if soundLine(newModel(target.Default(), "x")) != nil {
		t.Error("a meter without sound shows a sound line")
	}
}

// The held pitch on one of the sounding partials is marked: the canceller
// took that partial out, so the note was read from its others. 0.1 Hz away
// counts; 0.2 Hz does not.
func TestAPitchOnTheDroneIsMarked(t *testing.T) {
	for _, c := range []struct {
		off  float64
		want bool
	}{{0, true}, {0.09, true}, {-0.09, true}, {0.2, false}} {
		m := holding(quarterComma(t), fSharp4+c.off)
		m.HasSound, m.Sounding = true, []float64{fSharp4 / 2, fSharp4, 2 * fSharp4}
		if got := strings.HasSuffix(words(m).Text(), " · at a pitch the drone sounds (read with the drone taken out)"); got != c.want {
			t.Errorf("%+.2f Hz from a partial: marked %v (%q)", c.off, got, words(m).Text())
		}
	}
}

func TestTheCautionWrapsToTheScreen(t *testing.T) {
	m := newModel(target.Default(), "x")
	m.HasSound, m.Drone = true, droneTonic
	m.Caution = "caution: keep your headphone or speaker volume low and stop at once if it hurts"
	for _, w := range []int{80, 40, 20} {
		var words []string
		for _, l := range cautionLines(m, w) {
			if l.Width() > w {
				t.Errorf("%d columns: %q", w, l.Text())
			}
			words = append(words, l.Text())
		}
		if strings.Join(words, " ") != m.Caution {
			t.Errorf("%d columns: %q", w, words)
		}
	}
}

func TestEverySoundKeyIsInTheHelp(t *testing.T) {
	help := ""
	for _, l := range helpLines() {
		help += l.Text() + "\n"
	}
	for _, want := range []string{"  d     drone", "  s ␣   sound the held (or last) note's target"} {
		if !strings.Contains(help, want) {
			t.Errorf("help lacks %q", want)
		}
	}
}

// While the drone sounds the screen keeps its state and the caution, on
// every size, neither wider than the screen (the others are clipped when
// drawn).
func TestLayoutKeepsTheDroneAndTheCaution(t *testing.T) {
	m := holding(quarterComma(t), fSharp4)
	m.HasSound, m.Drone, m.SoundLevel = true, droneTonicFifth, -18
	m.Caution = "caution: keep your headphone or speaker volume low and stop at once if it hurts"
	for _, size := range [][2]int{{80, 24}, {120, 40}, {60, 16}, {40, 10}} {
		w, h := size[0], size[1]
		var screen strings.Builder
		for _, l := range layout(m, w, h) {
			if text := l.Text(); (strings.Contains(text, "drone:") || strings.Contains(text, "caution")) && l.Width() > w {
				t.Errorf("%dx%d: line wider than the screen: %q", w, h, text)
			}
			screen.WriteString(l.Text() + "\n")
		}
		for _, want := range []string{"drone: C3+G3 at −18 dBFS", "caution: keep your", "F♯4 is on its target"} {
			if !strings.Contains(screen.String(), want) {
				t.Errorf("%dx%d lacks %q:\n%s", w, h, want, screen.String())
			}
		}
	}
}
