package capture

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

import (
	"errors"
	"unsafe"
)

// CStream is a PortAudio stream opened by C code whose callback is C too
// (the input's ring.c, playback's output ring). It has the binding's Start,
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

func openInputStream(p inputParams, q *ring) (*CStream, error) {
	var s unsafe.Pointer
	e := C.fl_open_input(&s, q.c, C.int(p.device), C.int(p.channels), C.double(p.latency), C.double(p.rate), C.ulong(p.frames), C.ulong(p.flags))
	return WrapCStream(s, int(e))
}

// inputParams are the binding's negotiated stream parameters, for C.
type inputParams struct {
	device, channels int
	latency, rate    float64
	frames, flags    int
}
