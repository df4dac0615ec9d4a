package ui

import (
	"context"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/gdamore/tcell/v2"

	"fifthline/pitchdetect"
	"fifthline/session"
)

// simTerminal is a simulated terminal whose contents are copied on the
// meter's own goroutine (the simulation screen is not safe to read from
// another).
type simTerminal struct {
	tcell.SimulationScreen
	mu   sync.Mutex
	text string
}

func (s *simTerminal) copy(tcell.Screen) {
	s.mu.Lock()
	defer s.mu.Unlock()
	s.text = screenText(s.SimulationScreen)
}

func (s *simTerminal) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.text
}

// screenText is what a simulated terminal shows, one line per row.
func screenText(s tcell.SimulationScreen) string {
	cells, w, _ := s.GetContents()
	var b strings.Builder
	for i, c := range cells {
		if len(c.Runes) == 0 {
			b.WriteByte(' ')
		} else {
			b.WriteString(string(c.Runes))
		}
		if (i+1)%w == 0 {
			b.WriteByte('\n')
		}
	}
	return b.String()
}

// waitFor polls the screen until it shows want.
func waitFor(t *testing.T, s *simTerminal, want string) {
	t.Helper()
	deadline := time.Now().Add(5 * time.Second)
	for time.Now().Before(deadline) {
		if strings.Contains(s.String(), want) {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatalf("screen never showed %q:\n%s", want, s)
}

func TestFeedingTheMeterNeverWaitsForTheScreen(t *testing.T) {
	m := New(Options{Tunings: session.NewTunings(quarterComma(t)), Source: "x"})
	start := time.Now()
	for range 10 * frameBuffer {
		m.OnFrame(session.Frame{})
	}
	if d := time.Since(start); d > time.Second {
		t.Errorf("feeding a stopped meter took %v", d)
	}
	if got := m.dropped.Load(); got != 9*frameBuffer {
		t.Errorf("dropped %d frames, want %d", got, 9*frameBuffer)
	}
}

func TestMeterOnATerminalShowsTheNoteAndAnswersKeys(t *testing.T) {
	scr := &simTerminal{SimulationScreen: tcell.NewSimulationScreen("UTF-8")}
	tunings := session.NewTunings(quarterComma(t))
	m := New(Options{Tunings: tunings, Source: "test tones", Screen: scr.SimulationScreen,
		Sound: openSound(t), SoundLevel: -18, Caution: "caution: keep it low"})
	m.drawn = scr.copy
	done := make(chan error, 1)
	go func() { done <- m.Run(context.Background()) }()
	for i := range 50 {
		tm := float64(i) * 0.01
		m.OnFrame(session.Frame{
			Estimate: pitchdetect.Estimate{Time: tm, Hz: gFlat4, Voiced: true, Confidence: 1, Level: -20},
			Holding:  true, Held: pitchdetect.Held{End: tm, Hz: gFlat4},
		})
	}
	// The lesser diesis 128/125 = 41.06 ¢ and F♯4 = 346.91 Hz (fSharp4) below: ¼-comma's definition, see view_test.go.
	waitFor(t, scr, "F♯4 is 41.1 ¢ sharp ▲ · sits on G♭4")

	scr.InjectKey(tcell.KeyRight, 0, tcell.ModNone)
	waitFor(t, scr, "G major")
	if got := tunings.Get().Key.Pretty(); got != "G major" {
		t.Errorf("the session's tuning is %s after →", got)
	}
	scr.InjectKey(tcell.KeyRune, 'd', tcell.ModNone)
	waitFor(t, scr, "drone: G3 at −18 dBFS")
	waitFor(t, scr, "caution: keep it low")
	scr.InjectKey(tcell.KeyRune, ' ', tcell.ModNone)
	waitFor(t, scr, "reference: F♯4 at 346.91 Hz")
	scr.InjectKey(tcell.KeyRune, 't', tcell.ModNone)
	waitFor(t, scr, "1/6-comma meantone")
	scr.InjectKey(tcell.KeyRune, '?', tcell.ModNone)
	waitFor(t, scr, "fifthline meter — keys")
	scr.InjectKey(tcell.KeyEscape, 0, tcell.ModNone)
	waitFor(t, scr, "from ET")

	scr.InjectKey(tcell.KeyRune, 'q', tcell.ModNone)
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("Run after q: %v", err)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("q did not stop the meter")
	}
}
