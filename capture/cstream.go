package capture

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

import (
	"errors"
	"unsafe"

	"github.com/gordonklaus/portaudio"
)

// CStream is a PortAudio stream whose callback is C (ring.c), for an Input
// or an OutputRing. It has the binding's Start,
// Stop, Abort and Close, so CloseStream ends it like any other stream.
type CStream struct {
	s unsafe.Pointer // *PaStream
}

// WrapCStream takes a PaStream pointer that C code opened, and the
// PaError it returned (0 for none).
func WrapCStream(s unsafe.Pointer, paError int) (*CStream, error) {
	if err := PaError(paError); err != nil {
		return nil, err
	}
	return &CStream{s: s}, nil
}

func (st *CStream) Start() error { return PaError(int(C.Pa_StartStream(st.s))) }
func (st *CStream) Stop() error  { return PaError(int(C.Pa_StopStream(st.s))) }
func (st *CStream) Abort() error { return PaError(int(C.Pa_AbortStream(st.s))) }
func (st *CStream) Close() error { return PaError(int(C.Pa_CloseStream(st.s))) }

// PaError is PortAudio's own text for an error code; nil for paNoError.
func PaError(code int) error {
	if code == int(C.paNoError) {
		return nil
	}
	return errors.New(C.GoString(C.Pa_GetErrorText(C.PaError(code))))
}

// openStream opens p's input (or, if it has none, its output) on q with
// the C callback for that direction.
func openStream(p portaudio.StreamParameters, q *ring) (*CStream, error) {
	var s unsafe.Pointer
	var e C.PaError
	rate, frames, flags := C.double(p.SampleRate), C.ulong(p.FramesPerBuffer), C.ulong(p.Flags)
	if d := p.Input; d.Device != nil {
		e = C.fl_open_input(&s, q.c, C.int(d.Device.Index), C.int(d.Channels), C.double(d.Latency.Seconds()), rate, frames, flags)
	} else {
		d := p.Output
		e = C.fl_open_output(&s, q.c, C.int(d.Device.Index), C.int(d.Channels), C.double(d.Latency.Seconds()), rate, frames, flags)
	}
	return WrapCStream(s, int(e))
}
