package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"fifthline/drone"
	"fifthline/playback"
	"fifthline/ui"
)

// hearingAdvice is the hearing caution (team rule 4) every command that
// plays sound gives before the sound starts.
const hearingAdvice = "keep your headphone or speaker volume low and stop at once if it hurts"

// checkLevelFlag refuses a level above playback's limit, as a usage error
// naming the limit, before anything plays.
func checkLevelFlag(flag string, dbfs float64) error {
	if err := playback.CheckLevel(dbfs); err != nil {
		return usagef("%s %g dBFS is above the %g dBFS limit (hearing safety)", flag, dbfs, playback.MaxLevel)
	}
	return nil
}

// soundFlags choose where and how loud the meter's drone and reference
// tones play.
type soundFlags struct {
	level  float64
	output string
	drone  bool // --drone: the meter starts with its drone on
}

func addSoundFlags(fs *flag.FlagSet) *soundFlags {
	f := &soundFlags{}
	f.level = playback.DefaultLevel
	fs.Var((*dbfs)(&f.level), "level", fmt.Sprintf("peak of everything fifthline sounds together (drone, reference tone), in dBFS, at most %g", playback.MaxLevel))
	fs.StringVar(&f.output, "output", "", "output device for the sound: index or part of the name as 'fifthline devices' lists it (default: the system's default output)")
	return f
}

// dbfs is a level flag in dBFS. The unit may follow the number ("-20dB",
// "-20 dBFS"), as a level is written on a mixer, and the minus sign may be
// the typeset one (−20).
type dbfs float64

func (d *dbfs) String() string { return strconv.FormatFloat(float64(*d), 'g', -1, 64) }
func (d *dbfs) Get() any       { return float64(*d) }

func (d *dbfs) Set(s string) error {
	s = strings.ReplaceAll(strings.TrimSpace(s), "−", "-")
	for _, unit := range []string{"dbfs", "db"} {
		if n := len(s) - len(unit); n > 0 && strings.EqualFold(s[n:], unit) {
			s = strings.TrimSpace(s[:n])
			break
		}
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(x) {
		return errors.New("parse error") // withHint says what the flag takes
	}
	*d = dbfs(x)
	return nil
}

func (f *soundFlags) check() error { return checkLevelFlag("--level", f.level) }

// addDroneFlag adds the meter's --drone (listen, demo; the drone command
// sounds anyway).
func (f *soundFlags) addDroneFlag(fs *flag.FlagSet) {
	fs.BoolVar(&f.drone, "drone", false, "start the meter with the drone on the tonic and fifth (d cycles it), fading in at --level")
}

// droneOnMeter checks --drone against what the command shows: only the
// one-player meter sounds (the group meter plays nothing, --plain has no
// keys to stop it with). It gives the hearing caution before any sound.
func (f *soundFlags) droneOnMeter(w io.Writer, without string) error {
	switch {
	case !f.drone:
		return nil
	case without != "":
		return usagef("--drone sounds with the meter of one player, not with %s ('fifthline drone' plays beside anything)", without)
	}
	fmt.Fprintln(w, droneCaution(f.level))
	return nil
}

// meterSound is the meter's drone and reference tones on an output device
// opened at the first key press that asks for sound, so a machine without
// one still listens. It is the meter's ui.Sound.
type meterSound struct {
	opt    playback.Options
	open   sync.Mutex // held while the device opens, on the screen's goroutine
	player atomic.Pointer[playback.Player]
	lost   sync.WaitGroup // closing players whose device went away
	// The last reference tone's time, wall clock in Unix nanoseconds, with
	// referenceSettle after it.
	refFrom, refTo atomic.Int64
	startDrone     bool // the meter starts with the drone on (--drone)
}

func newMeterSound(f *soundFlags) *meterSound {
	// The drone and the reference share the level, so that both together
	// reach it and the limiter never has to act.
	return &meterSound{opt: playback.Options{Device: f.output, Level: f.level, Timbre: drone.Reed, ShareWithReference: true}, startDrone: f.drone}
}

// get opens the player if it is not open yet. A failure is returned and
// tried again at the next press (a device may have been plugged in).
func (s *meterSound) get() (*playback.Player, error) {
	s.open.Lock()
	defer s.open.Unlock()
	if p := s.player.Load(); p != nil {
		if p.Lost() == nil {
			return p, nil
		}
		// Its device went away: let it go (closing a lost stream aborts
		// it) and try the device afresh.
		s.player.Store(nil)
		s.lost.Go(func() { _ = p.Close() })
	}
	p, err := playback.NewPlayer(s.opt)
	if err != nil {
		return nil, err
	}
	s.player.Store(p)
	return p, nil
}

// SetDrone sounds a drone on the fundamentals; nil fades it out (and opens
// nothing).
func (s *meterSound) SetDrone(hz []float64) error {
	if hz == nil && s.player.Load() == nil {
		return nil
	}
	p, err := s.get()
	if err == nil {
		p.SetDrone(hz)
	}
	return err
}

// Reference sounds hz for the meter's reference time.
func (s *meterSound) Reference(hz float64) error {
	p, err := s.get()
	if err == nil {
		now := time.Now()
		s.refFrom.Store(now.UnixNano())
		s.refTo.Store(now.Add(referenceTime + referenceSettle).UnixNano())
		p.Reference(hz, referenceTime)
	}
	return err
}

const referenceTime = time.Duration(ui.ReferenceSeconds * float64(time.Second))

// referenceSettle covers the output's latency and the canceller's settling
// after a reference tone: a brief tone's edges are harder to take out than
// a drone's slow fades.
const referenceSettle = 500 * time.Millisecond

// ownNote tells whether a note that began `since` ago and lasts until now
// lies within a reference tone's time. Such a note is the meter hearing its
// own tone's edges (or the player humming along while listening), not a
// note played: the meter shows and keeps the notes before it instead. A
// note held from before the tone, or on past it, is the player's.
func (s *meterSound) ownNote(since time.Duration) bool {
	now := time.Now()
	return now.Add(-since).UnixNano() >= s.refFrom.Load() && now.UnixNano() <= s.refTo.Load()
}

// Partials are what sounds now; nil before the device opens. It never
// waits for the device to open: the listening goroutine calls it.
func (s *meterSound) Partials() []float64 {
	if p := s.player.Load(); p != nil && p.Lost() == nil {
		return p.Partials()
	}
	return nil
}

// Lost is why the open player's output stopped, or nil.
func (s *meterSound) Lost() error {
	if p := s.player.Load(); p != nil {
		return p.Lost()
	}
	return nil
}

// Fading reports whether the drone or reference is fading (drone.Sounder).
func (s *meterSound) Fading() bool {
	p := s.player.Load()
	return p != nil && p.Fading()
}

// Close fades out whatever sounds and closes the device, if it opened.
func (s *meterSound) Close() error {
	s.open.Lock()
	defer s.open.Unlock()
	// A lost player still closing holds stderr muted: wait for it, so the
	// command's last word is seen.
	defer s.lost.Wait()
	if p := s.player.Swap(nil); p != nil {
		return p.Close()
	}
	return nil
}
