package device

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync/atomic"
	"unsafe"

	"fifthline/source"
)

// ring hands samples between PortAudio's audio thread (in C: see ring.h for
// why) and one goroutine without locks, so the audio thread never waits:
// for an input the audio thread writes and the goroutine reads; for an
// output the other way round. Its memory is C's and is freed when the ring
// is no longer reachable, so no reader can outlive it.
type ring struct {
	c    *C.fl_ring
	buf  []float32 // c's samples, seen from Go
	keep int       // channels per frame in buf
}

// newRing makes a ring of capacity frames that keeps the channels pick
// (counted from 0, in that order) of callbacks' interleaved frames of
// channels channels; a writer wakes a waiting reader through the pipe fd
// (-1: none).
func newRing(capacity, channels int, pick []int, fd int) (*ring, error) {
	if len(pick) < 1 || len(pick) > C.FL_MAX_KEEP {
		return nil, fmt.Errorf("%d channels asked for; one ring carries 1 to %d", len(pick), C.FL_MAX_KEEP)
	}
	q, err := allocRing(capacity*len(pick), channels, fd)
	if err != nil {
		return nil, err
	}
	q.keep, q.c.keep, q.c.clip = len(pick), C.int32_t(len(pick)), C.float(source.ClipLevel)
	for k, c := range pick {
		if c < 0 || c >= channels {
			return nil, fmt.Errorf("channel %d of %d asked for", c+1, channels)
		}
		q.c.pick[k] = C.int32_t(c)
	}
	return q, nil
}

// allocRing makes a ring of capacity samples in C memory, freed once the
// ring is unreachable, for callbacks of channels interleaved channels, all
// of them kept.
func allocRing(capacity, channels, fd int) (*ring, error) {
	c := C.fl_ring_new(C.int64_t(capacity), C.int(channels), C.int(fd))
	if c == nil {
		return nil, errors.New("no memory for the audio buffer")
	}
	q := &ring{c: c, buf: unsafe.Slice((*float32)(unsafe.Pointer(c.buf)), capacity), keep: channels}
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

// readChannels moves up to the shortest len(dst[c]) frames out, channel c
// of each into dst[c], and says how many. len(dst) is the ring's keep.
func (q *ring) readChannels(dst [][]float32) int {
	n := math.MaxInt
	for _, d := range dst {
		n = min(n, len(d))
	}
	w, r := atomic.LoadInt64(q.counter(&q.c.w)), atomic.LoadInt64(q.counter(&q.c.r))
	n = min(n, int(w-r)/q.keep)
	// Two stretches: up to the end of the buffer, then from its start.
	at, done := int(r%int64(len(q.buf))), 0
	for done < n {
		frames := min(n-done, (len(q.buf)-at)/q.keep)
		src := q.buf[at : at+frames*q.keep]
		if q.keep == 1 {
			copy(dst[0][done:], src)
		} else {
			for c, d := range dst {
				d = d[done : done+frames]
				for i := range d {
					d[i] = src[i*q.keep+c]
				}
			}
		}
		done, at = done+frames, 0
	}
	atomic.StoreInt64(q.counter(&q.c.r), r+int64(n*q.keep))
	return n
}

// backlog is how many samples wait to be read.
func (q *ring) backlog() int {
	return int(atomic.LoadInt64(q.counter(&q.c.w)) - atomic.LoadInt64(q.counter(&q.c.r)))
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

func (q *ring) count(p *C.uint64_t) uint64 {
	return atomic.LoadUint64((*uint64)(unsafe.Pointer(p)))
}

// stats reads the writer's counters.
func (q *ring) stats() source.InputStats {
	return source.InputStats{
		Blocks:         q.count(&q.c.blocks),
		Overflows:      q.count(&q.c.overflows),
		DroppedBlocks:  q.count(&q.c.dropped),
		DroppedSamples: q.count(&q.c.dropped_samples),
		Peak:           math.Float32frombits(atomic.LoadUint32((*uint32)(unsafe.Pointer(&q.c.peak_bits)))),
		Clipped:        q.count(&q.c.clipped),
	}
}

// blocks is how many callbacks have delivered.
func (q *ring) blocks() uint64 { return q.count(&q.c.blocks) }

// lastBlock is when the writer last delivered, in Unix nanoseconds.
func (q *ring) lastBlock() int64 { return atomic.LoadInt64(q.counter(&q.c.last_ns)) }

// deliver runs the audio thread's work on one callback's buffer of
// interleaved frames, for tests and benchmarks.
func (q *ring) deliver(buf []float32, frames int) {
	C.fl_ring_deliver(q.c, (*C.float)(unsafe.Pointer(&buf[0])), C.ulong(frames), 0)
}

// markDelivery sets the time of the last delivery, Unix nanoseconds.
func (q *ring) markDelivery(ns int64) { atomic.StoreInt64(q.counter(&q.c.last_ns), ns) }

// atomicField is where a field that Go reads with sync/atomic sits in C's
// ring, for the test that checks it is naturally aligned (the ring itself
// comes from calloc, aligned for any type).
type atomicField struct {
	name         string
	offset, size uintptr
}

// atomicFields lists every field of fl_ring that Go reads or writes with
// sync/atomic.
func atomicFields() []atomicField {
	var c C.fl_ring
	return []atomicField{
		{"w", unsafe.Offsetof(c.w), unsafe.Sizeof(c.w)},
		{"r", unsafe.Offsetof(c.r), unsafe.Sizeof(c.r)},
		{"waiting", unsafe.Offsetof(c.waiting), unsafe.Sizeof(c.waiting)},
		{"peak_bits", unsafe.Offsetof(c.peak_bits), unsafe.Sizeof(c.peak_bits)},
		{"blocks", unsafe.Offsetof(c.blocks), unsafe.Sizeof(c.blocks)},
		{"overflows", unsafe.Offsetof(c.overflows), unsafe.Sizeof(c.overflows)},
		{"dropped", unsafe.Offsetof(c.dropped), unsafe.Sizeof(c.dropped)},
		{"dropped_samples", unsafe.Offsetof(c.dropped_samples), unsafe.Sizeof(c.dropped_samples)},
		{"clipped", unsafe.Offsetof(c.clipped), unsafe.Sizeof(c.clipped)},
		{"last_ns", unsafe.Offsetof(c.last_ns), unsafe.Sizeof(c.last_ns)},
		{"low", unsafe.Offsetof(c.low), unsafe.Sizeof(c.low)},
		{"started", unsafe.Offsetof(c.started), unsafe.Sizeof(c.started)},
		{"underruns", unsafe.Offsetof(c.underruns), unsafe.Sizeof(c.underruns)},
	}
}
