package capture

import "sync/atomic"

// ring hands samples from the PortAudio callback (the only writer) to the
// reading goroutine (the only reader) without locks, so the callback never
// waits. The counters only grow; their difference is the fill.
type ring struct {
	buf    []float32
	w, r   atomic.Uint64
	notify chan struct{} // a token after each write, for a waiting reader
}

func newRing(capacity int) *ring {
	return &ring{buf: make([]float32, capacity), notify: make(chan struct{}, 1)}
}

// write stores all of p or, when there is not room for all of it, none,
// so a block is either delivered whole or counted as dropped.
func (q *ring) write(p []float32) bool {
	w, r := q.w.Load(), q.r.Load()
	if uint64(len(q.buf))-(w-r) < uint64(len(p)) {
		return false
	}
	for i, v := range p {
		q.buf[(w+uint64(i))%uint64(len(q.buf))] = v
	}
	q.w.Store(w + uint64(len(p)))
	select {
	case q.notify <- struct{}{}:
	default: // a token is already waiting
	}
	return true
}

// read moves up to len(p) samples out and says how many.
func (q *ring) read(p []float32) int {
	w, r := q.w.Load(), q.r.Load()
	n := int(min(uint64(len(p)), w-r))
	for i := range n {
		p[i] = q.buf[(r+uint64(i))%uint64(len(q.buf))]
	}
	q.r.Store(r + uint64(n))
	return n
}
