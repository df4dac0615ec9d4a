package device

/*
#cgo pkg-config: portaudio-2.0
#include "ring.h"
*/
import "C"

// The input's clock, for measuring latency from the moment a sound reached
// the converter rather than from when something upstream was started.

// ADCTime is when frame i of what ReadChannels delivers (counted from 0
// over all reads) reached the converter, in seconds on PortAudio's stream
// clock (StreamTime's); false before the first block. It counts frames at
// the stream's rate from the latest block's inputBufferAdcTime, so it is
// meant for frames just read; a block dropped for a slow reader (Stats)
// in between would put earlier frames late.
func (in *Input) ADCTime(i int64) (float64, bool) {
	var at C.int64_t
	var t C.double
	if C.fl_ring_anchor(in.ring.c, &at, &t) == 0 {
		return 0, false
	}
	return frameTime(float64(t), i-int64(at), in.rate), true
}

// StreamTime is PortAudio's stream clock now (Pa_GetStreamTime), in
// seconds; 0 once the input is closed.
func (in *Input) StreamTime() float64 {
	in.clock.Lock()
	defer in.clock.Unlock()
	select {
	case <-in.done:
		return 0
	default:
		return float64(C.Pa_GetStreamTime(in.s))
	}
}

// frameTime is the time of the frame di frames after one that came at t0
// (di < 0: before it).
func frameTime(t0 float64, di int64, rate float64) float64 {
	return t0 + float64(di)/rate
}
