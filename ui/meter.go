package ui

import (
	"context"
	"os"
	"slices"
	"sync"
	"sync/atomic"
	"time"

	"github.com/gdamore/tcell/v2"
	"github.com/rivo/tview"

	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

// frameRate caps how often the meter redraws: smooth enough for the trace,
// slower than the eye reads the numbers, and a quarter cheaper than 20
// (measured: listen with the meter, 4.5 % -> 4.1 % of a core).
const frameRate = 15

// frameBuffer is how many analysis frames may wait for the screen (about
// three seconds at the detector's default hop); beyond it frames are
// dropped and counted, so the listening loop never waits for the screen.
const frameBuffer = 256

// Options configure a Meter.
type Options struct {
	Tunings *session.Tunings // the keys change it; the session reads it
	Source  string           // what is heard, for the screen: a device name
	// Stats reports the input's health; nil for sources without a device.
	Stats func() source.InputStats
	// Journal reports the journal's state ("journal: FILE, N notes"); nil
	// shows "journal: off".
	Journal func() string
	// Screen is where to draw; nil means the terminal.
	Screen tcell.Screen
	// Sound plays the drone and reference keys' sound; nil: no sound keys.
	Sound Sound
	// SoundLevel is Sound's peak ceiling in dBFS, for the status line.
	SoundLevel float64
	// Caution is the hearing caution shown while Sound plays.
	Caution string
	// Drone starts the meter with the drone of the tonic and fifth
	// sounding on Sound, as if d had been pressed twice.
	Drone bool
	// ASCII writes ## and bb for accidentals and ASCII marks, for
	// terminals whose locale is not UTF-8 (ASCIILocale) or on request.
	ASCII bool
	// Group, when set, makes the meter a group meter with one row per
	// name (at most MaxRows), fed by OnGroupFrame.
	Group []string
	// Doubles: the group's rows may be marked doubled (voices on one
	// microphone), so the strips leave room for the mark from the start
	// rather than narrowing whenever a voice is doubled.
	Doubles bool
	// Seventh is the just ratio a chord's minor seventh is read against;
	// 0 means target.DefaultSeventh.
	Seventh float64
}

// Meter is the live screen. Feed it from session.Run with OnFrame and
// OnNote (both return at once, from any goroutine) and run it with Run.
type Meter struct {
	opt     Options
	start   target.Tuning
	frames  chan session.Frame
	notes   chan session.Event
	dropped atomic.Uint64
	ended   atomic.Bool
	quit    chan struct{}
	once    sync.Once
	model   *model      // touched only on tview's goroutine once Run starts
	group   *groupModel // nil for one player; shares model
	groupFr chan GroupFrame
	// nudge asks for a redraw at once: a long window's group frame came
	// (see OnGroupFrame). nil for one player.
	nudge   chan struct{}
	period  time.Duration      // between periodic redraws: time.Second / frameRate
	drawn   func(tcell.Screen) // tests: called on tview's goroutine after each draw
	closing bool               // tview's goroutine: the screen is being let go
}

// New makes a meter for the tuning opt.Tunings holds.
func New(opt Options) *Meter {
	tu := opt.Tunings.Get()
	model := newModel(tu, opt.Source)
	model.HasSound, model.SoundLevel, model.Caution = opt.Sound != nil, opt.SoundLevel, opt.Caution
	model.ASCII = opt.ASCII
	m := &Meter{
		opt: opt, start: tu,
		frames: make(chan session.Frame, frameBuffer),
		notes:  make(chan session.Event, frameBuffer),
		quit:   make(chan struct{}),
		model:  model,
		period: time.Second / frameRate,
	}
	if opt.Group != nil {
		m.group = newGroupModel(model, opt.Group[:min(len(opt.Group), MaxRows)], opt.Seventh)
		m.group.Doubles = opt.Doubles
		m.groupFr = make(chan GroupFrame, frameBuffer)
		m.nudge = make(chan struct{}, 1)
	}
	return m
}

// MaxRows is the most rows a group meter shows: one digit key each.
const MaxRows = 9

// OnGroupFrame hands a group meter one moment of the group without
// waiting (f.Hz is copied): if the screen has fallen behind, the frame is
// dropped and counted. A meter made without Options.Group ignores it.
//
// A long window's frame (f.Span > 0: one microphone's voices, every 85 ms)
// is drawn at once rather than at the next periodic redraw, which held it
// back by up to 1/frameRate (67 ms) on the way to naming a chord; while
// such frames come they draw the screen, about 12 times a second, and the
// periodic redraw waits.
func (m *Meter) OnGroupFrame(f GroupFrame) {
	if m.group == nil {
		return
	}
	f.Hz, f.Levels = slices.Clone(f.Hz), slices.Clone(f.Levels)
	select {
	case m.groupFr <- f:
	default:
		m.dropped.Add(1)
	}
	if f.Span > 0 {
		select {
		case m.nudge <- struct{}{}:
		default: // a redraw is asked for already
		}
	}
}

// screen is the whole screen for w × h cells: the group's or one player's.
func (m *Meter) screen(w, h int) []screenLine {
	if m.group != nil {
		return groupLayout(m.group, w, h)
	}
	return layout(m.model, w, h)
}

// OnFrame hands the meter one analysis frame without waiting: if the screen
// has fallen behind, the frame is dropped and counted.
func (m *Meter) OnFrame(f session.Frame) {
	select {
	case m.frames <- f:
	default:
		m.dropped.Add(1)
	}
}

// OnNote hands the meter a finished note without waiting. It never fails.
func (m *Meter) OnNote(ev session.Event) error {
	select {
	case m.notes <- ev:
	default:
		m.dropped.Add(1)
	}
	return nil
}

// Ended tells the meter its source has finished; it stays up until quit.
func (m *Meter) Ended() { m.ended.Store(true) }

// Stop closes the meter from any goroutine; Run returns.
func (m *Meter) Stop() { m.once.Do(func() { close(m.quit) }) }

// Run shows the meter until q (or Ctrl-C) is pressed, Stop is called or ctx
// ends.
func (m *Meter) Run(ctx context.Context) error {
	app := tview.NewApplication()
	if m.opt.Screen != nil {
		app.SetScreen(m.opt.Screen)
	} else if err := terminalPresent(); err != nil {
		return err
	}
	var paint painter
	var screen tcell.Screen
	root := &view{Box: tview.NewBox(), draw: func(s tcell.Screen, x, y, w, h int) {
		screen = s
		paint.paint(s, m.screen(w, h), x, y, w, h, true)
		if m.drawn != nil {
			m.drawn(s)
		}
	}}
	// The periodic redraw: new frames in, changed cells out.
	redraw := func() {
		m.drain()
		if screen == nil || m.closing {
			return // tview has not drawn yet, or has let the terminal go
		}
		paint.paint(screen, m.screen(paint.w, paint.h), paint.x, paint.y, paint.w, paint.h, false)
		screen.Show()
		if m.drawn != nil {
			m.drawn(screen)
		}
	}
	if m.opt.Drone {
		m.model.StartDrone(m.opt.Sound) // before tview's goroutine reads the model
	}
	app.SetRoot(root, true)
	app.SetInputCapture(func(ev *tcell.EventKey) *tcell.EventKey { return m.key(app, ev) })

	// Stop from inside tview's loop: called before Run has made its
	// screen, app.Stop would do nothing and the meter would stay up; and
	// once Run has returned, nothing is left to stop.
	stop := func() { app.QueueUpdate(func() { m.close(app) }) }
	done := make(chan struct{})
	go func() {
		tick := time.NewTicker(m.period)
		defer tick.Stop()
		var nudged time.Time
		for {
			select {
			case <-m.nudge: // nil, never ready, for one player
				nudged = time.Now()
				app.QueueUpdate(redraw)
			case <-done:
				return
			case <-ctx.Done():
				stop()
				return
			case <-m.quit:
				stop()
				return
			case <-tick.C:
				if time.Since(nudged) < 2*m.period {
					continue // the frames draw the screen
				}
				app.QueueUpdate(redraw)
			}
		}
	}()
	err := app.Run()
	close(done)
	return err
}

// terminalPresent checks for the terminal tcell draws on, so that a meter
// started without one fails before tview starts.
func terminalPresent() error {
	f, err := os.OpenFile("/dev/tty", os.O_RDWR, 0)
	if err != nil {
		return err
	}
	return f.Close()
}

// drain moves waiting frames and notes into the model; it runs on tview's
// goroutine.
func (m *Meter) drain() {
	for more := true; more; {
		select {
		case f := <-m.frames:
			m.model.AddFrame(f)
		case ev := <-m.notes:
			m.model.AddNote(ev)
		case f := <-m.groupFr: // nil (never ready) for one player
			m.group.AddFrame(f)
		default:
			more = false
		}
	}
	if m.opt.Stats != nil {
		m.model.SetInput(m.opt.Stats())
	}
	if m.opt.Journal != nil {
		m.model.Journal = m.opt.Journal()
	}
	if m.opt.Sound != nil {
		m.model.Sounding = m.opt.Sound.Partials()
		if err := m.opt.Sound.Lost(); err != nil && m.model.SoundError == "" {
			m.model.SoundFailed(err)
		}
	}
	m.model.Dropped = m.dropped.Load()
	m.model.Finished = m.ended.Load()
}

// close stops tview, on its goroutine. Nothing is painted after: tcell
// would still write to a terminal it has given back.
func (m *Meter) close(app *tview.Application) {
	m.closing = true
	app.Stop()
}

// key handles one key press on tview's goroutine.
func (m *Meter) key(app *tview.Application, ev *tcell.EventKey) *tcell.EventKey {
	name := tcell.KeyNames[ev.Key()]
	if ev.Key() == tcell.KeyRune {
		name = string(ev.Rune())
	}
	switch name {
	case "q", "Q":
		m.close(app)
		return nil
	case "?", "h":
		m.model.Help = !m.model.Help
		return nil
	case "Esc":
		m.model.Help = false
		return nil
	case "1", "2", "3", "4", "5", "6", "7", "8", "9":
		if m.group != nil {
			m.group.Toggle(int(name[0] - '1'))
			return nil
		}
	case "d":
		m.model.CycleDrone(m.opt.Sound)
		return nil
	case "s", " ":
		m.model.SoundReference(m.opt.Sound)
		return nil
	}
	for _, b := range bindings {
		for _, k := range b.Keys {
			if k == name {
				tu, msg := b.Act(m.model.Tuning, m.start)
				m.opt.Tunings.Set(tu)
				m.model.Tuning = tu
				m.model.Say(msg)
				m.model.Retune(m.opt.Sound)
				return nil
			}
		}
	}
	return ev // Ctrl-C and the rest: tview's defaults
}

// styles give each role its emphasis; the text already says everything.
var styles = map[role]tcell.Style{
	plainRole: tcell.StyleDefault,
	dim:       tcell.StyleDefault.Dim(true),
	lit:       tcell.StyleDefault.Bold(true),
	other:     tcell.StyleDefault.Underline(true),
	warn:      tcell.StyleDefault.Bold(true).Reverse(true),
}
