package journal

import (
	"bytes"
	"cmp"
	"crypto/rand"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
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

// Open opens the journal at path for appending, creating it with its header
// if missing. It refuses (returns an error) a folder, a missing folder, or a
// file whose first line is not the journal header. A file that cannot be
// written for want of permission or space gives a Writer that logs nothing
// and says why in Status and Close, so the session can go on.
func Open(path string, m Meta) (*Writer, error) {
	if m.Now == nil {
		m.Now = time.Now
	}
	w := &Writer{path: path, meta: m, opened: m.Now()}
	if w.meta.Session == "" {
		w.meta.Session = newSessionID(w.opened)
	}
	w.lastSync = w.opened
	if info, err := os.Stat(path); err == nil && info.IsDir() {
		return nil, fmt.Errorf("journal %s is a folder, not a file", path)
	}
	f, err := os.OpenFile(path, os.O_RDWR|os.O_APPEND|os.O_CREATE, 0o644)
	if err != nil && errors.Is(err, fs.ErrPermission) {
		// A write-only file (no read permission) is still appendable.
		f, err = os.OpenFile(path, os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o644)
	}
	if err != nil {
		if degradable(err) {
			w.tally.fail(fmt.Errorf("cannot open %s: %w", path, unwrapPath(err)))
			return w, nil
		}
		if errors.Is(err, fs.ErrNotExist) {
			// O_CREATE: only the folder can be missing.
			return nil, fmt.Errorf("journal %s: its folder %s does not exist (create it, or name a journal in an existing folder)", path, filepath.Dir(path))
		}
		return nil, fmt.Errorf("journal %s: %v", path, unwrapPath(err))
	}
	w.f = f
	if err := w.prepare(); err != nil {
		w.f = nil
		f.Close()
		if degradable(err) {
			w.tally.fail(fmt.Errorf("cannot write %s: %w", path, unwrapPath(err)))
			return w, nil
		}
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = fmt.Errorf("journal %s: %v", path, pe.Err)
		}
		return nil, err
	}
	w.stop, w.stopped = make(chan struct{}), make(chan struct{})
	go w.syncLoop()
	return w, nil
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

// olderHeader reports whether text starts with the header of a journal
// written before the Later columns.
func olderHeader(text string) bool {
	line, _, ok := strings.Cut(text, "\n")
	_, err := columnIndex(strings.TrimSuffix(line, "\r"))
	return ok && err == nil
}

// headerLine is the header as written, newline included.
func headerLine() string { return strings.Join(Header(), ",") + "\n" }

// prepare checks an existing journal's header and mends a torn last line, or
// writes the header into a new (or non-regular, like a pipe) file.
func (w *Writer) prepare() (err error) {
	info, err := w.f.Stat()
	if err != nil {
		return err
	}
	w.regular = info.Mode().IsRegular()
	head := headerLine()
	if !w.regular || info.Size() == 0 {
		return w.writeAll([]byte(head))
	}
	first := make([]byte, len(head))
	n, err := w.f.ReadAt(first, 0)
	if err != nil && !errors.Is(err, io.EOF) {
		if errors.Is(err, syscall.EBADF) { // opened write-only: trust it
			return nil
		}
		return err
	}
	first = first[:n]
	switch {
	case string(first) == head:
	case info.Size() < int64(len(head)) && strings.HasPrefix(head, string(first)):
		// A header torn while the file was being created: start it afresh.
		if err := w.f.Truncate(0); err != nil {
			return err
		}
		return w.writeAll([]byte(head))
	case olderHeader(string(first)):
		// Rows below a fresh header line carry the newer columns.
		defer func() {
			if err == nil {
				err = w.writeAll([]byte(head))
			}
		}()
	default:
		line, _, _ := strings.Cut(string(first), "\n")
		return fmt.Errorf("journal %s has other columns than a fifthline journal (its first line starts %.40q); give another file", w.path, line)
	}
	last := make([]byte, 1)
	if _, err := w.f.ReadAt(last, info.Size()-1); err != nil {
		return err
	}
	if last[0] != '\n' { // a line torn by a crash: end it so ours starts clean
		return w.writeAll([]byte("\n"))
	}
	return nil
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
	rec = append(rec, x.record()...)
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

func newSessionID(t time.Time) string {
	var b [3]byte
	rand.Read(b[:])
	return t.UTC().Format("20060102T150405Z") + "-" + hex.EncodeToString(b[:])
}

// degradable errors are the disk's, not the user's: the session goes on.
func degradable(err error) bool {
	for _, e := range []error{fs.ErrPermission, syscall.EROFS, syscall.ENOSPC, syscall.EDQUOT, syscall.EIO, syscall.EFBIG} {
		if errors.Is(err, e) {
			return true
		}
	}
	return false
}

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
