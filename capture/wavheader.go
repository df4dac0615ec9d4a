package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
)

// Kinds of failure to read a recording, for errors.Is; the error text names
// the file and the detail.
var (
	ErrNotAudio    = errors.New("not a recording fifthline reads")
	ErrCorrupt     = errors.New("corrupt recording")
	ErrUnsupported = errors.New("unsupported recording format")
	// ErrNoChannel is a channel asked for that the file does not have: the
	// asker's slip (a usage error), not the file's fault.
	ErrNoChannel = fmt.Errorf("%w: no such channel", ErrUnsupported)
)

// fileError is a one-line error naming the file and the problem.
type fileError struct {
	path    string
	problem string
	kind    error
}

func (e *fileError) Error() string { return e.path + ": " + e.problem }
func (e *fileError) Unwrap() error { return e.kind }

func fileErr(path string, kind error, format string, args ...any) error {
	return &fileError{path: path, problem: fmt.Sprintf(format, args...), kind: kind}
}

// Format tags from the WAVE specification (Microsoft/IBM, mmreg.h).
const (
	tagPCM        = 0x0001
	tagFloat      = 0x0003
	tagALaw       = 0x0006
	tagMuLaw      = 0x0007
	tagExtensible = 0xFFFE
)

// tagNames names the encodings, so an error says what a refused file is.
var tagNames = map[uint16]string{
	tagPCM: "PCM", tagFloat: "float", tagALaw: "A-law", tagMuLaw: "µ-law",
	0x0002: "MS ADPCM", 0x0011: "IMA ADPCM", 0x0031: "GSM 6.10", 0x0050: "MPEG", 0x0055: "MP3",
}

// extensibleGUIDTail is the fixed part of the KSDATAFORMAT_SUBTYPE_* GUIDs
// (mmreg.h, ksmedia.h); their first two bytes carry the ordinary format tag.
var extensibleGUIDTail = []byte{0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xAA, 0x00, 0x38, 0x9B, 0x71}

// The rates accepted: from below telephone quality to well above the
// highest studio rates (768 kHz). Buffers downstream are sized by the rate,
// so a hostile one must not become a huge allocation.
const (
	minRate = 1000
	maxRate = 1_000_000
)

// wavFormat is what a WAV format chunk says about the samples.
type wavFormat struct {
	tag        uint16 // tagPCM, tagFloat, tagALaw or tagMuLaw, extensible resolved
	channels   int
	rate       int
	bits       int // bits per sample container, whole bytes
	blockAlign int // bytes per frame
}

// parseFormat reads a format chunk (WAVEFORMATEX, with the 22 bytes of
// WAVEFORMATEXTENSIBLE after it when the tag is 0xFFFE):
//
//	0 tag u16, 2 channels u16, 4 rate u32, 8 bytes/s u32, 12 block align u16,
//	14 bits u16, 16 extra size u16, 18 valid bits u16, 20 channel mask u32,
//	24 sub-format GUID [16]
func parseFormat(path string, b []byte) (wavFormat, error) {
	var f wavFormat
	le := binary.LittleEndian
	if len(b) < 16 {
		return f, fileErr(path, ErrCorrupt, "corrupt format chunk (%d bytes)", len(b))
	}
	tag := le.Uint16(b[0:2])
	f.channels, f.rate = int(le.Uint16(b[2:4])), int(le.Uint32(b[4:8]))
	f.blockAlign, f.bits = int(le.Uint16(b[12:14])), int(le.Uint16(b[14:16]))
	if tag == tagExtensible {
		if len(b) < 40 || le.Uint16(b[16:18]) < 22 {
			return f, fileErr(path, ErrCorrupt, "extensible format chunk too short (%d bytes)", len(b))
		}
		guid := b[24:40]
		if !bytes.Equal(guid[2:], extensibleGUIDTail) {
			return f, fileErr(path, ErrUnsupported, "unsupported extensible sub-format % x", guid)
		}
		tag = le.Uint16(guid[:2])
	}
	f.tag = tag
	switch {
	case f.channels == 0:
		return f, fileErr(path, ErrCorrupt, "zero channels in format chunk")
	case f.rate == 0:
		return f, fileErr(path, ErrCorrupt, "zero sample rate in format chunk")
	case f.rate < minRate || f.rate > maxRate:
		return f, fileErr(path, ErrUnsupported, "sample rate %d Hz is outside %d Hz to %d Hz", f.rate, minRate, maxRate)
	case tag != tagPCM && tag != tagFloat && tag != tagALaw && tag != tagMuLaw:
		name := tagNames[tag]
		if name == "" {
			name = "unknown encoding"
		}
		return f, fileErr(path, ErrUnsupported, "unsupported encoding %s (format tag 0x%04x); use PCM or float", name, tag)
	case tag == tagPCM && (f.bits < 1 || f.bits > 32):
		return f, fileErr(path, ErrUnsupported, "unsupported PCM sample size %d bits", f.bits)
	case tag == tagFloat && f.bits != 32 && f.bits != 64:
		return f, fileErr(path, ErrUnsupported, "unsupported float sample size %d bits", f.bits)
	case (tag == tagALaw || tag == tagMuLaw) && f.bits != 8:
		return f, fileErr(path, ErrUnsupported, "unsupported %s sample size %d bits", tagNames[tag], f.bits)
	}
	// A sample occupies whole bytes; odd sizes such as 12 or 20 bits sit
	// left-justified in the next byte size (WAVE specification).
	bits := f.bits
	f.bits = (bits + 7) / 8 * 8
	if want := f.channels * f.bits / 8; f.blockAlign != want {
		return f, fileErr(path, ErrCorrupt, "block align %d does not match %d channel(s) of %d bits", f.blockAlign, f.channels, bits)
	}
	return f, nil
}

// encoding names the sample format, such as "24-bit PCM" or "A-law".
func (f wavFormat) encoding() string {
	switch f.tag {
	case tagALaw, tagMuLaw:
		return tagNames[f.tag]
	case tagFloat:
		return fmt.Sprintf("%d-bit float", f.bits)
	}
	return fmt.Sprintf("%d-bit PCM", f.bits)
}
