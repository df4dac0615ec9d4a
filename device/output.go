package device

/*
#include "ring.h"
*/
import "C"

import (
	"errors"
	"fmt"
	"os"
	"sync/atomic"
	"time"
	"unsafe"

	"github.com/gordonklaus/portaudio"
)

// ErrOutputLost means the output stopped taking sound: unplugged, taken by
// the system, or its sound server gone.
var ErrOutputLost = errors.New("output device lost")

// OutputOptions choose the device and how far ahead sound is rendered.
type OutputOptions struct {
	// Device is "" for the default output, a PortAudio device index as
	// listed by Devices, or part of a device name.
	Device string
	// SampleRate to ask for; 0 means PreferredRate, else the device's default.
	SampleRate float64
	// MaxChannels caps the interleaved channels opened (the device may
	// have fewer); 0 means 2.
	MaxChannels int
	// Ahead is how many Blocks the writer keeps rendered ahead; it is
	// woken when fewer than Low wait. After an underrun (a machine too
	// busy to wake the writer in time) both grow by Ahead, up to
	// maxGrowth times Ahead.
	Ahead, Low int
}

// maxGrowth bounds how far the lead grows on a busy machine: 4 × 85 ms.
const maxGrowth = 4

// Output is a PortAudio output stream fed from one goroutine (the only
// writer) through a ring its C callback plays from; whatever has not been
// written in time is played as silence and counted as an underrun. The
// ring starts Ahead blocks full of silence.
type Output struct {
	*stream
	channels int
	block    int          // samples in a Block of frames
	ahead    int          // Ahead − Low, blocks: the lead above the low mark
	lead     atomic.Int64 // blocks kept rendered ahead now
	maxLead  int64
	seen     uint64 // underruns the writer has answered
	// The writer's watch on the device: when it last took sound.
	played int64
	since  time.Time
	limit  time.Duration
	lost   atomic.Pointer[error]
}

// OpenOutput opens and starts an output stream.
func OpenOutput(opt OutputOptions) (*Output, error) {
	o := &Output{limit: StartGrace, ahead: opt.Ahead - opt.Low, maxLead: int64(maxGrowth * opt.Ahead)}
	o.lead.Store(int64(opt.Ahead))
	st, err := open(streamSpec{
		dir: output, device: opt.Device, rate: opt.SampleRate,
		channels: func(dev *portaudio.DeviceInfo) (int, error) {
			o.channels = min(dev.MaxOutputChannels, orDefault(opt.MaxChannels, 2))
			return o.channels, nil
		},
		ring: func(_ float64, channels, fd int) (*ring, error) {
			o.block = Block * channels
			q, err := newOutputRing(int(o.maxLead)*o.block, opt.Low*o.block, channels, fd)
			if err != nil {
				return nil, err
			}
			// Silence, rendered ahead before the first callback (the ring
			// is zeroed); from now on a callback that finds too little
			// counts as an underrun.
			atomic.StoreInt64(q.counter(&q.c.w), int64(opt.Ahead*o.block))
			q.start()
			return q, nil
		},
	})
	if err != nil {
		return nil, err
	}
	o.stream, o.since = st, time.Now()
	return o, nil
}

// Channels is how many interleaved channels Write takes.
func (o *Output) Channels() int { return o.channels }

// SampleRate is the stream's rate in Hz.
func (o *Output) SampleRate() float64 { return o.rate }

// Device describes the output device.
func (o *Output) Device() Info { return o.info }

// Cap is how many samples the writer keeps rendered ahead now.
func (o *Output) Cap() int { return int(o.lead.Load()) * o.block }

// LeadGrowth is how much later than at the start what is written now will
// sound, because underruns have made the lead grow; zero on a machine that
// keeps up.
func (o *Output) LeadGrowth() time.Duration {
	blocks := o.lead.Load() - o.maxLead/maxGrowth
	return time.Duration(float64(blocks*Block) / o.rate * float64(time.Second))
}

// grow answers new underruns by keeping Ahead more blocks rendered ahead
// (up to maxGrowth × Ahead), and waking the writer that much earlier.
func (o *Output) grow() {
	u := o.Underruns()
	if u == o.seen {
		return
	}
	o.seen = u
	lead := min(o.lead.Load()+o.maxLead/maxGrowth, o.maxLead)
	o.lead.Store(lead)
	atomic.StoreInt64(o.ring.counter(&o.ring.c.low), (lead-int64(o.ahead))*int64(o.block))
}

// Fill is how many samples wait to be played.
func (o *Output) Fill() int {
	return o.ring.backlog()
}

// Played is how many samples the callback has taken so far.
func (o *Output) Played() int64 { return atomic.LoadInt64(o.ring.counter(&o.ring.c.r)) }

// Write appends p, interleaved frames, which must fit (len(p) ≤ Cap − Fill).
func (o *Output) Write(p []float32) {
	q := o.ring
	w := atomic.LoadInt64(q.counter(&q.c.w))
	size := int64(len(q.buf))
	for i, v := range p {
		q.buf[(w+int64(i))%size] = v
	}
	atomic.StoreInt64(q.counter(&q.c.w), w+int64(len(p)))
}

// AwaitRoom returns at once if n more samples fit; otherwise it sleeps
// until the callback finds fewer than the low mark waiting, or a second
// has passed (a device that stopped asking must not leave the writer
// asleep for ever). It returns false once Close has closed the stream
// (after a Close that failed it returns at once, true). It also
// watches the device: one that takes nothing for StallTimeout (StartGrace
// at first) is reported by Lost.
func (o *Output) AwaitRoom(n int) bool {
	if p := o.Played(); p != o.played {
		o.played, o.since, o.limit = p, time.Now(), StallTimeout
	} else if time.Since(o.since) > o.limit && o.lost.Load() == nil {
		err := fmt.Errorf("%w: %q took no sound for %v", ErrOutputLost, o.info.Name, o.limit)
		o.lost.Store(&err)
	}
	o.grow()
	o.ring.waiting(true)
	if o.Fill()+n <= o.Cap() {
		o.ring.waiting(false)
		return true
	}
	err := o.wake.Wait(time.Now().Add(time.Second))
	return err == nil || errors.Is(err, os.ErrDeadlineExceeded)
}

// Lost reports ErrOutputLost, naming the device, once the output has
// stopped taking sound; nil while it plays.
func (o *Output) Lost() error {
	if e := o.lost.Load(); e != nil {
		return *e
	}
	return nil
}

// Underruns counts callbacks that played silence for want of samples.
func (o *Output) Underruns() uint64 { return o.ring.count(&o.ring.c.underruns) }

// Close stops the stream, playing out what the device holds unless abort,
// and releases PortAudio; a writer waiting in AwaitRoom returns false.
func (o *Output) Close(abort bool) error { return o.stream.close(abort) }

// newOutputRing holds capacity interleaved samples of channels channels;
// the callback wakes a writer waiting on fd when fewer than low remain.
func newOutputRing(capacity, low, channels, fd int) (*ring, error) {
	q, err := allocRing(capacity, channels, fd)
	if err != nil {
		return nil, err
	}
	q.c.low = C.int64_t(low)
	return q, nil
}

// start says the ring has been filled once: from now on, a callback that
// finds too little counts as an underrun.
func (q *ring) start() { atomic.StoreInt32((*int32)(unsafe.Pointer(&q.c.started)), 1) }

// take runs the callback's work, for tests.
func (q *ring) take(out []float32, frames int) {
	C.fl_ring_take(q.c, (*C.float)(unsafe.Pointer(&out[0])), C.ulong(frames))
}
