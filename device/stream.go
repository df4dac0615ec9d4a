package device

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

import (
	"errors"
	"fmt"
	"sync"
	"time"
	"unsafe"

	"github.com/gordonklaus/portaudio"
)

// PreferredRate is the rate a stream asks for when the caller names none.
const PreferredRate = 48000

// Block is the PortAudio callback size, in frames: about 10 ms at 48 kHz.
// The input's callback writes whole blocks or drops them whole; the output
// renders one at a time.
const Block = 512

// How long a stream may go without the device taking or giving a block
// before it counts as lost (unplugged, taken by the system, its sound
// server gone), and how long the first block may take: a sound server may
// be waking an idle device (PulseAudio's null sink takes up to 2 s).
const (
	StallTimeout = 2 * time.Second
	StartGrace   = 5 * time.Second
)

// stream is a PortAudio stream whose callback is C (ring.c), with the ring
// it fills or drains and the pipe through which it wakes a waiting
// goroutine.
type stream struct {
	s       unsafe.Pointer // *PaStream
	ring    *ring
	wake    *wakePipe
	info    Info
	rate    float64
	what    string // "input \"name\"", for errors
	release func() // this stream's share of PortAudio
}

// streamSpec is what open needs to know about the stream to be.
type streamSpec struct {
	dir      direction
	device   string  // as the user asked for it
	rate     float64 // 0: PreferredRate, else the device's default
	channels func(dev *portaudio.DeviceInfo) (int, error)
	// ring makes the ring once the rate is known.
	ring func(rate float64, channels, fd int) (*ring, error)
}

// open chooses the device, negotiates the rate, makes the ring and the
// pipe, and opens and starts the stream, all with descriptor 2 muted.
func open(spec streamSpec) (*stream, error) {
	release, err := initPortAudio()
	if err != nil {
		return nil, err
	}
	st := &stream{release: release}
	if err := QuietStderr(func() error { return st.open(spec) }); err != nil {
		release()
		return nil, err
	}
	return st, nil
}

func (st *stream) open(spec streamSpec) error {
	dev, def, err := spec.dir.pick(spec.device)
	if err != nil {
		return err
	}
	st.what = fmt.Sprintf("%s %q", spec.dir.name, dev.Name)
	in := spec.dir.input
	if in {
		st.info = deviceInfo(dev, def, nil)
	} else {
		st.info = deviceInfo(dev, nil, def)
	}
	channels, err := spec.channels(dev)
	if err != nil {
		return err
	}
	var p portaudio.StreamParameters
	if in {
		p = portaudio.HighLatencyParameters(dev, nil)
		p.Input.Channels = channels
	} else {
		p = portaudio.HighLatencyParameters(nil, dev)
		p.Output.Channels = channels
	}
	if err := st.negotiate(&p, spec.rate, dev.DefaultSampleRate); err != nil {
		return err
	}
	if st.wake, err = newWakePipe(); err != nil {
		return fmt.Errorf("%s: %w", st.what, err)
	}
	if st.ring, err = spec.ring(st.rate, channels, st.wake.w); err != nil {
		st.wake.Close()
		return fmt.Errorf("%s: %w", st.what, err)
	}
	latency := max(p.Input.Latency, p.Output.Latency)
	e := C.fl_open(&st.s, st.ring.c, C.int(boolInt(in)), C.int(dev.Index), C.int(channels),
		C.double(latency.Seconds()), C.double(st.rate), C.ulong(Block), C.ulong(p.Flags))
	if err := paError(e); err != nil {
		st.wake.Close()
		return fmt.Errorf("%s: %w", st.what, err)
	}
	if err := paError(C.Pa_StartStream(st.s)); err != nil {
		C.Pa_CloseStream(st.s)
		st.wake.Close()
		return fmt.Errorf("%s: start: %w", st.what, err)
	}
	return nil
}

// negotiate sets the stream's rate to the first one the device supports:
// want if given, else PreferredRate, else the device's own default. The
// error names the last rate tried.
func (st *stream) negotiate(p *portaudio.StreamParameters, want, deviceDefault float64) error {
	rates := []float64{want}
	if want == 0 {
		rates = []float64{PreferredRate, deviceDefault}
	}
	var err error
	for _, r := range rates {
		p.SampleRate = r
		// The format is what matters here: the callback itself is C's.
		if err = portaudio.IsFormatSupported(*p, func([]float32) {}); err == nil {
			st.rate = r
			return nil
		}
	}
	return fmt.Errorf("%s cannot run at %v Hz: %w", st.what, rates[len(rates)-1], err)
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// paError is PortAudio's own text for an error code; nil for paNoError.
func paError(code C.PaError) error {
	if code == C.paNoError {
		return nil
	}
	return errors.New(C.GoString(C.Pa_GetErrorText(code)))
}

// close ends the stream quietly and releases this stream's share of
// PortAudio: abort drops what is buffered (an input), otherwise the stream
// plays it out first (an output's last fade). Once C can no longer write,
// the pipe is closed, and a goroutine waiting on it returns; if the stream
// would not close, the audio thread may still use the ring and the pipe,
// so both are kept for the life of the process, and the waiting goroutine
// is interrupted instead.
func (st *stream) close(abort bool) error {
	err := QuietStderr(func() error {
		var err error
		if abort {
			err = paError(C.Pa_AbortStream(st.s))
		} else {
			err = paError(C.Pa_StopStream(st.s))
		}
		if cerr := paError(C.Pa_CloseStream(st.s)); err == nil {
			err = cerr
		}
		return err
	})
	st.release()
	if err != nil {
		keepLeaked(st.ring, st.wake)
		st.wake.Interrupt()
		return fmt.Errorf("%s: close: %w", st.what, err)
	}
	st.wake.Close()
	return nil
}

// leaked holds the ring and pipe of every stream that would not close: C
// may still write to them, so neither may be freed (the ring) or have its
// read end closed by a finalizer (the pipe: a write to it would then raise
// SIGPIPE on a thread Go does not own, which ends the process).
var leaked struct {
	sync.Mutex
	rings []*ring
	pipes []*wakePipe
}

func keepLeaked(q *ring, p *wakePipe) {
	leaked.Lock()
	defer leaked.Unlock()
	leaked.rings = append(leaked.rings, q)
	leaked.pipes = append(leaked.pipes, p)
}
