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

// cStream is an input stream whose callback is C (ring.c), opened with
// the parameters the binding negotiated. It has the binding's Stop, Abort
// and Close, so CloseStream ends it like any other stream.
type cStream struct {
	s unsafe.Pointer // *C.PaStream
}

func openCStream(p portaudio.StreamParameters, q *ring) (*cStream, error) {
	st := &cStream{}
	err := paErr(C.fl_open_input(&st.s, q.c, C.int(p.Input.Device.Index), C.int(p.Input.Channels),
		C.double(p.Input.Latency.Seconds()), C.double(p.SampleRate), C.ulong(p.FramesPerBuffer), C.ulong(p.Flags)))
	if err != nil {
		return nil, err
	}
	return st, nil
}

func (st *cStream) Start() error { return paErr(C.Pa_StartStream(st.s)) }
func (st *cStream) Stop() error  { return paErr(C.Pa_StopStream(st.s)) }
func (st *cStream) Abort() error { return paErr(C.Pa_AbortStream(st.s)) }
func (st *cStream) Close() error { return paErr(C.Pa_CloseStream(st.s)) }

// paErr is PortAudio's own text for an error code; nil for paNoError.
func paErr(e C.PaError) error {
	if e == C.paNoError {
		return nil
	}
	return errors.New(C.GoString(C.Pa_GetErrorText(e)))
}
