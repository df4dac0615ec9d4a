package playback

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

import (
	"errors"
	"runtime"
	"sync/atomic"
	"unsafe"

	"fifthline/capture"
)

// outRing carries rendered samples from the rendering goroutine (the only
// writer) to PortAudio's audio thread (the only reader, in C: ring.c). Its
// memory is C's and is freed when the ring is no longer reachable.
type outRing struct {
	c   *C.fl_out
	buf []float32
}

// newOutRing holds capacity interleaved samples; the audio thread wakes a
// waiting writer through the pipe fd (-1: none) when fewer than low wait.
func newOutRing(capacity, low, channels, fd int) (*outRing, error) {
	c := C.fl_out_new(C.int64_t(capacity), C.int64_t(low), C.int(channels), C.int(fd))
	if c == nil {
		return nil, errors.New("no memory for the output buffer")
	}
	q := &outRing{c: c, buf: unsafe.Slice((*float32)(unsafe.Pointer(c.buf)), capacity)}
	runtime.AddCleanup(q, func(c *C.fl_out) { C.fl_out_free(c) }, c)
	return q, nil
}

func i64(p *C.int64_t) *int64 { return (*int64)(unsafe.Pointer(p)) }

// fill is how many samples wait to be played.
func (q *outRing) fill() int {
	return int(atomic.LoadInt64(i64(&q.c.w)) - atomic.LoadInt64(i64(&q.c.r)))
}

// played is how many samples the audio thread has taken so far.
func (q *outRing) played() int64 { return atomic.LoadInt64(i64(&q.c.r)) }

// write appends p, which must fit (len(p) ≤ capacity − fill).
func (q *outRing) write(p []float32) {
	w := atomic.LoadInt64(i64(&q.c.w))
	size := int64(len(q.buf))
	for i, v := range p {
		q.buf[(w+int64(i))%size] = v
	}
	atomic.StoreInt64(i64(&q.c.w), w+int64(len(p)))
}

// waiting tells the audio thread the writer will sleep on the pipe unless
// the ring has room; the audio thread clears it when it sends the wake-up.
func (q *outRing) waiting(on bool) {
	v := int32(0)
	if on {
		v = 1
	}
	atomic.StoreInt32((*int32)(unsafe.Pointer(&q.c.waiting)), v)
}

// started says the ring has been filled once: from now on, a callback that
// finds too little counts as an underrun.
func (q *outRing) started() { atomic.StoreInt32((*int32)(unsafe.Pointer(&q.c.started)), 1) }

// underruns counts callbacks that played silence for want of samples.
func (q *outRing) underruns() uint64 {
	return atomic.LoadUint64((*uint64)(unsafe.Pointer(&q.c.underruns)))
}

// take runs the audio thread's work, for tests.
func (q *outRing) take(out []float32, frames int) {
	C.fl_out_take(q.c, (*C.float)(unsafe.Pointer(&out[0])), C.ulong(frames))
}

func openOutputStream(q *outRing, device, channels int, latency, rate float64, frames int, flags int) (*capture.CStream, error) {
	var s unsafe.Pointer
	e := C.fl_open_output(&s, q.c, C.int(device), C.int(channels), C.double(latency), C.double(rate), C.ulong(frames), C.ulong(flags))
	return capture.WrapCStream(s, int(e))
}
