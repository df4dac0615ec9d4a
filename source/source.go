// Package source defines the one small interface every stream of samples in
// fifthline satisfies — a microphone, a recording, the demo performance, the
// input after the drone canceller — so the analysis never knows which it
// reads. It depends on nothing, so the pure core (session, drone) can take
// a Source without compiling the audio edge.
//
// It is not where samples come from: capture and the file readers implement
// these interfaces.
package source

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
