package capture

import (
	"bufio"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
)

// WAVFile streams one channel of a WAV file as a Source. It reads 8-, 16-,
// 24- and 32-bit PCM and 32- and 64-bit IEEE float, plain or
// WAVE_FORMAT_EXTENSIBLE, at any sample rate.
type WAVFile struct {
	path    string
	closer  io.Closer
	layout  wavLayout
	channel int // 1-based
	decode  func([]byte) float32
	data    *bufio.Reader
	scratch []byte
	frames  int64
	pos     int64
	closed  bool
}

// OpenWAV opens a WAV file and reads its first channel.
func OpenWAV(path string) (*WAVFile, error) { return OpenWAVChannel(path, 1) }

// OpenWAVChannel opens a WAV file and reads the given channel, counted from
// 1 as on a mixing desk; 0 also means the first channel.
func OpenWAVChannel(path string, channel int) (*WAVFile, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, openProblem(path, err)
	}
	info, err := f.Stat()
	if err == nil && info.IsDir() {
		err = wavErr(path, ErrNotWAV, "is a folder, not a WAV file")
	}
	var w *WAVFile
	if err == nil {
		w, err = newWAV(path, f, info.Size(), channel)
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	w.closer = f
	return w, nil
}

func openProblem(path string, err error) error {
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return wavErr(path, fs.ErrNotExist, "no such file")
	case errors.Is(err, fs.ErrPermission):
		return wavErr(path, fs.ErrPermission, "permission denied")
	}
	return wavErr(path, err, "cannot open: %v", err)
}

// newWAV reads the header from r, which holds size bytes, and prepares to
// stream the chosen channel. It is OpenWAV without the file system.
func newWAV(path string, r io.ReaderAt, size int64, channel int) (*WAVFile, error) {
	l, err := scanWAV(path, r, size)
	if err != nil {
		return nil, err
	}
	if channel == 0 {
		channel = 1
	}
	if channel < 0 || channel > l.channels {
		return nil, wavErr(path, ErrUnsupportedWAV, "channel %d requested but the file has %d", channel, l.channels)
	}
	// Read whole frames in blocks of about 32 KiB, at least one frame.
	blockFrames := max(1, 32<<10/l.blockAlign)
	frames := l.dataSize / int64(l.blockAlign)
	return &WAVFile{
		path:    path,
		layout:  l,
		channel: channel,
		decode:  sampleDecoder(l.tag, l.bits),
		data:    bufio.NewReaderSize(io.NewSectionReader(r, l.dataOffset, frames*int64(l.blockAlign)), 64<<10),
		scratch: make([]byte, blockFrames*l.blockAlign),
		frames:  frames,
	}, nil
}

// sampleDecoder maps one little-endian sample to [-1, 1]. Integer PCM is
// divided by 2^(bits-1) and 8-bit PCM is unsigned with 128 as silence
// (WAVE specification); sox scales the same way.
func sampleDecoder(tag uint16, bits int) func([]byte) float32 {
	if tag == tagFloat {
		if bits == 64 {
			return func(b []byte) float32 { return fullScale(math.Float64frombits(binary.LittleEndian.Uint64(b))) }
		}
		return func(b []byte) float32 { return fullScale(float64(math.Float32frombits(binary.LittleEndian.Uint32(b)))) }
	}
	switch bits {
	case 8:
		return func(b []byte) float32 { return (float32(b[0]) - 128) / 128 }
	case 16:
		return func(b []byte) float32 { return float32(int16(binary.LittleEndian.Uint16(b))) / (1 << 15) }
	case 24:
		return func(b []byte) float32 {
			v := int32(uint32(b[0])<<8|uint32(b[1])<<16|uint32(b[2])<<24) >> 8
			return float32(v) / (1 << 23)
		}
	default: // 32
		return func(b []byte) float32 {
			return float32(float64(int32(binary.LittleEndian.Uint32(b))) / (1 << 31))
		}
	}
}

// fullScale keeps float samples inside the Source range: beyond full scale
// they clip, as sox clips them, and NaN from a damaged file becomes silence.
func fullScale(v float64) float32 {
	if math.IsNaN(v) {
		return 0
	}
	return float32(max(-1, min(1, v)))
}

// Read fills p with samples of the chosen channel; io.EOF at the end.
func (w *WAVFile) Read(p []float32) (int, error) {
	if w.closed {
		return 0, fmt.Errorf("%s: read after close: %w", w.path, os.ErrClosed)
	}
	if len(p) == 0 {
		return 0, nil
	}
	left := w.frames - w.pos
	if left == 0 {
		return 0, io.EOF
	}
	ba := w.layout.blockAlign
	n := int(min(int64(len(p)), left, int64(len(w.scratch)/ba)))
	buf := w.scratch[:n*ba]
	if _, err := io.ReadFull(w.data, buf); err != nil {
		return 0, fmt.Errorf("%s: reading samples: %w", w.path, err)
	}
	off, width := (w.channel-1)*w.layout.bits/8, w.layout.bits/8
	for i := range n {
		at := i*ba + off
		p[i] = w.decode(buf[at : at+width])
	}
	w.pos += int64(n)
	return n, nil
}

// Close releases the file; closing twice is harmless.
func (w *WAVFile) Close() error {
	if w.closed {
		return nil
	}
	w.closed = true
	if w.closer != nil {
		return w.closer.Close()
	}
	return nil
}

// SampleRate is the file's rate in Hz.
func (w *WAVFile) SampleRate() float64 { return float64(w.layout.rate) }

// Frames is the number of whole frames (samples per channel) in the file.
func (w *WAVFile) Frames() int64 { return w.frames }

// Duration is the length in seconds.
func (w *WAVFile) Duration() float64 { return float64(w.frames) / float64(w.layout.rate) }

// Channels is how many channels the file holds.
func (w *WAVFile) Channels() int { return w.layout.channels }

// Channel is the channel being read, counted from 1.
func (w *WAVFile) Channel() int { return w.channel }

// Truncated reports a data chunk that claims more bytes than the file has;
// the samples that are there are still read.
func (w *WAVFile) Truncated() bool { return w.layout.truncated }

// Encoding describes the sample format, such as "24-bit PCM" or "32-bit float".
func (w *WAVFile) Encoding() string {
	if w.layout.tag == tagFloat {
		return fmt.Sprintf("%d-bit float", w.layout.bits)
	}
	return fmt.Sprintf("%d-bit PCM", w.layout.bits)
}
