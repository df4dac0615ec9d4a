package capture

/*
#include "ring.h"
*/
import "C"

import (
	"sync/atomic"
	"unsafe"

	"github.com/gordonklaus/portaudio"
)

// OutputRing carries rendered sound from one goroutine (the only writer) to
// an output stream's C callback (the only reader), which plays silence for
// whatever has not been rendered in time. The writer sleeps in a WakePipe's
// Wait until the callback finds fewer than the low mark waiting.
type OutputRing struct{ q *ring }

// NewOutputRing holds capacity interleaved samples of channels channels;
// the callback wakes a writer waiting on wake when fewer than low remain.
func NewOutputRing(capacity, low, channels int, wake *WakePipe) (*OutputRing, error) {
	q, err := allocRing(capacity, channels, wake.W)
	if err != nil {
		return nil, err
	}
	q.c.low = C.int64_t(low)
	return &OutputRing{q}, nil
}

// OpenOutputStream opens p's output playing from o (the callback is C);
// the caller starts it.
func OpenOutputStream(p portaudio.StreamParameters, o *OutputRing) (*CStream, error) {
	return openStream(p, o.q)
}

// Cap is the ring's size in samples.
func (o *OutputRing) Cap() int { return len(o.q.buf) }

// Fill is how many samples wait to be played.
func (o *OutputRing) Fill() int {
	return int(atomic.LoadInt64(o.q.counter(&o.q.c.w)) - o.Played())
}

// Played is how many samples the callback has taken so far.
func (o *OutputRing) Played() int64 { return atomic.LoadInt64(o.q.counter(&o.q.c.r)) }

// Write appends p, which must fit (len(p) ≤ Cap − Fill).
func (o *OutputRing) Write(p []float32) {
	w := atomic.LoadInt64(o.q.counter(&o.q.c.w))
	size := int64(len(o.q.buf))
	for i, v := range p {
		o.q.buf[(w+int64(i))%size] = v
	}
	atomic.StoreInt64(o.q.counter(&o.q.c.w), w+int64(len(p)))
}

// Waiting tells the callback the writer will sleep unless the ring has room.
func (o *OutputRing) Waiting(on bool) { o.q.waiting(on) }

// Started says the ring has been filled once: from now on, a callback that
// finds too little counts as an underrun.
func (o *OutputRing) Started() { atomic.StoreInt32((*int32)(unsafe.Pointer(&o.q.c.started)), 1) }

// Underruns counts callbacks that played silence for want of samples.
func (o *OutputRing) Underruns() uint64 {
	return atomic.LoadUint64((*uint64)(unsafe.Pointer(&o.q.c.underruns)))
}

// take runs the callback's work, for tests.
func (o *OutputRing) take(out []float32, frames int) {
	C.fl_ring_take(o.q.c, (*C.float)(unsafe.Pointer(&out[0])), C.ulong(frames))
}
