package capture

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

import (
	"errors"
	"math"
	"runtime"
	"sync/atomic"
	"unsafe"
)

// ring hands samples between PortAudio's audio thread (in C: see ring.h for
// why) and one goroutine without locks, so the audio thread never waits:
// for an input the audio thread writes and the goroutine reads; for an
// output (OutputRing) the other way round. Its memory is C's and is freed
// when the ring is no longer reachable, so no reader can outlive it.
type ring struct {
	c   *C.fl_ring
	buf []float32 // c's samples, seen from Go
}

// newRing makes a ring of capacity samples that keeps one channel
// (counted from 0) of callbacks' interleaved frames; a writer wakes a
// waiting reader through the pipe fd (-1: none).
func newRing(capacity, channels, channel, fd int) (*ring, error) {
	q, err := allocRing(capacity, channels, fd)
	if err != nil {
		return nil, err
	}
	q.c.channel, q.c.clip = C.int32_t(channel), C.float(ClipLevel)
	return q, nil
}

// allocRing makes a ring of capacity samples in C memory, freed once the
// ring is unreachable, for callbacks of channels interleaved channels.
func allocRing(capacity, channels, fd int) (*ring, error) {
	c := C.fl_ring_new(C.int64_t(capacity), C.int(channels), C.int(fd))
	if c == nil {
		return nil, errors.New("no memory for the audio buffer")
	}
	q := &ring{c: c, buf: unsafe.Slice((*float32)(unsafe.Pointer(c.buf)), capacity)}
	runtime.AddCleanup(q, func(c *C.fl_ring) { C.fl_ring_free(c) }, c)
	return q, nil
}

// write stores all of p or, when there is not room for all of it, none,
// so a block is either delivered whole or counted as dropped. The audio
// thread writes in C; this is the same code, for tests.
func (q *ring) write(p []float32) bool {
	if len(p) == 0 {
		return true
	}
	return C.fl_ring_write(q.c, (*C.float)(unsafe.Pointer(&p[0])), C.int64_t(len(p))) != 0
}

// read moves up to len(p) samples out and says how many.
func (q *ring) read(p []float32) int {
	w, r := atomic.LoadInt64(q.counter(&q.c.w)), atomic.LoadInt64(q.counter(&q.c.r))
	n := int(min(int64(len(p)), w-r))
	size := int64(len(q.buf))
	for i := range n {
		p[i] = q.buf[(r+int64(i))%size]
	}
	atomic.StoreInt64(q.counter(&q.c.r), r+int64(n))
	return n
}

// waiting tells the audio thread that the goroutine will sleep on the pipe
// unless it finds samples (or room) first; the audio thread clears it when
// it sends the wake-up.
func (q *ring) waiting(on bool) {
	v := int32(0)
	if on {
		v = 1
	}
	atomic.StoreInt32((*int32)(unsafe.Pointer(&q.c.waiting)), v)
}

func (q *ring) counter(p *C.int64_t) *int64 { return (*int64)(unsafe.Pointer(p)) }

// stats reads the writer's counters.
func (q *ring) stats() InputStats {
	u := func(p *C.uint64_t) uint64 { return atomic.LoadUint64((*uint64)(unsafe.Pointer(p))) }
	return InputStats{
		Blocks:         u(&q.c.blocks),
		Overflows:      u(&q.c.overflows),
		DroppedBlocks:  u(&q.c.dropped),
		DroppedSamples: u(&q.c.dropped_samples),
		Peak:           math.Float32frombits(atomic.LoadUint32((*uint32)(unsafe.Pointer(&q.c.peak_bits)))),
		Clipped:        u(&q.c.clipped),
	}
}

// blocks is how many callbacks have delivered.
func (q *ring) blocks() uint64 { return atomic.LoadUint64((*uint64)(unsafe.Pointer(&q.c.blocks))) }

// lastBlock is when the writer last delivered, in Unix nanoseconds.
func (q *ring) lastBlock() int64 { return atomic.LoadInt64(q.counter(&q.c.last_ns)) }

// deliver runs the audio thread's work on one callback's buffer of
// interleaved frames, for benchmarks.
func (q *ring) deliver(buf []float32, frames int) {
	C.fl_ring_deliver(q.c, (*C.float)(unsafe.Pointer(&buf[0])), C.ulong(frames), 0)
}

// markDelivery sets the time of the last delivery, Unix nanoseconds.
func (q *ring) markDelivery(ns int64) { atomic.StoreInt64(q.counter(&q.c.last_ns), ns) }
