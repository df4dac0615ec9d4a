package capture

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"time"

	"fifthline/source"
)

var (
	_ source.Source = (*Recording)(nil)
	_ source.Multi  = (*Recording)(nil)
)

// Recording is an audio file opened for reading: WAV (RIFF, RF64, BW64,
// Broadcast Wave), FLAC, MP3, or anything ffmpeg reads. It is a Source for
// one chosen channel and a source.Multi for all of them; use one or the
// other on a Recording, not both.
type Recording struct {
	path      string
	format    string // "WAV", "RF64", "FLAC", "MP3", "ffmpeg (aac)"…
	encoding  string // "24-bit PCM", "32-bit float", "MP3"…
	rate      int
	channels  int
	frames    int64 // -1 when the file does not say
	channel   int   // 1-based, for Read
	truncated bool
	bext      *Broadcast

	dec    decoder
	closer io.Closer
	pick   [][]float32 // Read's dst: only the chosen channel set
	closed bool
}

// errCutShort is how a decoder says the file ends inside its samples: the
// recording ends there, and Truncated says so.
var errCutShort = errors.New("the file ends before its samples do")

// decoder yields a recording's samples channel by channel: it writes the
// next n frames into dst[c][:n] for every channel c whose dst[c] is not
// nil (all of the same length), skipping the others, and returns io.EOF
// at the end, possibly after a last short block.
type decoder interface {
	decode(dst [][]float32) (n int, err error)
}

// guarded is a decoder whose third-party code may panic on a damaged file.
type guarded struct {
	path string
	d    decoder
}

func (g *guarded) decode(dst [][]float32) (n int, err error) {
	defer decoderPanic(g.path, &err)
	return g.d.decode(dst)
}

// decoderPanic turns a panic inside a third-party decoder, on a file it
// was not written for, into the one-line error a corrupt file gets.
func decoderPanic(path string, err *error) {
	if p := recover(); p != nil {
		*err = fileErr(path, ErrCorrupt, "corrupt file: the decoder failed (%v)", p)
	}
}

// Read fills p with samples of the chosen channel; io.EOF at the end.
func (r *Recording) Read(p []float32) (int, error) {
	if len(p) == 0 {
		return 0, nil
	}
	r.pick[r.channel-1] = p
	n, err := r.read(r.pick)
	r.pick[r.channel-1] = nil // keep no caller memory
	return n, err
}

// ReadChannels fills dst[c][:n] for every channel c with the same n;
// len(dst) must be Channels() and every dst[c] as long as dst[0].
func (r *Recording) ReadChannels(dst [][]float32) (int, error) {
	if len(dst) != r.channels {
		return 0, fmt.Errorf("ReadChannels given %d slices for %d channels", len(dst), r.channels)
	}
	for _, d := range dst {
		if len(d) != len(dst[0]) {
			return 0, errors.New("ReadChannels given slices of different lengths")
		}
	}
	if len(dst[0]) == 0 {
		return 0, nil
	}
	return r.read(dst)
}

func (r *Recording) read(dst [][]float32) (int, error) {
	// Read errors do not repeat the path: whoever reads names the source
	// (as analyze does), like an io.Reader's errors.
	if r.closed {
		return 0, fmt.Errorf("read after close: %w", os.ErrClosed)
	}
	n, err := r.dec.decode(dst)
	if errors.Is(err, errCutShort) {
		r.truncated, err = true, io.EOF
	}
	if err != nil && !errors.Is(err, io.EOF) {
		return n, fmt.Errorf("reading samples: %w", err)
	}
	return n, err
}

// Close releases the file; closing twice is harmless.
func (r *Recording) Close() error {
	if r.closed {
		return nil
	}
	r.closed = true
	if r.closer != nil {
		return r.closer.Close()
	}
	return nil
}

// SampleRate is the file's rate in Hz.
func (r *Recording) SampleRate() float64 { return float64(r.rate) }

// Frames is the number of frames (samples per channel), -1 if unknown.
func (r *Recording) Frames() int64 { return r.frames }

// Duration is the length in seconds, 0 if unknown.
func (r *Recording) Duration() float64 { return float64(max(r.frames, 0)) / float64(r.rate) }

// Channels is how many channels the file holds.
func (r *Recording) Channels() int { return r.channels }

// Channel is the channel Read reads, counted from 1.
func (r *Recording) Channel() int { return r.channel }

// Format names the container: "WAV", "RF64", "BW64", "FLAC", "MP3", or
// "ffmpeg (codec)".
func (r *Recording) Format() string { return r.format }

// Encoding describes the samples, such as "24-bit PCM" or "32-bit float".
func (r *Recording) Encoding() string { return r.encoding }

// Truncated reports a file that holds fewer samples than its header says
// (known from the start for WAV, at the cut for FLAC and MP3); the samples
// that are there are still read.
func (r *Recording) Truncated() bool { return r.truncated }

// Broadcast is the Broadcast Wave bext chunk, or nil when there is none.
// Its origination time is read in the local time zone.
func (r *Recording) Broadcast() *Broadcast { return r.bext }

// ModTime is when the file was last written, the zero time if unknown.
func (r *Recording) ModTime() time.Time {
	if info, err := os.Stat(r.path); err == nil {
		return info.ModTime()
	}
	return time.Time{}
}

// choose sets the channel Read reads, checking it exists.
func (r *Recording) choose(channel int) error {
	if channel == 0 {
		channel = 1
	}
	if channel < 0 || channel > r.channels {
		return fileErr(r.path, ErrNoChannel, "channel %d requested but the file has %s", channel, channelCount(r.channels))
	}
	r.channel = channel
	r.pick = make([][]float32, r.channels)
	return nil
}

// openFile opens path for reading, refusing folders, with one-line errors.
func openFile(path string) (*os.File, int64, error) {
	f, err := os.Open(path)
	if err != nil {
		switch {
		case errors.Is(err, fs.ErrNotExist):
			return nil, 0, fileErr(path, fs.ErrNotExist, "no such file")
		case errors.Is(err, fs.ErrPermission):
			return nil, 0, fileErr(path, fs.ErrPermission, "permission denied")
		}
		return nil, 0, fileErr(path, err, "cannot open: %v", err)
	}
	info, err := f.Stat()
	switch {
	case err != nil:
		err = fileErr(path, err, "cannot open: %v", err)
	case info.IsDir():
		err = fileErr(path, ErrNotAudio, "is a folder, not a recording")
	}
	if err != nil {
		f.Close()
		return nil, 0, err
	}
	return f, info.Size(), nil
}

// channelCount says how many channels in words: "one channel", "4 channels".
func channelCount(n int) string {
	if n == 1 {
		return "one channel"
	}
	return fmt.Sprintf("%d channels", n)
}
