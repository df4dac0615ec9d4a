package main

// The rehearsal journal for the commands that hear notes (listen, demo,
// analyze). Wiring, in three steps:
//
//	jf := addJournalFlags(fs)             // registers --log FILE and --player NAME
//	...parseFlags...
//	j, err := jf.open(e)                  // never nil; a no-op without --log
//	if err != nil { return err }          // e.g. the file is not a journal
//	defer ... j.close() ...               // return its error: notes not logged
//	opt.OnNote = func(ev session.Event) error { j.note(ev); return otherSink(ev) }
//
// A recording's notes go through j.noteAt(ev, start) instead, so each is
// logged at the take's start plus its offset (see takeStart).
//
// j.note never stops the session: if the disk refuses, the first failure is
// printed once to stderr (set j.quiet = true under a full-screen meter) and
// j.status() says so in one line for the screen; j.close() returns it so the
// command ends with exit 1 after the meter is gone.

import (
	"flag"
	"fmt"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"fifthline/journal"
	"fifthline/session"
	"fifthline/target"
)

type journalFlags struct{ log, player string }

func addJournalFlags(fs *flag.FlagSet) *journalFlags {
	jf := &journalFlags{}
	fs.StringVar(&jf.log, "log", "", "append each held note to this rehearsal journal (CSV; created with its header if missing)")
	fs.StringVar(&jf.player, "player", "", "who is playing, written into the journal")
	return jf
}

// journalSink is an open journal, or nothing when --log was not given.
type journalSink struct {
	w      *journal.Writer
	e      *env
	quiet  bool // do not print the first failure (a screen shows status)
	warned sync.Once
	held   atomic.Int64 // notes heard, not yet written (holding)
}

func (jf *journalFlags) open(e *env) (*journalSink, error) {
	j := &journalSink{e: e}
	if jf.log == "" {
		return j, nil
	}
	w, err := journal.Open(jf.log, journal.Meta{Player: jf.player})
	if err != nil {
		return nil, err
	}
	j.w = w
	j.warnIfFailed()
	return j, nil
}

// note logs one held note heard now; it never fails the session.
func (j *journalSink) note(ev session.Event) { j.noteAt(ev, time.Time{}) }

// noteAt logs one held note of a recording that began at start (zero: now,
// as note does); it never fails the session.
func (j *journalSink) noteAt(ev session.Event, start time.Time) { j.row(ev, journal.Extra{}, start) }

// row logs one row with its trailing columns (see journal.Extra); start as
// for noteAt.
func (j *journalSink) row(ev session.Event, x journal.Extra, start time.Time) {
	if j.w == nil {
		return
	}
	j.w.WriteExtra(ev, x, start)
	j.warnIfFailed()
}

// heardRow logs one row of a note heard live whose end was heard at heard,
// written later (journal.Writer.WriteHeard).
func (j *journalSink) heardRow(ev session.Event, x journal.Extra, heard time.Time) {
	if j.w == nil {
		return
	}
	j.w.WriteHeard(ev, x, heard)
	j.warnIfFailed()
}

// chord logs a heard chord's memberships, one row per member, as the chord
// ends (start as for noteAt). who names member i's player and voice.
func (j *journalSink) chord(source string, tu target.Tuning, from, to float64, c target.HeardChord, who func(i int) (player string, at journal.Extra), start time.Time) {
	for i, m := range c.Members {
		player, at := who(i)
		ev, x := journal.Membership(source, player, tu, from, to, c, m)
		x.Voice, x.Channel = at.Voice, at.Channel
		j.row(ev, x, start)
	}
}

func (j *journalSink) warnIfFailed() {
	if err := j.w.Err(); err != nil && !j.quiet {
		j.warned.Do(func() { fmt.Fprintf(j.e.stderr, "fifthline: warning: journal: %v — going on without it\n", err) })
	}
}

// status is one line for a screen; empty without --log.
func (j *journalSink) status() string {
	if j.w == nil {
		return ""
	}
	return j.w.Status()
}

// holding says how many notes heard are not yet written: a group's note is
// written once the chords it sounds in are known (heldrows.go).
func (j *journalSink) holding(n int) { j.held.Store(int64(n)) }

// screenStatus is status for a screen: the file's base name (the screen
// is narrow), and the notes heard but not yet written, which a count of
// written notes alone would hide.
func (j *journalSink) screenStatus(path string) string {
	s := j.status()
	if s == "" {
		return "journal: off"
	}
	s = strings.Replace(s, path, filepath.Base(path), 1)
	if n := j.held.Load(); n > 0 {
		s += fmt.Sprintf(" · %d more to come", n)
	}
	return s
}

// close saves the journal and reports any notes it could not log.
func (j *journalSink) close() error {
	if j.w == nil {
		return nil
	}
	return j.w.Close()
}
