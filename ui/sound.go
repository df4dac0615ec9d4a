package ui

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"fifthline/target"
)

// Sound plays the meter's drone and reference tones; the meter itself
// plays nothing, it only asks. The methods are called on the screen's
// goroutine and return promptly; an error (no output device) is shown on
// the status line and the meter carries on listening.
type Sound interface {
	// SetDrone sounds a drone on the fundamentals (hertz), replacing any;
	// nil fades it out.
	SetDrone(hz []float64) error
	// Reference sounds one tone at hz for ReferenceSeconds.
	Reference(hz float64) error
	// Partials are the frequencies sounding now, nil while silent.
	Partials() []float64
	// Lost is why the output stopped playing (its device went away), or
	// nil; the next SetDrone or Reference tries the device again.
	Lost() error
}

// ReferenceSeconds is how long the reference key sounds a note's target.
const ReferenceSeconds = 1.5

// onDroneHz is how near a drone partial a held pitch counts as on it: the
// canceller's notch there is about as wide, so such a reading comes from
// the player's other partials.
const onDroneHz = 0.1

// droneChoice is the drone the drone key has chosen.
type droneChoice int

// The drone key cycles through these in order.
const (
	droneOff droneChoice = iota
	droneTonic
	droneTonicFifth
	droneStates
)

// Next is the drone the next press of the drone key gives.
func (d droneChoice) Next() droneChoice { return (d + 1) % droneStates }

// droneNotes are the notes drone d sounds in the tuning: the key's tonic in
// octave 3 and, for DroneTonicFifth, the fifth above it (G3 and D4).
func droneNotes(tu target.Tuning, d droneChoice) []target.Note {
	if d == droneOff {
		return nil
	}
	tonic := tu.Key.Tonic
	tonic.Octave = 3
	notes := []target.Note{tonic}
	if d == droneTonicFifth {
		notes = append(notes, tonic.Transpose(target.Interval{Fifths: 1}))
	}
	return notes
}

// droneHz are the fundamentals drone d sounds: its notes' targets.
func droneHz(tu target.Tuning, d droneChoice) []float64 {
	var hz []float64
	for _, n := range droneNotes(tu, d) {
		hz = append(hz, tu.Target(n))
	}
	return hz
}

// droneWords names drone d's notes, "G3+D4", or "off".
func droneWords(tu target.Tuning, d droneChoice) string {
	var s []string
	for _, n := range droneNotes(tu, d) {
		s = append(s, n.Pretty())
	}
	if len(s) == 0 {
		return "off"
	}
	return strings.Join(s, "+")
}

// soundState is what the model knows of the meter's sound.
type soundState struct {
	HasSound   bool        // the meter can ask for sound (Options.Sound is set)
	Drone      droneChoice // the drone chosen
	SoundLevel float64     // the output's peak ceiling, dBFS
	Caution    string      // the hearing caution shown while anything sounds
	// SoundError is the last failure to play ("" once sound plays again).
	SoundError string
	Sounding   []float64 // partials sounding now, polled from Sound

	droneHz  []float64 // what the drone was last asked to sound
	refUntil float64   // stream time the last reference tone ends
}

// OnDrone tells whether the held (or last) note's pitch sits on a partial
// that the meter's own sound is playing.
func (m *model) OnDrone() bool {
	return m.HasHeld && slices.ContainsFunc(m.Sounding, func(f float64) bool { return math.Abs(f-m.Held.Hz) <= onDroneHz })
}

// sounding tells whether anything plays or is about to: the caution shows.
func (m *model) sounding() bool {
	return m.Drone != droneOff || m.Now < m.refUntil || len(m.Sounding) > 0
}

// StartDrone sounds the tonic and fifth on s, as the drone key's second
// press does: the meter started with its drone on (listen --drone).
func (m *model) StartDrone(s Sound) { m.setDrone(s, droneTonicFifth, true) }

// CycleDrone moves the drone to its next state on s and says what it did.
func (m *model) CycleDrone(s Sound) { m.setDrone(s, m.Drone.Next(), true) }

// Retune keeps a sounding drone on the tuning's targets after a key has
// changed it; an unchanged drone is left alone.
func (m *model) Retune(s Sound) {
	if m.Drone != droneOff && !slices.Equal(droneHz(m.Tuning, m.Drone), m.droneHz) {
		m.setDrone(s, m.Drone, false)
	}
}

func (m *model) setDrone(s Sound, d droneChoice, say bool) {
	if s == nil {
		m.Say("no sound here")
		return
	}
	hz := droneHz(m.Tuning, d)
	if err := s.SetDrone(hz); err != nil {
		m.SoundFailed(err)
		m.Say("no sound: " + err.Error())
		return
	}
	m.Drone, m.droneHz, m.SoundError = d, hz, ""
	if say {
		m.Say("drone " + droneWords(m.Tuning, d))
	}
}

// SoundFailed records that sound could not play, or stopped: the drone is
// off and the status line says why until sound plays again.
func (m *model) SoundFailed(err error) {
	m.Drone, m.droneHz, m.SoundError = droneOff, nil, err.Error()
}

// SoundReference sounds the held (or last) note's target briefly on s.
func (m *model) SoundReference(s Sound) {
	r, ok := m.Reading()
	switch {
	case s == nil:
		m.Say("no sound here")
	case !ok:
		m.Say("no note yet: hold one, then ask for its target")
	default:
		if err := s.Reference(r.TargetHz); err != nil {
			m.SoundError = err.Error()
			m.Say("no sound: " + err.Error())
			return
		}
		m.SoundError, m.refUntil = "", m.Now+ReferenceSeconds
		m.Say(fmt.Sprintf("reference: %s at %.2f Hz", r.Written.Pretty(), r.TargetHz))
	}
}

// soundLine is the sound's state on the status line: "drone: G3+D4 at
// −18 dBFS", "drone: off", or why nothing can play. Empty without sound.
func soundLine(m *model) screenLine {
	switch {
	case !m.HasSound:
		return nil
	case m.SoundError != "":
		return screenLine{text("no sound: "+m.SoundError, warn)}
	case m.Drone == droneOff:
		return dimLine("drone: off")
	}
	return plain(fmt.Sprintf("drone: %s at %s dBFS", droneWords(m.Tuning, m.Drone), minus(fmt.Sprintf("%g", m.SoundLevel))))
}

// cautionLines are the hearing caution, wrapped to w columns, while
// anything sounds or is about to; none otherwise.
func cautionLines(m *model, w int) []screenLine {
	if !m.HasSound || !m.sounding() || m.Caution == "" {
		return nil
	}
	var out []screenLine
	line := ""
	for _, word := range strings.Fields(m.Caution) {
		if line != "" && len([]rune(line+" "+word)) > w {
			out = append(out, screenLine{text(line, lit)})
			line = ""
		}
		if line != "" {
			line += " "
		}
		line += word
	}
	return append(out, screenLine{text(line, lit)})
}
