package capture

import (
	"errors"
	"fmt"
	"io"

	"github.com/mewkiz/flac"
	"github.com/mewkiz/flac/frame"
)

// newFLAC prepares to stream a FLAC file (decoded by mewkiz/flac, pure Go).
// Samples are scaled as WAV PCM is, by 2^(bits-1), so a FLAC made from a
// WAV reads exactly as the WAV does.
func newFLAC(path string, r io.Reader, channel int) (rec *Recording, err error) {
	defer decoderPanic(path, &err)
	s, err := flac.New(r)
	if err != nil {
		return nil, fileErr(path, ErrCorrupt, "corrupt FLAC file: %v", err)
	}
	info := s.Info
	if info.SampleRate < minRate || info.SampleRate > maxRate {
		return nil, fileErr(path, ErrUnsupported, "sample rate %d Hz is outside %d Hz to %d Hz", info.SampleRate, minRate, maxRate)
	}
	frames := int64(-1)
	if info.NSamples > 0 {
		frames = clampSize(info.NSamples)
	}
	rec = &Recording{
		path: path, format: "FLAC", encoding: fmt.Sprintf("%d-bit FLAC", info.BitsPerSample),
		rate: int(info.SampleRate), channels: int(info.NChannels), frames: frames,
		dec: &guarded{path: path, d: &flacDecoder{s: s, channels: int(info.NChannels)}},
	}
	return rec, rec.choose(channel)
}

// flacDecoder hands out a FLAC stream's frames (blocks of a few thousand
// samples per channel) in whatever lengths the reader asks for.
type flacDecoder struct {
	s        *flac.Stream
	channels int
	block    *frame.Frame
	at       int   // next sample of block
	end      error // how the stream ended, said on every later call
}

func (d *flacDecoder) decode(dst [][]float32) (n int, err error) {
	want := 0
	for _, p := range dst {
		want = max(want, len(p))
	}
	for n < want {
		if d.block == nil || d.at >= len(d.block.Subframes[0].Samples) {
			if d.end == nil {
				d.end = d.next()
			}
			if d.end != nil {
				if n > 0 {
					return n, nil // the end is said on the next call
				}
				return 0, d.end
			}
		}
		k := min(want-n, len(d.block.Subframes[0].Samples)-d.at)
		scale := 1 / float64(int64(1)<<(d.block.BitsPerSample-1))
		for c, p := range dst {
			if p == nil {
				continue
			}
			for i, v := range d.block.Subframes[c].Samples[d.at : d.at+k] {
				p[n+i] = float32(float64(v) * scale)
			}
		}
		n, d.at = n+k, d.at+k
	}
	return n, nil
}

// next parses the next FLAC frame, checking it has every channel whole.
func (d *flacDecoder) next() error {
	f, err := d.s.ParseNext()
	switch {
	case errors.Is(err, io.EOF):
		return io.EOF
	case errors.Is(err, io.ErrUnexpectedEOF):
		return errCutShort
	case err != nil:
		return fmt.Errorf("corrupt FLAC frame: %w", err)
	}
	d.block = nil
	if len(f.Subframes) != d.channels || f.BitsPerSample < 1 || f.BitsPerSample > 32 {
		return fmt.Errorf("corrupt FLAC frame: %d channels of %d bits in a %d-channel stream", len(f.Subframes), f.BitsPerSample, d.channels)
	}
	for _, sf := range f.Subframes {
		if len(sf.Samples) != len(f.Subframes[0].Samples) {
			return errors.New("corrupt FLAC frame: channels of different lengths")
		}
	}
	d.block, d.at = f, 0
	return nil
}
