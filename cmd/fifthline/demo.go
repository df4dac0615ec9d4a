package main

import (
	"errors"
	"math"

	"fifthline/capture"
	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

// demoRate is the sample rate the demo performance is rendered at.
const demoRate = 48000

func runDemo(e *env, args []string) error {
	fs := newFlags("demo")
	mf := addMusicalFlags(fs)
	// The meter reads the demo in the tuning its score is written for
	// unless the flags say otherwise.
	for name, v := range map[string]*string{"key": &mf.key, "temperament": &mf.temperament, "a4": &mf.a4} {
		def := map[string]string{"key": demoScore.key, "temperament": demoScore.temperament, "a4": demoScore.a4}[name]
		*v = def
		fs.Lookup(name).DefValue = def
	}
	mf.defaultsFrom = "the demo's score"
	jf := addJournalFlags(fs)
	sf := addSoundFlags(fs)
	sf.addDroneFlag(fs)
	oldName(fs, "drone-level", "level")
	ascii := addScreenFlags(fs)
	group := fs.Bool("group", false, "the group meter, fed by a consort of four players on four channels")
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("demo takes no arguments (got %q)", pos[0])
	}
	if err := sf.check(); err != nil {
		return err
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	if err := sf.droneOnMeter(e.stderr, map[bool]string{true: "--group"}[*group]); err != nil {
		return err
	}
	score, err := demoTuning()
	if err != nil {
		return err
	}
	e, j, restore, err := startHearing(e, jf)
	if err != nil {
		return err
	}
	defer restore()
	opts := session.Options{Name: "demo", Tunings: session.NewTunings(tu)}
	if *group {
		seventh, _ := mf.seventhRatio() // tuning() has checked it
		err = playersMeter(e.ctx, newConsort(score), opts.Tunings, consortPlayers(seventh), j, meterSource{name: "the demo consort", journal: jf.log, ascii: *ascii})
	} else {
		src := capture.NewPerformance(demoRate, demoScoreTones(score), true)
		err = runMeter(e.ctx, src, opts, j, meterSource{name: "the demo performance", journal: jf.log, sound: newMeterSound(sf), ascii: *ascii})
	}
	if err = errors.Join(stopped(err), j.close()); err == nil {
		mf.say(e.stderr, tu)                       // the screen showed it; this keeps it in the terminal
		sayHeard(e.stderr, source.InputStats{}, j) // a performance loses no sound
	}
	return err
}

// demoScoreTones turns the demo score into the tones of capture's
// synthetic voice: each note at its target in the score's tuning, moved by
// the player's cents. Nothing is played aloud; the voice only feeds the
// meter.
func demoScoreTones(tu target.Tuning) []capture.Tone {
	return scoreTones(demoScore.notes, demoScore.bpm, tu)
}

// scoreTones are a score's notes as tones at bpm beats a minute.
func scoreTones(notes []scoreNote, bpm float64, tu target.Tuning) []capture.Tone {
	beat := 60 / bpm
	var tones []capture.Tone
	for _, sn := range notes {
		t := capture.Tone{Seconds: sn.beats * beat, Gain: demoGain}
		note, err := target.ParseNote(sn.note)
		if sn.note == "" || err != nil { // rests; the score is ours and parses
			t.Rest = true
		} else {
			t.Hz = tu.Target(note) * math.Exp2(sn.cents/1200)
		}
		if sn.vibrato {
			t.VibratoCents, t.VibratoHz = demoVibratoCents, demoVibratoHz
		}
		tones = append(tones, t)
	}
	return tones
}

// The demo voice: half the synthesiser's full level (peaks below -12 dBFS)
// and a singer's vibrato, ±12 ¢ at 5.5 Hz, on the long notes.
const (
	demoGain         = 0.5
	demoVibratoCents = 12
	demoVibratoHz    = 5.5
)
