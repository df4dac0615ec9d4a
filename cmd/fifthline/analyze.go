package main

import (
	"context"
	"errors"
	"fmt"
	"slices"
	"strings"
	"sync"

	"fifthline/capture"
	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

type analyzeOptions struct {
	format       string
	frames       bool
	channel      int
	channelAsked bool // --channel given: no note on which channel is read
	recorded     recordedFlag
	sayTuning    func() // once: before a warning, or at the end (an error stays the only line)
	seventh      string // --seventh as given ("16/9" by default), for the chord table's title
	whence       string // where the tuning came from, for a table's title (musicalFlags.whence)
	keyGiven     bool   // --key or a tuning file set the key: the fit keeps it (tuningWarning)
}

// errInterrupted: Ctrl-C or SIGTERM stopped the reading; what was heard
// before it is written.
var errInterrupted = errors.New("interrupted; the notes before it are written")

func runAnalyze(e *env, args []string) error {
	fs := newFlags("analyze")
	mf := addMusicalFlags(fs)
	var opt analyzeOptions
	format := choiceFlag(fs, "format", "what to print", "csv", "table", "json")
	fs.BoolVar(&opt.frames, "frames", false, "print the frame track (time_s,hz,confidence…) instead of held notes")
	fs.IntVar(&opt.channel, "channel", 1, "channel to read, counted from 1")
	fs.Var(&opt.recorded, "recorded", "when the take was played (2026-11-24, 19:30 on the file's own date, \"2026-11-24 19:30\" or RFC 3339), for the journal; with several files, each began then; default: each file's Broadcast Wave bext time, else its modification time")
	jf := addJournalFlags(fs)
	players := addPlayersFlag(fs)
	vf := addVoiceFlags(fs)
	files, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("analyze needs at least one recording (WAV, FLAC, MP3…)")
	}
	if opt.channel < 1 {
		return usagef("--channel %d: channels count from 1", opt.channel)
	}
	if err := channelOrPlayers(fs); err != nil {
		return err
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	opt.format, opt.channelAsked, opt.seventh = *format, wasSet(fs, "channel"), strings.TrimSpace(mf.seventh)
	opt.keyGiven, opt.whence = mf.origin["key"] != fromDefault, mf.whence()
	opt.sayTuning = sync.OnceFunc(func() { mf.say(e.stderr, tu) })
	if po, ok, err := playersOptions(fs, *players); err != nil {
		return err
	} else if ok && !wasSet(fs, "voices") {
		return analyzePlayers(e, po, files, tu, opt, jf)
	}
	if vo, ok, err := vf.options(); err != nil {
		return err
	} else if ok {
		return analyzeVoices(e, vo, files, tu, opt, jf)
	}
	var out eventWriter
	if opt.frames {
		out = newFrameWriter(e.stdout, opt.format, len(files) > 1, tableTitle(tu.String(), opt.whence))
	} else {
		out = newNoteWriter(e.stdout, opt.format, len(files) > 1, opt.whence)
	}
	j, err := jf.open(e)
	if err != nil {
		return err
	}
	for i, path := range files {
		if tb, ok := out.(interface{ beginTake(string) }); ok {
			tb.beginTake(path) // its summary line, notes or none
		}
		if err := analyzeFile(e, path, tu, opt, out, j); err != nil {
			if i > 0 || errors.Is(err, errInterrupted) {
				out.Close() // what was heard before still reaches stdout
			}
			return errors.Join(err, j.close())
		}
	}
	if err := errors.Join(out.Close(), j.close()); err != nil {
		return err
	}
	opt.sayTuning()
	return nil
}

// groupHead is the header of the rows of several notes at once: the note
// rows' with columns, or with chords the chord rows' (chordHead).
func groupHead(withFile, chords bool, columns []string, chordHead func(withFile bool) []string) []string {
	if chords {
		return chordHead(withFile)
	}
	return append(session.Header(withFile), columns...)
}

// analyzeGroup is analyze of several notes at once (flag: --players,
// --voices): take reads one file, writes its rows under head and gives
// the table's drift line for it, whether it heard no note, and why it
// stopped. What was heard before an interruption or a failure is written
// all the same; a first file that would not open writes nothing at all.
func analyzeGroup(e *env, flag string, files []string, tu target.Tuning, opt analyzeOptions, jf *journalFlags, head []string, take func(path string, out *rowWriter, j *journalSink) (drift string, none bool, err error)) error {
	if opt.frames {
		return usagef("--frames and %s cannot go together: the frame track is one pitch per moment", flag)
	}
	j, err := jf.open(e)
	if err != nil {
		return err
	}
	out := newRowWriter(e.stdout, opt.format, head)
	if opt.format == "table" {
		title := tu.String()
		if slices.Contains(head, "just_cents") {
			// The seventh's from-just cents mean nothing without its just.
			title += " · sevenths against " + opt.seventh
		}
		out.title = tableTitle(title, opt.whence) // as the one-voice table's
	}
	var drifts []string // the table's line per take
	for i, path := range files {
		drift, none, err := take(path, out, j)
		drifts = append(drifts, path+": "+drift)
		// A first take that would not open writes nothing; one interrupted,
		// even before a note (a group's take is read twice, its first
		// minute learnt first), still gives the CSV header.
		if err != nil && i == 0 && none && !errors.Is(err, errInterrupted) {
			return errors.Join(err, j.close())
		}
		if err != nil {
			return errors.Join(err, out.close(), j.close())
		}
	}
	opt.sayTuning()
	return errors.Join(out.close(), tableLines(e, opt.format, drifts), j.close())
}

func analyzeFile(e *env, path string, tu target.Tuning, opt analyzeOptions, out eventWriter, j *journalSink) error {
	w, err := capture.OpenRecording(path, opt.channel)
	if err = opt.opened(e, path, w, err); err != nil {
		return err
	}
	defer w.Close()
	start := takeStart(opt.recorded, w)
	var heard []session.Event // for the checks at the take's end
	progress := newProgress(e.stderr, path, w.Duration())
	defer progress.Done()
	src := &countingSource{Source: w, progress: progress}
	err = session.Run(e.ctx, src, session.Options{
		Name:    path,
		Tunings: session.NewTunings(tu),
		OnFrame: func(f session.Frame) { out.Frame(path, f) },
		OnNote: func(ev session.Event) error {
			j.noteAt(ev, start)
			heard = append(heard, ev)
			return out.Note(ev)
		},
	})
	if errors.Is(err, context.Canceled) {
		return fmt.Errorf("%s: %w", path, errInterrupted)
	}
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if w.Truncated() {
		fmt.Fprintf(e.stderr, "fifthline: warning: %s is shorter than its header says; read what was there\n", path)
	}
	opt.warnTuning(e, path, tu, heard)
	return nil
}

// warnTuning says on stderr, after the tuning line, when a take's notes do
// not fit the tuning (tuningWarning): one player's take and a group's alike,
// since a forgotten --a4 415 reads a whole consort a semitone off.
func (opt analyzeOptions) warnTuning(e *env, path string, tu target.Tuning, heard []session.Event) {
	if msg := tuningWarning(path, tu, heard, opt.keyGiven); msg != "" {
		opt.sayTuning()
		fmt.Fprintf(e.stderr, "fifthline: %s\n", msg)
	}
}

// countingSource reports how far through a file the reading is.
type countingSource struct {
	source.Source
	progress *progress
	read     int64
}

func (c *countingSource) Read(p []float32) (int, error) {
	n, err := c.Source.Read(p)
	c.read += int64(n)
	c.progress.At(float64(c.read) / c.SampleRate())
	return n, err
}

// opened checks a recording just opened for one channel: a channel past
// the file's is the same slip as --players naming one, a usage error (exit
// 2); a group's multichannel take read on its first channel alone is said
// on stderr, with the flags that read the others.
func (opt analyzeOptions) opened(e *env, path string, w *capture.Recording, err error) error {
	if errors.Is(err, capture.ErrNoChannel) {
		return usagef("%v", err)
	}
	if err != nil {
		return err
	}
	if n := w.Channels(); n > 2 && !opt.channelAsked {
		fmt.Fprintf(e.stderr, "fifthline: %s has %d channels; reading channel 1 (--channel N reads another, --players one player per channel)\n", path, n)
	}
	return nil
}
