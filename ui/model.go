package ui

import (
	"math"

	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

// traceSeconds is how much of the player's recent pitch the trace shows.
const traceSeconds = 4.0

// clipHold is how long a clipping warning stays up after the last clipped
// sample, so that a single loud attack is still seen.
const clipHold = 2.0

// model is what the meter knows at one moment. It holds raw pitches, not
// readings: every reading is made at render time in the current Tuning, so
// the screen never mixes two tunings after a key press.
type model struct {
	Tuning target.Tuning
	Source string // what is being heard: a device name, "demo performance"

	Now     float64 // stream time of the latest frame, seconds
	Voiced  bool    // the latest frame has a pitch
	FrameHz float64
	Level   float64 // latest frame's RMS level, dBFS

	Holding  bool
	Held     held // the note being held, or the last one held
	HasHeld  bool
	Notes    int // held notes finished so far
	Finished bool

	Input   inputState
	Journal string // "journal: off", "journal: FILE, N notes"
	Message string // the last key's effect, shown for messageSeconds
	Help    bool
	ASCII   bool   // write the screen in ASCII (## and bb for accidentals)
	Dropped uint64 // frames the screen could not keep up with
	soundState

	messageAt float64 // stream time Message was set
	heldAt    float64 // stream time of the last frame holding a note
	trace     []tracePoint
	tracedFor string  // the tuning the trace's targets belong to
	clipped   uint64  // clipped samples counted at the last poll
	lastClip  float64 // stream time more were first seen
}

// held is a held note as the meter shows it: its centre pitch and shape.
type held struct {
	Hz                        float64
	Start, End                float64 // stream seconds
	Spread                    float64 // cents
	VibratoWidth, VibratoRate float64 // cents peak to peak, Hz
}

// inputState is the input's health as the status line reports it.
type inputState struct {
	Known              bool // false for sources without device statistics
	PeakDBFS           float64
	Clipping           bool
	Overflows, Dropped uint64
}

type tracePoint struct {
	t, hz float64
	ref   float64 // the held note's centre when the frame came, or 0
	// target is the pitch the point is measured from in the tuning whose
	// fingerprint is the model's tracedFor; 0 until it is classified.
	target float64
}

// newModel starts a model for the tuning, with nothing heard yet.
func newModel(tu target.Tuning, source string) *model {
	return &model{Tuning: tu, Source: source, Level: math.Inf(-1), Journal: "journal: off"}
}

// holdBridge is how long after its last frame a note still shows as held.
const holdBridge = 0.05

// messageSeconds is how long a key's message replaces the keys hint.
const messageSeconds = 4.0

// Say shows a message in place of the keys hint for a few seconds.
func (m *model) Say(msg string) { m.Message, m.messageAt = msg, m.Now }

// AddFrame takes one analysis frame from the session.
func (m *model) AddFrame(f session.Frame) {
	m.Now, m.Voiced, m.Level = f.Time, f.Voiced, f.Level
	m.FrameHz = 0
	if f.Voiced {
		m.FrameHz = f.Hz
	}
	p := tracePoint{t: f.Time, hz: m.FrameHz}
	if f.Holding && f.Held.Hz > 0 {
		m.Held, m.HasHeld = heldOf(f.Held), true
		m.heldAt = f.Time
		p.ref = f.Held.Hz
	}
	// A frame or two of gap inside a note (which the segmenter bridges)
	// should not flicker the screen to "last note".
	m.Holding = f.Holding || (m.HasHeld && f.Time-m.heldAt < holdBridge)
	m.trace = append(m.trace, p)
	// Forget what has scrolled off; reuse the slice's memory.
	cut := 0
	for cut < len(m.trace) && m.trace[cut].t < m.Now-traceSeconds {
		cut++
	}
	if cut > 0 {
		m.trace = append(m.trace[:0], m.trace[cut:]...)
	}
}

// AddNote takes a finished held note: its summary replaces the running one.
func (m *model) AddNote(ev session.Event) {
	m.Held, m.HasHeld = heldOf(ev.Held), true
	m.Notes++
}

func heldOf(h pitchdetect.Held) held {
	return held{Hz: h.Hz, Start: h.Start, End: h.End, Spread: h.Spread, VibratoWidth: h.VibratoWidth, VibratoRate: h.VibratoRate}
}

// SetInput updates the input health from the capture's running statistics.
// Clipping shows while clipped samples keep arriving and for clipHold
// seconds after the last.
func (m *model) SetInput(s source.InputStats) {
	m.Input.Known = true
	m.Input.PeakDBFS = s.PeakDBFS()
	m.Input.Overflows, m.Input.Dropped = s.Overflows, s.DroppedBlocks
	if s.Clipped > m.clipped {
		m.clipped, m.lastClip = s.Clipped, m.Now
	}
	m.Input.Clipping = m.clipped > 0 && m.Now-m.lastClip < clipHold
}

// Reading is the held (or last held) note read in the current tuning; ok is
// false before any note.
func (m *model) Reading() (target.Reading, bool) {
	if !m.HasHeld {
		return target.Reading{}, false
	}
	return m.Tuning.Classify(m.Held.Hz), true
}
