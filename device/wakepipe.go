package device

import (
	"fmt"
	"os"
	"sync/atomic"
	"syscall"
	"time"
	"unsafe"

	"golang.org/x/sys/unix"
)

// wakePipe is how an audio callback written in C wakes a Go goroutine: the
// callback writes a byte to w (non-blocking) and the goroutine sleeps in
// Wait. Waiting takes no thread: the read end is non-blocking and sits in
// Go's poller.
type wakePipe struct {
	r           *os.File
	rc          syscall.RawConn // r's, for the raw read
	w           int             // the write end, for the C side
	buf         []byte
	interrupted atomic.Bool
}

// newWakePipe opens a pipe.
func newWakePipe() (*wakePipe, error) {
	var fds [2]int
	if err := unix.Pipe2(fds[:], unix.O_NONBLOCK|unix.O_CLOEXEC); err != nil {
		return nil, fmt.Errorf("wake-up pipe: %w", err)
	}
	r := os.NewFile(uintptr(fds[0]), "audio wake-up")
	rc, err := r.SyscallConn()
	if err != nil {
		r.Close()
		unix.Close(fds[1])
		return nil, fmt.Errorf("wake-up pipe: %w", err)
	}
	return &wakePipe{r: r, rc: rc, w: fds[1], buf: make([]byte, 64)}, nil
}

// Wait sleeps until a wake-up byte or the deadline (os.ErrDeadlineExceeded;
// a zero deadline waits for ever) and takes the bytes waiting. The
// non-blocking read is a raw system call on purpose: an ordinary one, made
// while every Go thread was idle, wakes Go's monitor thread, which then
// polls every 20 µs for as long as the work that follows runs (measured: a
// sixth of listen's CPU).
func (p *wakePipe) Wait(deadline time.Time) error {
	_ = p.r.SetReadDeadline(deadline)
	if p.interrupted.Load() { // after the deadline is set: see Interrupt
		return os.ErrDeadlineExceeded
	}
	buf := unsafe.Pointer(&p.buf[0])
	return p.rc.Read(func(fd uintptr) bool {
		_, _, errno := unix.RawSyscall(unix.SYS_READ, fd, uintptr(buf), uintptr(len(p.buf)))
		return errno != unix.EAGAIN
	})
}

// Interrupt makes a Wait in progress, and every later one, return at once
// with os.ErrDeadlineExceeded. A Wait that set its own deadline just after
// this one's still sees the flag, set first.
func (p *wakePipe) Interrupt() {
	p.interrupted.Store(true)
	_ = p.r.SetReadDeadline(time.Now())
}

// Close closes both ends; only once the C side can no longer write, so it
// cannot write to a reused descriptor.
func (p *wakePipe) Close() {
	p.r.Close()
	unix.Close(p.w)
}
