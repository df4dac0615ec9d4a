package main

import (
	"context"
	"fmt"
	"math"
	"slices"
	"time"

	"fifthline/ensemble"
	"fifthline/harmony"
	"fifthline/multipitch"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
	"fifthline/ui"
)

// The group meter: listen --players and --voices without --plain, and
// demo --group. One row per player (or voice) on the screen; every note
// goes to the journal as with --plain. It plays nothing, so it has no
// sound keys.

// playersMeter shows the group meter fed by the players' channels of src
// (package ensemble), until q, the end of ctx, or a failing input.
func playersMeter(ctx context.Context, src source.Multi, tunings *session.Tunings, po playerOptions, j *journalSink, ms meterSource) error {
	if len(po.players) > ui.MaxRows {
		return usagef("the group meter shows up to %d players (a digit key each); for %d, use --plain", ui.MaxRows, len(po.players))
	}
	names := make([]string, len(po.players))
	for i, p := range po.players {
		names[i] = p.Name
	}
	m := groupMeter(names, tunings, po.seventh, false, j, ms)
	defer j.close() // complete before the device is stopped
	frame := groupFrame{tunings: tunings, seventh: po.seventh}
	var journalChord func(ensemble.Chord, target.Tuning) error
	if po.chords {
		journalChord = func(c ensemble.Chord, tu target.Tuning) error {
			po.logChords(j, ms.name, tu, []ensemble.Chord{c}, time.Time{})
			return nil
		}
	}
	// Each note is journaled once its chords are known, spelled from them
	// (heldrows.go).
	chords := po.liveChords(tunings, journalChord, func(pn playerNote) error {
		po.logHeard(j, pn)
		return nil
	})
	chords.rows.told = j.holding
	o := ensemble.Options{Name: ms.name, Players: po.players, Tunings: tunings,
		OnNote: func(n ensemble.Note) error { return chords.note(playerNote{Note: n}) },
		// Run hands every player's frame of a moment in player order.
		OnFrame: func(i int, e pitchdetect.Estimate) {
			frame.add(i, len(names), e.Hz, e.Level, false)
			frame.drift().Frame(i, e)
			chords.frame(i, e)
			if i == len(names)-1 {
				frame.send(m, e.Time)
			}
		},
		OnSounding: chords.sound}
	err := showMeter(ctx, m, func(ctx context.Context) error { return ensemble.Run(ctx, src, o) })
	chords.ready(true) // the chords and notes still open when listening stopped
	return err
}

// voicesMeter shows the group meter fed by the voices heard on src's one
// channel (package multipitch), a row per voice, lowest first.
// FIFTHLINE_TIMING logs the voices read and the input's onsets (timing.go).
func voicesMeter(ctx context.Context, in timedInput, tunings *session.Tunings, vo voiceOptions, j *journalSink, ms meterSource) error {
	names := make([]string, vo.max)
	for i := range names {
		names[i] = fmt.Sprintf("voice %d", i+1)
	}
	timing, err := openTiming(in.SampleRate())
	if err != nil {
		return err
	}
	defer timing.close()
	src := timing.withClockOne(in, "voices")
	m := groupMeter(names, tunings, vo.seventh, true, j, ms) // one microphone: doubled voices
	defer j.close()
	frame := groupFrame{tunings: tunings, seventh: vo.seventh}
	var sounding []float64
	vo.onFrame = func(f multipitch.Frame, partials []bool) {
		timing.voicesFrame(f)
		f.Voices = shownVoices(f.Voices, partials)
		sounding = sounding[:0]
		for _, v := range f.Voices {
			sounding = append(sounding, v.Hz)
		}
		frame.drift().Moment(f.Time, sounding)
		for i := range names {
			hz, level, doubled := 0.0, math.Inf(-1), false
			if i < len(f.Voices) {
				hz, level, doubled = f.Voices[i].Hz, 20*math.Log10(f.Voices[i].Amplitude), f.Voices[i].Doubled
			}
			frame.add(i, len(names), hz, level, doubled)
		}
		frame.span = f.Span // a long window's reading: see ui.GroupFrame
		frame.send(m, f.Time)
	}
	var journalChord func(harmony.Chord, []int, []bool, target.Tuning) error
	if vo.chords {
		journalChord = func(c harmony.Chord, voices []int, _ []bool, tu target.Tuning) error {
			journalVoiceChord(j, ms.name, tu, c, voices)
			return nil
		}
	}
	// Each note is journaled once its chords are known, spelled from them
	// (heldrows.go).
	chords := vo.liveChords(tunings, journalChord, func(n voiceNote) error {
		j.heardRow(n.Event, n.extra(), n.heard)
		return nil
	})
	chords.rows.told = j.holding
	err = showMeter(ctx, m, func(ctx context.Context) error {
		return hearVoices(ctx, src, ms.name, tunings.Get, vo, func(float64) {}, chords.note)
	})
	chords.ready(math.Inf(1), math.Inf(1), nil) // the chords and notes still open when listening stopped
	return err
}

// shownVoices are the voices vs of a frame the meter shows: those the
// tracker takes for a lower voice's partials (partials[i], tracker.partials)
// are left out, as their notes are. Judged frame by frame instead, a flute's
// E5 21 ¢ over a trombone's C3's 5th partial, most of whose frames are
// marked, came and went, and the chord's name with it.
func shownVoices(vs []multipitch.Voice, partials []bool) []multipitch.Voice {
	var shown []multipitch.Voice
	for i, v := range vs {
		if !partials[i] {
			shown = append(shown, v)
		}
	}
	return shown
}

// groupMeter makes the meter with a row per name.
func groupMeter(names []string, tunings *session.Tunings, seventh float64, doubles bool, j *journalSink, ms meterSource) *ui.Meter {
	opt := screenOptions(tunings, j, ms)
	opt.Group, opt.Seventh, opt.Doubles = names, seventh, doubles
	return ui.New(opt)
}

// groupFrame gathers one moment of the group, row by row, and the
// group's drift so far.
type groupFrame struct {
	hz, levels []float64
	span       float64 // seconds each reading covers (ui.GroupFrame.Span)
	doubled    []bool

	tunings *session.Tunings
	seventh float64
	seen    *target.Tuning // the tuning the drift is read against
	drifts  *ensemble.Drift
}

// drift is the group's drift, started afresh when a key changes the
// tuning (a new key or temperament moves every target it is read against).
func (g *groupFrame) drift() *ensemble.Drift {
	if tu, same := g.tunings.Current(&g.seen); !same || g.drifts == nil {
		g.drifts = ensemble.NewDrift(tu, g.seventh)
	}
	return g.drifts
}

func (g *groupFrame) add(i, rows int, hz, level float64, doubled bool) {
	if len(g.hz) != rows {
		g.hz, g.levels, g.doubled = make([]float64, rows), make([]float64, rows), make([]bool, rows)
	}
	g.hz[i], g.levels[i], g.doubled[i] = hz, level, doubled
}

// send hands the moment to the meter (which copies it).
func (g *groupFrame) send(m *ui.Meter, t float64) {
	drift, known := g.drift().Cents()
	m.OnGroupFrame(ui.GroupFrame{Time: t, Hz: g.hz, Levels: g.levels, Doubled: g.doubled, Level: slices.Max(g.levels), Drift: drift, DriftKnown: known, Span: g.span})
}
