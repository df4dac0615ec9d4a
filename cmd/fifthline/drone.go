package main

import (
	"flag"
	"fmt"
	"strings"
	"time"
	"unicode"

	"fifthline/drone"
	"fifthline/playback"
	"fifthline/target"
)

func runDrone(e *env, args []string) error {
	fs := newFlags("drone")
	mf := addMusicalFlags(fs)
	notes := fs.String("notes", "", "spelled notes to sound, comma-separated (or space-separated), e.g. G3,D4 (default: the key's tonic in octave 3 and the fifth above)")
	duration := fs.Duration("duration", 0, "stop after this long, e.g. 30s (default: until Ctrl-C)")
	sf := addSoundFlags(fs)
	oldName(fs, "device", "output")
	timbre := choiceFlag(fs, "timbre", "the drone's sound", "reed", "pure", "string")
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("drone takes no arguments (got %q); give the notes with --notes", pos[0])
	}
	if err := sf.check(); err != nil {
		return err
	}
	if *duration < 0 {
		return usagef("--duration %v is negative", *duration)
	}
	tb, err := drone.ParseTimbre(*timbre)
	if err != nil {
		return usagef("--timbre: %v", err)
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	var given *string // nil: the tonic and fifth
	fs.Visit(func(f *flag.Flag) {
		if f.Name == "notes" {
			given = notes
		}
	})
	hz, names, err := droneTargets(tu, given)
	if err != nil {
		return err
	}
	p, err := playback.NewPlayer(playback.Options{Device: sf.output, Level: sf.level, Timbre: tb})
	if err != nil {
		return err
	}
	// Said before any sound, after the device has opened (silently), so a
	// device error stays the only line.
	mf.say(e.stderr, tu)
	fmt.Fprintln(e.stderr, droneCaution(sf.level))
	fmt.Fprintf(e.stderr, "fifthline: drone %s (%s) on %q · %s; Ctrl-C stops\n", names, hzList(hz), p.Device().Name, tu)
	p.SetDrone(hz)
	var timeout <-chan time.Time
	if *duration > 0 {
		timeout = time.After(*duration)
	}
	// The device going away ends the drone with a one-line error.
	check := time.NewTicker(250 * time.Millisecond)
	defer check.Stop()
	for {
		select {
		case <-e.ctx.Done():
			return p.Close() // fades out before it stops
		case <-timeout:
			return p.Close()
		case <-check.C:
			if lost := p.Lost(); lost != nil {
				_ = p.Close()
				return lost
			}
		}
	}
}

// droneTargets reads --notes and finds each note's target in the tuning;
// without --notes (list nil), the tonic in octave 3 and the fifth above it.
func droneTargets(tu target.Tuning, list *string) (hz []float64, names string, err error) {
	if list == nil {
		tonic := tu.Key.Tonic
		tonic.Octave = 3
		both := tonic.String() + "," + tonic.Transpose(target.Interval{Fifths: 1}).String()
		list = &both
	}
	var spelled []string
	// Commas or spaces: "G3 D4" is as plain a list to a player as "G3,D4".
	for _, s := range strings.FieldsFunc(*list, func(r rune) bool { return r == ',' || unicode.IsSpace(r) }) {
		n, err := target.ParseNote(s)
		if err != nil {
			return nil, "", usagef("--notes: %v", err)
		}
		hz = append(hz, tu.Target(n))
		spelled = append(spelled, n.String())
	}
	if len(hz) == 0 {
		return nil, "", usagef("--notes: give the spelled notes to sound, e.g. --notes G3,D4")
	}
	return hz, strings.Join(spelled, " "), nil
}

func hzList(hz []float64) string {
	s := make([]string, len(hz))
	for i, f := range hz {
		s[i] = fmt.Sprintf("%.3f Hz", f)
	}
	return strings.Join(s, ", ")
}

// droneCaution is the hearing caution drone gives before it sounds: the
// level, the cap no --level can pass, and the quiet start.
func droneCaution(level float64) string {
	return fmt.Sprintf("fifthline: caution: %s; peak level %g dBFS (never above %g), fading in", hearingAdvice, level, playback.MaxLevel)
}
