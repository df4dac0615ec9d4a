package main

import (
	"cmp"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"slices"
	"strconv"

	"fifthline/capture"
	"fifthline/harmony"
	"fifthline/multipitch"
	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

// analyze --voices: several voices on one channel, read by the multipitch
// estimator, held notes per voice, and with --chords the chords they make.

// voiceFlags are --voices and the chord flags it shares with --players
// (defined here unless the players' code has defined them already).
type voiceFlags struct {
	fs     *flag.FlagSet
	voices string
}

func addVoiceFlags(fs *flag.FlagSet) *voiceFlags {
	vf := &voiceFlags{fs: fs}
	fs.StringVar(&vf.voices, "voices", "", "one channel holding up to N (2-4) voices at once, or auto; notes gain a voice column (1 = lowest)")
	if fs.Lookup("chords") == nil {
		fs.Bool("chords", false, "with --voices or --players: one row per member of each held chord instead of notes")
	}
	addSeventhFlag(fs, new(string))
	return vf
}

func wasSet(fs *flag.FlagSet, name string) bool {
	set := false
	fs.Visit(func(f *flag.Flag) { set = set || f.Name == name })
	return set
}

// voiceOptions are the checked flags.
type voiceOptions struct {
	max     int // most voices at once
	chords  bool
	seventh float64
	// onFrame, if set, sees every frame (the meter), with which of its
	// voices the tracker takes for a lower voice's partials (tracker.partials).
	onFrame func(f multipitch.Frame, partials []bool)
	// onMoment, if set, follows every frame: its time, the earliest a
	// note still to come can start, and the voices' notes still sounding
	// (for the chords heard live).
	onMoment func(at, earliest float64, open []openVoice)
	// left, if set, caps the frames to max voices and keeps what it left
	// out (a file's chords are checked against it); else they are capped
	// alone.
	left *leftOut
}

// options checks the flags; ok is false when --voices was not given.
func (vf *voiceFlags) options() (opt voiceOptions, ok bool, err error) {
	if !wasSet(vf.fs, "voices") {
		if wasSet(vf.fs, "chords") && !wasSet(vf.fs, "players") {
			return opt, false, usagef("--chords needs --voices N|auto (one channel) or --players (one player per channel)")
		}
		return opt, false, nil
	}
	if opt.max, err = parseVoices(vf.voices); err != nil {
		return opt, false, err
	}
	if wasSet(vf.fs, "players") {
		return opt, false, usagef("--voices and --players cannot go together: --voices reads one channel, --players one player per channel")
	}
	opt.chords = vf.fs.Lookup("chords").Value.String() == "true"
	if opt.seventh, err = target.ParseSeventh(vf.fs.Lookup("seventh").Value.String()); err != nil {
		return opt, false, usagef("%v", err)
	}
	return opt, true, nil
}

// parseVoices reads a --voices value: 2, 3 or 4, or auto (up to 4).
func parseVoices(s string) (int, error) {
	if s == "auto" {
		return 4, nil
	}
	n, err := strconv.Atoi(s)
	if err != nil || n < 2 || n > 4 {
		return 0, usagef("--voices %q: give 2, 3 or 4 voices, or auto", s)
	}
	return n, nil
}

// analyzeVoices reads every file's voices and writes their notes (or chord
// rows) ordered by start, voice by voice.
func analyzeVoices(e *env, vo voiceOptions, files []string, tu target.Tuning, opt analyzeOptions, jf *journalFlags) error {
	withFile := len(files) > 1
	head := groupHead(withFile, vo.chords, voiceColumns, voiceChordHeader)
	return analyzeGroup(e, "--voices", files, tu, opt, jf, head, func(path string, out *rowWriter, j *journalSink) (string, bool, error) {
		notes, chords, err := readVoices(e, path, tu, vo, opt, j)
		evs := make([]session.Event, len(notes))
		for k, n := range notes {
			evs[k] = n.Event
		}
		if err == nil {
			opt.warnTuning(e, path, tu, evs)
		}
		if vo.chords {
			for _, row := range chords {
				for _, c := range voiceChordRecords(row, fileColumn(path, withFile), notes) {
					out.write(c.record(withFile), c)
				}
			}
		} else {
			for _, n := range notes {
				out.write(n.record(withFile), n.json(withFile))
			}
		}
		// As --players says it: a chord's just thirds are not the take's
		// drift.
		return eventsDrift(evs, tu, vo.seventh).Words(), notes == nil, err
	})
}

// readVoices hears one file's voices, logging each note at the take's start
// plus its offset; the notes come back ordered by start, then voice, with
// the chords they make when vo.chords asks (logged too, also when
// interrupted).
func readVoices(e *env, path string, tu target.Tuning, vo voiceOptions, opt analyzeOptions, j *journalSink) ([]voiceNote, []harmony.Chord, error) {
	w, err := capture.OpenWAVChannel(path, opt.channel)
	if err = opt.opened(e, path, w, err); err != nil {
		return nil, nil, err
	}
	start := takeStart(opt.recorded, w)
	defer w.Close()
	progress := newProgress(e.stderr, path, w.Duration())
	defer progress.Done()
	var notes []voiceNote
	left := &leftOut{asked: vo.max, record: true}
	vo.left = left
	err = hearVoices(e.ctx, w, path, fixed(tu), vo, progress.At, func(n voiceNote) error {
		notes = append(notes, n)
		return nil
	})
	sortVoiceNotes(notes)
	// The chords spell their members' notes before the notes are journaled.
	chords := left.named(e.stderr, path, chordsOf(notes, tu, vo.seventh), tu, vo.seventh)
	spellVoicesFromChords(notes, chords)
	for _, n := range notes {
		j.row(n.Event, n.extra(), start)
	}
	if !vo.chords {
		chords = nil
	}
	logVoiceChords(j, path, tu, chords, notes, start)
	switch {
	case errors.Is(err, context.Canceled):
		return notes, chords, fmt.Errorf("%s: %w", path, errInterrupted)
	case err != nil:
		return notes, chords, fmt.Errorf("%s: %w", path, err)
	}
	if w.Truncated() {
		fmt.Fprintf(e.stderr, "fifthline: warning: %s is shorter than its header says; read what was there\n", path)
	}
	return notes, chords, nil
}

func sortVoiceNotes(notes []voiceNote) {
	slices.SortStableFunc(notes, func(a, b voiceNote) int {
		return cmp.Or(cmp.Compare(a.Start, b.Start), cmp.Compare(a.voice, b.voice))
	})
}

// hearVoices reads src until it ends or ctx is done, handing each voice's
// held note to emit as it ends (at seconds: how far the reading is). The
// notes still held at the end are finished and handed on too, so an
// interruption loses none; an error from emit stops the reading. Each frame
// and note is read in the tuning then in force (the meter's keys change it).
func hearVoices(ctx context.Context, src source.Source, name string, tuning func() target.Tuning, vo voiceOptions, at func(seconds float64), emit func(voiceNote) error) error {
	rate := src.SampleRate()
	est, err := multipitch.New(rate, 0, 0, multipitch.Config{MaxVoices: heardVoices, Accept: inKey(tuning)})
	if err != nil {
		return err
	}
	left := cmp.Or(vo.left, &leftOut{asked: vo.max})
	hop, window := float64(est.Hop())/rate, float64(est.Window())/rate
	if left.asked < heardVoices { // only a cap that can leave voices out needs to judge them
		left.judge = newTracker(name, tuning, hop, window, func(voiceNote) {})
	}
	keep := reported(tuning)
	var emitErr error
	tr := newTracker(name, tuning, hop, window, func(n voiceNote) {
		if emitErr == nil {
			emitErr = emit(n)
		}
	})
	tr.keepFrames = vo.chords
	tr.most = vo.max
	block := make([]float32, 1024)
	for read := 0; emitErr == nil; {
		if err = ctx.Err(); err != nil {
			break
		}
		n, rerr := src.Read(block)
		read += n
		at(float64(read) / rate)
		est.Feed(block[:n], func(f multipitch.Frame) {
			f.Voices = left.cap(f.Time, keep(f.Voices))
			tr.aside = left.aside
			tr.push(f)
			if vo.onFrame != nil {
				vo.onFrame(f, tr.partials(f.Voices))
			}
			if vo.onMoment != nil {
				earliest, open := tr.moment(f.Time)
				vo.onMoment(f.Time, earliest, open)
			}
		})
		if rerr != nil {
			if !errors.Is(rerr, io.EOF) {
				err = rerr
			}
			break
		}
	}
	tr.flush()
	return cmp.Or(emitErr, err)
}

// fixed is a tuning that stays as it is: a file's, or --plain's.
func fixed(tu target.Tuning) func() target.Tuning { return func() target.Tuning { return tu } }
