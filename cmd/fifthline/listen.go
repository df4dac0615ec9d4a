package main

import (
	"context"
	"encoding/csv"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"slices"
	"time"

	"golang.org/x/sys/unix"

	"fifthline/capture"
	"fifthline/device"
	"fifthline/drone"
	"fifthline/ensemble"
	"fifthline/session"
	"fifthline/source"
	"fifthline/ui"
)

func runListen(e *env, args []string) error {
	fs := newFlags("listen")
	mf := addMusicalFlags(fs)
	jf := addJournalFlags(fs)
	players := addPlayersFlag(fs)
	vf := addVoiceFlags(fs)
	device := fs.String("device", "", "input device: index or part of the name as 'fifthline devices' lists it (default: the system's default input)")
	channel := fs.Int("channel", 1, "input channel to read, counted from 1")
	inputs := fs.Int("input-channels", 0, "how many input channels the interface has, all opened: through a sound server (PulseAudio, PipeWire) a stream with fewer channels than its source is remixed, so give the count when the channels read leave some out; 0 opens up to the highest channel read")
	plain := fs.Bool("plain", false, "no screen: a CSV header, then one line per held note as it ends")
	duration := fs.Duration("duration", 0, "stop cleanly after this long (e.g. 12s, 2m); 0 listens until interrupted")
	sf := addSoundFlags(fs)
	sf.addDroneFlag(fs)
	oldName(fs, "drone-level", "level")
	ascii := addScreenFlags(fs)
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	switch {
	case len(pos) > 0:
		return usagef("listen takes no file arguments (got %q); analyze reads files", pos[0])
	case *channel < 1:
		return usagef("--channel %d: channels are counted from 1", *channel)
	case *duration < 0:
		return usagef("--duration %v is negative", *duration)
	case *inputs < 0:
		return usagef("--input-channels %d: give how many channels the interface has", *inputs)
	}
	if err := sf.check(); err != nil {
		return err
	}
	if err := channelOrPlayers(fs); err != nil {
		return err
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	vo, voices, err := vf.options()
	if err != nil {
		return err
	}
	po, group, err := playersOptions(fs, *players)
	if err != nil {
		return err
	}
	if err := sf.droneOnMeter(e.stderr, withoutDrone(*plain, group, voices)); err != nil {
		return err
	}
	if top := *channel; *inputs > 0 {
		for _, p := range po.players {
			top = max(top, p.Channel+1)
		}
		if *inputs < top {
			return usagef("--input-channels %d opens channels 1 to %d, but channel %d is read: give --input-channels %d or more", *inputs, *inputs, top, top)
		}
	}
	ctx := e.ctx
	if *duration > 0 {
		var cancel context.CancelFunc
		ctx, cancel = context.WithTimeout(ctx, *duration)
		defer cancel()
	}
	e, j, restore, err := startHearing(e, jf)
	if err != nil {
		return err
	}
	defer restore()
	inOpts := capture.InputOptions{Device: *device, Channel: *channel, StreamChannels: *inputs}
	if group {
		inOpts.Channels = po.carried()
	}
	in, err := capture.OpenInput(inOpts)
	if err != nil {
		return errors.Join(tooFewChannels(err, po), j.close())
	}
	opts := session.Options{Name: in.Heard(), Tunings: session.NewTunings(tu)}
	ms := meterSource{name: in.Heard(), stats: in.Stats, journal: jf.log, ascii: *ascii}
	if group && !*plain {
		err = playersMeter(ctx, in, opts.Tunings, po, j, ms)
	} else if voices && !*plain {
		err = voicesMeter(ctx, in, opts.Tunings, vo, j, ms)
	} else if group {
		mf.say(e.stderr, tu)
		err = listenPlayers(ctx, e, in, opts.Name, tu, po, j)
	} else if voices {
		mf.say(e.stderr, tu)
		err = listenVoices(ctx, e, in, opts.Name, tu, vo, j)
	} else if *plain {
		mf.say(e.stderr, tu)
		err = listenPlain(ctx, e, in, opts, j)
	} else {
		// The drone leaks into a microphone: the meter hears the input
		// with the player's partials taken out (nothing while silent).
		sound := newMeterSound(sf)
		src := drone.Cancel(in, nil).Follow(sound)
		ms.sound, ms.hearsSound = sound, true
		err = runMeter(ctx, src, opts, j, ms)
	}
	// Close before reporting, the journal first: it is complete even if a
	// vanished device will not close.
	jerr := j.close()
	heard := in.Stats()
	err = errors.Join(stopped(err), in.Close(), jerr)
	if err == nil && !*plain {
		mf.say(e.stderr, tu) // the screen showed it; this keeps it in the terminal
	}
	if err == nil {
		sayHeard(e.stderr, heard, j)
	}
	return err
}

// tooFewChannels makes an input opened for more channels than it has (its
// sound server's source, where one serves it, counted) the usage error it
// is, in the words a file with too few channels gets; other errors pass.
func tooFewChannels(err error, po playerOptions) error {
	var short *device.ChannelsError
	switch {
	case !errors.As(err, &short):
		return err
	case short.Stream > 0:
		return usagef("%v: give --input-channels %d or fewer", err, short.Has)
	case len(po.players) > 0:
		on := slices.Clone(po.players) // on the interface's channels, as given
		for i, p := range on {
			on[i].Channel = po.channel(p) - 1
		}
		return usagef("%v", ensemble.CheckChannels(on, short.Has, short.Input))
	}
	return usagef("%v: --channel counts from 1 to %d", err, short.Has)
}

// withoutDrone names the listen flag that shows no one-player meter, for
// --drone's usage error; "" where the meter sounds.
func withoutDrone(plain, players, voices bool) string {
	switch {
	case players:
		return "--players"
	case voices:
		return "--voices"
	case plain:
		return "--plain"
	}
	return ""
}

// sayHeard tells, as listening ends, where the notes went and whether any
// sound was lost: the screen that said so is gone, and --plain's rows
// alone cannot tell a gap.
func sayHeard(w io.Writer, st source.InputStats, j *journalSink) {
	if s := j.status(); s != "" {
		fmt.Fprintln(w, "fifthline: "+s)
	}
	if gaps := st.Overflows + st.DroppedBlocks; gaps > 0 {
		fmt.Fprintf(w, "fifthline: %s: notes across a gap may read wrong\n", ui.GapWords(gaps))
	}
}

// beginPlain writes the header of listen --plain's CSV at once, so a
// reader has the columns before the first row, and opens the
// FIFTHLINE_TIMING log (timing.go) for a stream at rate; it gives the
// writer for the rows and the log.
func beginPlain(e *env, head []string, rate float64) (*csv.Writer, *timingLog, error) {
	w := csv.NewWriter(e.stdout)
	w.Write(head)
	w.Flush()
	if err := w.Error(); err != nil {
		return nil, nil, err
	}
	timing, err := openTiming(rate)
	return w, timing, err
}

// listenPlain writes the contract's CSV: a header, then each held note as it
// ends, flushed at once so a reader sees it live and an interruption keeps it.
func listenPlain(ctx context.Context, e *env, src source.Source, opts session.Options, j *journalSink) error {
	w, timing, err := beginPlain(e, session.Header(false), src.SampleRate())
	if err != nil {
		return err
	}
	defer timing.close()
	opts.OnFrame = timing.frame
	opts.OnNote = func(ev session.Event) error {
		j.note(ev)
		w.Write(ev.Record(false))
		w.Flush()
		return w.Error()
	}
	return session.Run(ctx, src, opts)
}

// meterSource is what the meter says about the sound it is fed.
type meterSource struct {
	name    string
	stats   func() source.InputStats // nil without a device
	journal string                   // the --log path, if any
	sound   *meterSound              // the drone and reference keys' sound
	// hearsSound: the source is a microphone that may hear the sound.
	hearsSound bool
	ascii      bool // --ascii: the screen in ASCII whatever the locale
}

// addScreenFlags adds the meter's --ascii flag.
func addScreenFlags(fs *flag.FlagSet) *bool {
	return fs.Bool("ascii", false, "write the screen in ASCII (## and bb for accidentals); the default where the locale is not UTF-8")
}

// runMeter shows the meter fed by src until q, the end of ctx, or a failing
// source. A source that simply ends (the demo) leaves the meter up.
func runMeter(ctx context.Context, src source.Source, opts session.Options, j *journalSink, ms meterSource) error {
	uo := screenOptions(opts.Tunings, j, ms)
	uo.Sound, uo.SoundLevel, uo.Caution = ms.sound, ms.sound.opt.Level, "caution: "+hearingAdvice
	uo.Drone = ms.sound.startDrone
	m := ui.New(uo)
	defer ms.sound.Close() // fades out; the meter has stopped asking
	// Runs before the sound's close: the journal is complete (closing it
	// again later is harmless) before any device is stopped.
	defer j.close()
	opts.OnFrame = func(f session.Frame) {
		if ms.hearsSound && f.Holding && ms.sound.ownNote(heldFor(f.Time-f.Held.Start)) {
			f.Holding = false
		}
		m.OnFrame(f)
	}
	opts.OnNote = func(ev session.Event) error {
		if ms.hearsSound && ms.sound.ownNote(heldFor(ev.Held.End-ev.Held.Start)) {
			return nil
		}
		j.note(ev)
		return m.OnNote(ev)
	}
	return showMeter(ctx, m, func(ctx context.Context) error { return session.Run(ctx, src, opts) })
}

// screenOptions are the meter's options for ms, with the journal's state
// from j on the screen (and so not on stderr).
func screenOptions(tunings *session.Tunings, j *journalSink, ms meterSource) ui.Options {
	j.quiet = true // the screen shows the journal's state instead
	return ui.Options{Tunings: tunings, Source: ms.name, Stats: ms.stats, Journal: func() string { return j.screenStatus(ms.journal) },
		ASCII: ms.ascii || ui.ASCIILocale()}
}

// showMeter runs hear (which feeds m) while m is on the screen, until q,
// the end of ctx, or a failing hear; a hear that simply ends leaves the
// meter up.
func showMeter(ctx context.Context, m *ui.Meter, hear func(context.Context) error) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	done := make(chan error, 1)
	go func() {
		defer func() {
			// As run does for the main goroutine: a bug ends in one line.
			if r := recover(); r != nil {
				m.Stop()
				done <- fmt.Errorf("internal error: %v", r)
			}
		}()
		err := hear(ctx)
		if err == nil {
			m.Ended()
		} else {
			m.Stop()
		}
		done <- err
	}()
	uerr := m.Run(ctx)
	cancel()
	serr := <-done
	if uerr != nil {
		// Not joined with serr: the cancellation it carries would read as
		// a deliberate stop.
		return fmt.Errorf("the meter needs a terminal (%v); without one, fifthline listen --plain writes lines instead", uerr)
	}
	return serr
}

func heldFor(seconds float64) time.Duration { return time.Duration(seconds * float64(time.Second)) }

// stopped treats a deliberate stop (Ctrl-C, SIGTERM, --duration, q) as
// success: what was heard has been written.
func stopped(err error) error {
	if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
		return nil
	}
	return err
}

// startHearing readies a command that hears notes: the audio libraries
// muted (see muteLibraries) and the journal open. restore unmutes.
func startHearing(e *env, jf *journalFlags) (*env, *journalSink, func(), error) {
	quiet, restore, err := muteLibraries(e)
	if err != nil {
		return nil, nil, nil, err
	}
	j, err := jf.open(quiet)
	if err != nil {
		restore()
		return nil, nil, nil, err
	}
	return quiet, j, restore, nil
}

// muteLibraries silences file descriptor 2 for the whole session, so that
// PortAudio's and ALSA's chatter reaches neither the screen nor a terminal
// shared with --plain output, and returns an env whose stderr still reaches
// the user for our own messages. restore undoes it.
func muteLibraries(e *env) (*env, func(), error) {
	quiet := *e
	var keep *os.File
	if e.stderr == os.Stderr {
		fd, err := unix.Dup(2)
		if err != nil {
			return nil, nil, err
		}
		keep = os.NewFile(uintptr(fd), "stderr")
		quiet.stderr = keep
	}
	restore, err := device.MuteStderr()
	if err != nil {
		keep.Close() // nil-safe
		return nil, nil, err
	}
	return &quiet, func() {
		restore()
		keep.Close()
	}, nil
}
