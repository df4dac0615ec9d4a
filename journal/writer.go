package journal

import (
	"bytes"
	"cmp"
	"encoding/csv"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"strconv"
	"strings"
	"sync"
	"time"

	"fifthline/session"
)

// Sync policy: a line is written (handed to the kernel) as each note ends,
// so killing the process loses nothing already written; fsync after this
// many notes, or within this long of a note (a background tick), and on
// Close, bounds what a power cut can take.
const (
	syncEvery = 8
	syncAfter = 5 * time.Second
)

// errNotOpen stands in when the journal could not be opened: the opening
// failure is already kept and is the one reported.
var errNotOpen = errors.New("journal not open")

// Meta is what a session says about itself in every line.
type Meta struct {
	Player  string
	Session string           // empty: a fresh id from the opening time
	Now     func() time.Time // empty: time.Now; tests pin the clock
}

// Writer appends held notes to a journal file. It is safe for one writer
// goroutine and any number of Status callers. A disk that refuses (full,
// read-only, gone) does not stop the session: the failure is kept, shown by
// Status, counted, and returned by Close.
type Writer struct {
	path    string
	meta    Meta
	opened  time.Time
	regular bool

	mu       sync.Mutex // the file: held through a write or an fsync
	f        *os.File
	run      runClock
	torn     bool // the last write stopped mid-line
	unsynced int
	lastSync time.Time

	tally tally // what Status shows, never waiting on the disk

	stop, stopped chan struct{} // the background sync's
}

// tally counts notes and chords and keeps the first failure.
type tally struct {
	sync.Mutex
	written, lost int
	chords        int // chords whose membership rows were written
	err           error
}

// count records one row written (err nil) or lost, and returns the first
// failure so far. A chord's membership rows are counted as one chord, not
// as notes (a musician reading "8 notes" after a four-note chord would
// look for four notes that were never played).
func (t *tally) count(err error, x Extra) error {
	t.Lock()
	defer t.Unlock()
	switch {
	case err != nil:
		t.lost++
		t.err = cmp.Or(t.err, err)
	case x.HeardChord == "":
		t.written++
	case x.Reference:
		t.chords++
	}
	return t.err
}

// fail keeps the first failure without counting a note.
func (t *tally) fail(err error) {
	t.Lock()
	defer t.Unlock()
	t.err = cmp.Or(t.err, err)
}

func (t *tally) get() (written, lost int, err error) {
	t.Lock()
	defer t.Unlock()
	return t.written, t.lost, t.err
}

// heard is how many chords' rows were written.
func (t *tally) heard() int {
	t.Lock()
	defer t.Unlock()
	return t.chords
}

// syncLoop saves written lines to disk when notes stop coming for a while.
func (w *Writer) syncLoop() {
	defer close(w.stopped)
	tick := time.NewTicker(syncAfter)
	defer tick.Stop()
	for {
		select {
		case <-w.stop:
			return
		case <-tick.C:
			w.mu.Lock()
			if w.f != nil && w.unsynced > 0 {
				w.sync(w.meta.Now())
			}
			w.mu.Unlock()
		}
	}
}

// Write appends one held note, handed to the kernel before it returns. On a
// disk failure the note is counted as lost and the error is returned (and
// kept for Status and Close); later notes are still tried, so the journal
// resumes if the disk comes back.
func (w *Writer) Write(ev session.Event) error { return w.write(ev, Extra{}, w.now(ev)) }

// now places a note heard now on the journal's clock (see runClock).
func (w *Writer) now(ev session.Event) func() time.Time { return w.heardAt(ev, time.Time{}) }

// WriteAt appends one held note of a recording that began at start (a
// take's recording time): the note's time is start plus its offset in the
// recording, whenever it is analysed. Otherwise it is Write.
func (w *Writer) WriteAt(ev session.Event, start time.Time) error {
	return w.WriteExtra(ev, Extra{}, start)
}

func seconds(s float64) time.Duration { return time.Duration(s * float64(time.Second)) }

// write appends the row at the time at gives, under the lock.
func (w *Writer) write(ev session.Event, x Extra, at func() time.Time) error {
	w.mu.Lock()
	defer w.mu.Unlock()
	if w.f == nil {
		return w.tally.count(errNotOpen, x)
	}
	line := w.line(ev, x, at())
	if w.torn {
		line = append([]byte("\n"), line...)
	}
	if err := w.writeAll(line); err != nil {
		return w.tally.count(fmt.Errorf("cannot write %s: %w", w.path, unwrapPath(err)), x)
	}
	w.tally.count(nil, x)
	w.unsynced++
	if now := w.meta.Now(); w.unsynced >= syncEvery || now.Sub(w.lastSync) >= syncAfter {
		w.sync(now)
	}
	return nil
}

// writeAll writes b in one call (O_APPEND keeps lines whole between
// processes) and remembers whether a failure left a partial line.
func (w *Writer) writeAll(b []byte) error {
	n, err := w.f.Write(b)
	w.torn = err != nil && n > 0 && b[n-1] != '\n'
	if err == nil {
		w.torn = false
	}
	return err
}

func (w *Writer) sync(now time.Time) {
	w.unsynced, w.lastSync = 0, now
	if err := w.f.Sync(); err != nil && w.regular {
		w.tally.fail(fmt.Errorf("cannot save %s to disk: %w", w.path, unwrapPath(err)))
	}
}

// line formats the event, played at the given time, as one CSV line of
// Header().
func (w *Writer) line(ev session.Event, x Extra, at time.Time) []byte {
	tu := ev.Tuning
	chord, temperament := "", ""
	if tu.Chord != nil {
		chord = tu.Chord.String()
		// A declared 7 or m7 tunes its seventh at --seventh: notes read
		// against 16/9 and 7/4 are different tunings, and report keeps
		// them apart by this column.
		if f := tu.Chord.SeventhFraction(); f != "" {
			chord += " (seventh " + f + ")"
		}
	}
	if tu.Temperament != nil {
		temperament = tu.Temperament.Spec()
	}
	player := w.meta.Player
	if ev.Player != "" {
		player = ev.Player // one of several players heard at once
	}
	rec := append([]string{
		at.Round(time.Millisecond).Format(TimeLayout), // rounded, as start_s is
		w.meta.Session, ev.Source, player, tu.Key.String(), temperament,
		strconv.FormatFloat(tu.A4, 'f', -1, 64), tu.Transpose.Name, chord,
	}, ev.Record(false)...)
	rec = append(append(rec, x.record()...), tu.Anchored().String())
	for i, f := range rec { // one physical line per note, whatever a name holds
		rec[i] = oneLine.Replace(f)
	}
	var b bytes.Buffer
	cw := csv.NewWriter(&b)
	cw.Write(rec)
	cw.Flush()
	return b.Bytes()
}

// Status is one line for a meter: where the notes go, or why they do not.
// It never waits for the disk.
func (w *Writer) Status() string {
	written, lost, err := w.tally.get()
	if err != nil {
		return fmt.Sprintf("journal: %v — %d not logged", err, lost)
	}
	what := howMany(written, "note")
	if chords := w.tally.heard(); chords > 0 {
		what += ", " + howMany(chords, "chord")
	}
	return fmt.Sprintf("journal: %s → %s", what, w.path)
}

// Err is the first failure, or nil.
func (w *Writer) Err() error {
	_, _, err := w.tally.get()
	return err
}

// Close syncs and closes the file. It reports any failure during the
// session, with how many notes were not logged.
func (w *Writer) Close() error {
	if w.stop != nil {
		close(w.stop)
		<-w.stopped
		w.stop = nil
	}
	w.mu.Lock()
	defer w.mu.Unlock()
	if w.f != nil {
		w.sync(w.meta.Now())
		if err := w.f.Close(); err != nil {
			w.tally.fail(fmt.Errorf("cannot close %s: %w", w.path, unwrapPath(err)))
		}
		w.f = nil
	}
	if written, lost, err := w.tally.get(); err != nil {
		return fmt.Errorf("journal: %v (%d of %d notes not logged)", err, lost, lost+written)
	}
	return nil
}

var oneLine = strings.NewReplacer("\r", " ", "\n", " ")

// unwrapPath drops the *PathError's "open /x:" prefix when we name the path
// ourselves.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// howMany is n things, the noun singular for one.
func howMany(n int, noun string) string {
	if n != 1 {
		noun += "s"
	}
	return fmt.Sprintf("%d %s", n, noun)
}
