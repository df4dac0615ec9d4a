package ui

import (
	"context"
	"strings"
	"testing"
	"time"

	"github.com/gdamore/tcell/v2"

	"fifthline/session"
)

// One microphone's voices are read on long windows, a frame every 85 ms
// (package multipitch: the half window of 171 ms after an onset, then the
// whole of 341 ms). Pitches: C4 in equal temperament at A4 = 440 Hz
// (ISO 16), E4 and G4 5/4 and 3/2 above it, E5 a just major tenth (5/2)
// above it (common practice); A4 and E5 equal-tempered.
var c4 = et(-9)

// voicesMeter is a group meter of rows for three voices, after a frame of
// silence at 0.939 s.
func voicesMeter(t *testing.T) *groupModel {
	g := newGroupModel(newModel(keyOf(t, "C major"), "test tones"), []string{"voice 1", "voice 2", "voice 3"}, 0)
	voicesFrame(g, 0.939, -120, 0, 0, 0)
	return g
}

// voicesFrame adds a long window's frame at level dBFS (its half window:
// Span 171 ms); a row whose hz is 0 is silent.
func voicesFrame(g *groupModel, at, level float64, hz ...float64) {
	g.AddFrame(GroupFrame{Time: at, Hz: hz, Levels: []float64{level, level, level}, Level: level, Span: 0.171})
}

// Each frame has heard a long stretch of the chord, so two agreeing
// frames hold a row's pitch (one alone may be a passing misreading)
// whatever their levels, and a chord out of silence is named as soon as
// its rows hold it: at the second frame. Read as the players' 10.7 ms
// frames, the rows wanted three frames within 6 dB of the loudest and the
// chord 0.2 s of frames after that; held to those 0.2 s on the frames'
// own spans, it came at the third. The first frame is 11 dB louder than
// the rest, as the estimator reads an onset (measured).
func TestVoicesOnLongWindowsAreNamedFromTheirSecondFrame(t *testing.T) {
	g := voicesMeter(t)
	voicesFrame(g, 1.024, -14, c4, c4*5/4, c4*3/2)
	if r := g.readings()[0]; r.Holding {
		t.Errorf("after one frame, voice 1 holds a pitch: %+v", r)
	}
	if got := chordLine(g).Text(); !strings.HasPrefix(got, "no chord yet") {
		t.Errorf("after one frame: %q", got)
	}
	voicesFrame(g, 1.109, -25, c4, c4*5/4, c4*3/2)
	if r := g.readings()[0]; !r.Holding || r.Note.Pretty() != "C4" {
		t.Errorf("after two frames, voice 1: %+v", r)
	}
	if got := chordLine(g).Text(); got != "chord C major · root C4" {
		t.Errorf("after two frames: %q", got)
	}
}

// A change of chord is named once two frames in a row name the new chord,
// not at the first: the long windows of the first frames after a change
// hold the chord before as well. The screen goes from the one chord to the
// other and to no third name. C4 A4 E5 make A minor with C4 in the bass:
// the line names the root its just is measured from, A4, as "root", since
// "A minor over A4" would read as the bass (slash-chord naming, common
// practice).
func TestAChangeOfChordOnLongWindowsIsNamedWhenTwoFramesAgree(t *testing.T) {
	g := voicesMeter(t)
	for at := 1.024; at < 1.4; at += 0.085 {
		voicesFrame(g, at, -25, c4, c4*5/4, c4*3/2)
	}
	var shown []string
	for i, at := range []float64{1.45, 1.535, 1.62} {
		voicesFrame(g, at, -25, c4, et(0), et(7))
		got := chordLine(g).Text()
		if i < 2 && strings.Contains(got, "A minor") {
			t.Errorf("%d frames into the change: %q", i+1, got)
		}
		if len(shown) == 0 || shown[len(shown)-1] != got {
			shown = append(shown, got)
		}
	}
	want := []string{"last chord C major", "chord A minor · root A4"}
	if strings.Join(shown, " | ") != strings.Join(want, " | ") {
		t.Errorf("the chord line through the change: %q; want %q", shown, want)
	}
	if got := beforeLine(g).Text(); got != "before: C major" {
		t.Errorf("before line %q", got)
	}
}

// A voice still attacking out of silence (read on the newest frame, not
// yet held) holds the chord's name back: C4 and G4 from the first frame,
// E5 entering on the second. The open fifth alone, its rows held at the
// second frame, would be named and replaced a frame later by the major
// chord: a name flickering on the screen. The chord is named once all
// three hold, at the third frame.
func TestAVoiceStillAttackingHoldsTheChordsNameBack(t *testing.T) {
	g := voicesMeter(t)
	var shown []string
	for i, at := range []float64{1.024, 1.109, 1.195, 1.28} {
		hz := []float64{c4, c4 * 3 / 2, c4 * 5 / 2}
		if i == 0 {
			hz[2] = 0
		}
		voicesFrame(g, at, -25, hz...)
		got := chordLine(g).Text()
		if len(shown) == 0 || shown[len(shown)-1] != got {
			shown = append(shown, got)
		}
	}
	want := []string{"no chord yet: two or more notes held together make one", "chord C major · root C4"}
	if strings.Join(shown, " | ") != strings.Join(want, " | ") {
		t.Errorf("the chord line: %q; want %q", shown, want)
	}
}

// A long window's frame is drawn as it comes, not at the next periodic
// redraw (up to 1/frameRate later): here the periodic redraw never comes,
// and the chord of the voices' frames reaches the screen all the same.
func TestVoicesFramesAreDrawnAsTheyCome(t *testing.T) {
	scr := &simTerminal{SimulationScreen: tcell.NewSimulationScreen("UTF-8")}
	m := New(Options{Tunings: session.NewTunings(keyOf(t, "C major")), Source: "test tones", Screen: scr.SimulationScreen,
		Group: []string{"voice 1", "voice 2", "voice 3"}})
	m.drawn, m.period = scr.copy, time.Hour
	done := make(chan error, 1)
	go func() { done <- m.Run(context.Background()) }()
	for i, at := range []float64{0.939, 1.024, 1.109} {
		hz := []float64{c4, c4 * 5 / 4, c4 * 3 / 2}
		if i == 0 {
			hz = make([]float64, 3)
		}
		m.OnGroupFrame(GroupFrame{Time: at, Hz: hz, Levels: []float64{-25, -25, -25}, Level: -25, Span: 0.171})
	}
	waitFor(t, scr, "chord C major")
	m.Stop()
	if err := <-done; err != nil {
		t.Errorf("Run: %v", err)
	}
}
