package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"io"

	"github.com/go-audio/wav"
)

// Kinds of WAV failure, for errors.Is; the error text names the file and
// the detail.
var (
	ErrNotWAV         = errors.New("not a WAV file")
	ErrCorruptWAV     = errors.New("corrupt WAV file")
	ErrUnsupportedWAV = errors.New("unsupported WAV format")
)

// wavError is a one-line error naming the file and the problem.
type wavError struct {
	path    string
	problem string
	kind    error
}

func (e *wavError) Error() string { return e.path + ": " + e.problem }
func (e *wavError) Unwrap() error { return e.kind }

func wavErr(path string, kind error, format string, args ...any) error {
	return &wavError{path: path, problem: fmt.Sprintf(format, args...), kind: kind}
}

// Format tags from the WAVE specification (Microsoft/IBM, mmreg.h).
const (
	tagPCM        = 0x0001
	tagFloat      = 0x0003
	tagExtensible = 0xFFFE
)

// tagNames names common encodings we refuse, so the error says what the file is.
var tagNames = map[uint16]string{
	0x0002: "MS ADPCM", 0x0006: "A-law", 0x0007: "µ-law",
	0x0011: "IMA ADPCM", 0x0031: "GSM 6.10", 0x0050: "MPEG", 0x0055: "MP3",
}

// extensibleGUIDTail is the fixed part of KSDATAFORMAT_SUBTYPE_* GUIDs; the
// first two bytes carry the ordinary format tag.
var extensibleGUIDTail = []byte{0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xAA, 0x00, 0x38, 0x9B, 0x71}

// maxFmtChunk bounds the format chunk we read; real ones are 16, 18 or 40
// bytes, and a hostile size must not become a huge allocation.
const maxFmtChunk = 1024

// The rates accepted: from below telephone quality to well above the
// highest studio rates (768 kHz).
const (
	minRate = 1000
	maxRate = 1_000_000
)

// wavLayout is where a WAV file keeps its samples and how they are encoded.
type wavLayout struct {
	tag        uint16 // tagPCM or tagFloat, extensible resolved
	channels   int
	rate       int
	bits       int // bits per sample container
	blockAlign int // bytes per frame
	dataOffset int64
	dataSize   int64 // bytes actually present, at most what the header says
	truncated  bool  // the data chunk claims more bytes than the file holds
}

// scanWAV walks the RIFF chunks of a file of the given size without
// reading sample data. Every step advances at least 8 bytes, so it ends.
func scanWAV(path string, r io.ReaderAt, size int64) (wavLayout, error) {
	var l wavLayout
	if size == 0 {
		return l, wavErr(path, ErrNotWAV, "empty file")
	}
	var hdr [12]byte
	if n, _ := r.ReadAt(hdr[:], 0); n < len(hdr) {
		if n >= 4 && string(hdr[:4]) == "RIFF" {
			return l, wavErr(path, ErrCorruptWAV, "truncated WAV header (%d bytes)", size)
		}
		return l, wavErr(path, ErrNotWAV, "not a WAV file (too short: %d bytes)", size)
	}
	switch {
	case string(hdr[:4]) == "RF64" || string(hdr[:4]) == "RIFX":
		return l, wavErr(path, ErrUnsupportedWAV, "unsupported WAV variant %q", hdr[:4])
	case string(hdr[:4]) != "RIFF" || string(hdr[8:12]) != "WAVE":
		return l, wavErr(path, ErrNotWAV, "not a WAV file (no RIFF/WAVE header)")
	}

	var fmtChunk []byte
	haveData := false
	for pos := int64(12); pos+8 <= size && (fmtChunk == nil || !haveData); {
		var ch [8]byte
		if _, err := r.ReadAt(ch[:], pos); err != nil {
			return l, wavErr(path, ErrCorruptWAV, "cannot read chunk header at byte %d: %v", pos, err)
		}
		id, n := string(ch[:4]), int64(binary.LittleEndian.Uint32(ch[4:]))
		body := pos + 8
		switch {
		case id == "fmt " && fmtChunk == nil:
			if n < 16 || n > maxFmtChunk {
				return l, wavErr(path, ErrCorruptWAV, "corrupt format chunk (%d bytes)", n)
			}
			if body+n > size {
				return l, wavErr(path, ErrCorruptWAV, "truncated format chunk")
			}
			fmtChunk = make([]byte, n)
			if _, err := r.ReadAt(fmtChunk, body); err != nil {
				return l, wavErr(path, ErrCorruptWAV, "cannot read format chunk: %v", err)
			}
		case id == "data" && !haveData:
			haveData = true
			l.dataOffset, l.dataSize = body, min(n, size-body)
			l.truncated = l.dataSize < n
		}
		pos = body + n + n&1 // chunks are word aligned
	}
	if fmtChunk == nil {
		return l, wavErr(path, ErrCorruptWAV, "no format chunk (truncated or corrupt header)")
	}
	if !haveData {
		return l, wavErr(path, ErrCorruptWAV, "no data chunk (truncated or corrupt file)")
	}
	if err := l.parseFormat(path, fmtChunk); err != nil {
		return l, err
	}
	return l, nil
}

// parseFormat reads the format chunk. The fields every WAV has are parsed
// by go-audio/wav; it ignores the extensible sub-format, so that part is ours.
func (l *wavLayout) parseFormat(path string, fmtChunk []byte) error {
	tag, channels, rate, bits, err := decodeFmtFields(fmtChunk)
	if err != nil {
		return wavErr(path, ErrCorruptWAV, "corrupt format chunk: %v", err)
	}
	l.blockAlign = int(binary.LittleEndian.Uint16(fmtChunk[12:14]))
	if tag == tagExtensible {
		if len(fmtChunk) < 40 || binary.LittleEndian.Uint16(fmtChunk[16:18]) < 22 {
			return wavErr(path, ErrCorruptWAV, "extensible format chunk too short (%d bytes)", len(fmtChunk))
		}
		guid := fmtChunk[24:40]
		if !bytes.Equal(guid[2:], extensibleGUIDTail) {
			return wavErr(path, ErrUnsupportedWAV, "unsupported extensible sub-format % x", guid)
		}
		tag = binary.LittleEndian.Uint16(guid[:2])
	}
	l.tag, l.channels, l.rate, l.bits = tag, channels, rate, bits

	switch {
	case channels == 0:
		return wavErr(path, ErrCorruptWAV, "zero channels in format chunk")
	case rate == 0:
		return wavErr(path, ErrCorruptWAV, "zero sample rate in format chunk")
	case rate < minRate || rate > maxRate:
		// Buffers downstream are sized by the rate: a hostile one must not
		// become a huge allocation.
		return wavErr(path, ErrUnsupportedWAV, "sample rate %d Hz is outside %d Hz to %d Hz", rate, minRate, maxRate)
	case tag != tagPCM && tag != tagFloat:
		name := tagNames[tag]
		if name == "" {
			name = "unknown encoding"
		}
		return wavErr(path, ErrUnsupportedWAV, "unsupported encoding %s (format tag 0x%04x); use PCM or float", name, tag)
	case tag == tagPCM && (bits < 1 || bits > 32):
		return wavErr(path, ErrUnsupportedWAV, "unsupported PCM sample size %d bits", bits)
	case tag == tagFloat && bits != 32 && bits != 64:
		return wavErr(path, ErrUnsupportedWAV, "unsupported float sample size %d bits", bits)
	}
	// A sample occupies whole bytes; odd sizes such as 12 or 20 bits sit
	// left-justified in the next byte size (WAVE specification).
	l.bits = (bits + 7) / 8 * 8
	if want := channels * l.bits / 8; l.blockAlign != want {
		return wavErr(path, ErrCorruptWAV, "block align %d does not match %d channel(s) of %d bits", l.blockAlign, channels, bits)
	}
	return nil
}

// decodeFmtFields runs go-audio/wav over a minimal RIFF holding only this
// format chunk and an empty data chunk, because its metadata readers allocate
// whatever sizes a file claims, so it never sees the rest of a file.
func decodeFmtFields(fmtChunk []byte) (tag uint16, channels, rate, bits int, err error) {
	var b bytes.Buffer
	le := func(v uint32) { _ = binary.Write(&b, binary.LittleEndian, v) }
	b.WriteString("RIFF")
	le(uint32(4 + 8 + len(fmtChunk) + len(fmtChunk)&1 + 8))
	b.WriteString("WAVEfmt ")
	le(uint32(len(fmtChunk)))
	b.Write(fmtChunk)
	if len(fmtChunk)&1 == 1 {
		b.WriteByte(0)
	}
	b.WriteString("data")
	le(0)

	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("decoder failed: %v", p)
		}
	}()
	d := wav.NewDecoder(bytes.NewReader(b.Bytes()))
	if d.ReadInfo(); d.Err() != nil {
		return 0, 0, 0, 0, d.Err()
	}
	return d.WavAudioFormat, int(d.NumChans), int(d.SampleRate), int(d.BitDepth), nil
}
