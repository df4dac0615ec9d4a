package journal

import (
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"time"
)

// Opening a journal: what is refused (a folder, another program's CSV),
// what is mended (a torn header or last line, an older header), and the
// disk's failures a session goes on through without a journal.

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
