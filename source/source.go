// Package source defines the one small interface every stream of samples in
// fifthline satisfies — a microphone, a recording, the demo performance, the
// input after the drone canceller — so the analysis never knows which it
// reads. It depends on nothing, so the pure core (session, drone) can take
// a Source without compiling the audio edge.
//
// It is not where samples come from: capture and the file readers implement
// these interfaces. (InputStats, what a live input counts, lives here for
// the same reason: the meter shows it without compiling the audio edge.)
package source

import "math"

// Source yields mono blocks of samples, like io.Reader: Read fills p with up
// to len(p) samples in [-1, 1] and returns how many it wrote. At the end of
// a finite source Read returns io.EOF (possibly after a last short block).
type Source interface {
	SampleRate() float64
	Read(p []float32) (n int, err error)
}

// Multi yields several channels in step, one player per channel on a
// multichannel interface or a multitrack recording. ReadChannels fills
// dst[c][:n] for every channel c < Channels() with the same n, and returns
// io.EOF at the end like Source.Read. len(dst) must be Channels(); each
// dst[c] is caller memory that the source writes into, never keeps.
type Multi interface {
	SampleRate() float64
	Channels() int
	ReadChannels(dst [][]float32) (n int, err error)
}

// ClipLevel is the magnitude a live input counts as clipping: within
// 0.01 dB of full scale.
const ClipLevel = 0.999

// InputStats counts what happened to a live input's audio since its
// stream opened, for the meter's input-health line.
type InputStats struct {
	Blocks         uint64  // blocks the device delivered
	Overflows      uint64  // blocks PortAudio flagged: the driver lost input before we saw it
	DroppedBlocks  uint64  // blocks thrown away because the reader fell behind
	DroppedSamples uint64  // samples in those blocks
	Peak           float32 // largest magnitude of the channels read, 0..1
	Clipped        uint64  // samples at or above ClipLevel
}

// PeakDBFS is Peak in decibels relative to full scale (-Inf for silence).
func (s InputStats) PeakDBFS() float64 { return 20 * math.Log10(float64(s.Peak)) }
