package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"

	"github.com/hajimehoshi/go-mp3"
)

// newMP3 prepares to stream an MP3 file (decoded by hajimehoshi/go-mp3, pure
// Go) whose first frame starts at byte at. The decoder always gives 16-bit
// stereo, a mono file twice over; the file's own channel count comes from
// its first frame header. Like ffmpeg, we drop what the codec added: the
// Info frame, the encoder's delay and the decoder's, and the padding of the
// last frame, as the LAME tag states them, so the samples line up with the
// WAV the MP3 was made from.
func newMP3(path string, r io.Reader, first []byte, channel int) (rec *Recording, err error) {
	defer decoderPanic(path, &err)
	// Given no Seeker, the decoder does not read the whole file through
	// first to learn its length (which more than halves its speed); the
	// Xing/Info tag says the length.
	d, err := mp3.NewDecoder(struct{ io.Reader }{r})
	if err != nil {
		return nil, fileErr(path, ErrCorrupt, "corrupt MP3 file: %v", err)
	}
	hdr := readMP3Header(first)
	channels := 2
	if hdr.mono {
		channels = 1
	}
	rec = &Recording{
		path: path, format: "MP3", encoding: "MP3",
		rate: d.SampleRate(), channels: channels, frames: hdr.frames,
		dec: &guarded{path: path, d: &trimmed{d: newInterleaved(d, 2, 2, sampleDecoder(tagPCM, 16)), skip: hdr.skip, left: hdr.frames}},
	}
	return rec, rec.choose(channel)
}

// mp3Header is what the first frame says: the channel mode, and from a
// Xing/Info frame, how many samples the music has (-1: not said) and, with
// a LAME tag, how many the codec added before it.
type mp3Header struct {
	mono   bool
	skip   int64
	frames int64
}

// decoderDelay is the MP3 synthesis filterbank's delay in samples, which
// the LAME tag's figures leave out (common practice among gapless players).
const decoderDelay = 529

// readMP3Header reads the MPEG audio frame header (ISO/IEC 11172-3
// §2.4.2.3: sync, version, layer, …, mode in the fourth byte, 11 = single
// channel) and, after the side information (17 or 32 bytes in MPEG-1, 9 or
// 17 in MPEG-2), a "Xing" or "Info" tag: flags, then frame count, byte
// count, a 100-byte table and a quality as the flags say, then LAME's
// extension (a 9-byte encoder name first) whose bytes 21-23 hold the
// encoder delay and padding, 12 bits each.
func readMP3Header(b []byte) mp3Header {
	h := mp3Header{frames: -1}
	if len(b) < 4 {
		return h
	}
	h.mono = b[3]>>6 == 3
	mpeg1 := b[1]>>3&3 == 3
	side, perFrame := 32, int64(1152) // samples per Layer III frame (§2.4.2.1)
	if !mpeg1 {
		perFrame = 576 // MPEG-2 and 2.5 (ISO/IEC 13818-3)
	}
	switch {
	case mpeg1 && h.mono:
		side = 17
	case !mpeg1 && h.mono:
		side = 9
	case !mpeg1:
		side = 17
	}
	tag := b[min(len(b), 4+side):]
	if len(tag) < 8 || !(bytes.HasPrefix(tag, []byte("Xing")) || bytes.HasPrefix(tag, []byte("Info"))) {
		return h
	}
	flags := tag[7]
	at := 8
	count := int64(-1) // frames of music, the tag's own not counted
	if flags&1 != 0 && len(tag) >= 12 {
		count = int64(binary.BigEndian.Uint32(tag[8:12]))
	}
	for bit, size := range []int{4, 4, 100, 4} {
		if flags&(1<<bit) != 0 {
			at += size
		}
	}
	h.skip = perFrame // the tag's frame decodes to one frame of silence
	delay, padding := int64(0), int64(0)
	if lame := tag[min(len(tag), at):]; len(lame) >= 24 && lameEncoder(lame[:4]) {
		delay = int64(lame[21])<<4 | int64(lame[22])>>4 + decoderDelay
		padding = max(0, int64(lame[22]&0x0f)<<8|int64(lame[23])-decoderDelay)
		h.skip += delay
	}
	if count >= 0 {
		h.frames = max(0, count*perFrame-delay-padding)
	}
	return h
}

// lameEncoder tells a LAME extension by its encoder name: LAME itself, or
// the FFmpeg libraries that write the same extension through it.
func lameEncoder(name []byte) bool {
	switch string(name) {
	case "LAME", "Lavc", "Lavf":
		return true
	}
	return false
}

// trimmed drops skip frames at the start and ends after left frames (-1:
// at the decoder's end).
type trimmed struct {
	d          decoder
	skip, left int64
	junk       [][]float32
	cut        [][]float32
}

func (t *trimmed) decode(dst [][]float32) (int, error) {
	for t.skip > 0 {
		if t.junk == nil {
			t.junk = [][]float32{make([]float32, 1152)}
		}
		n, err := t.d.decode([][]float32{t.junk[0][:min(int64(len(t.junk[0])), t.skip)]})
		t.skip -= int64(n)
		if err != nil {
			return 0, err
		}
	}
	if t.left == 0 {
		return 0, io.EOF
	}
	if t.cut == nil {
		t.cut = make([][]float32, len(dst))
	}
	for c, p := range dst {
		t.cut[c] = p
		if t.left >= 0 && p != nil {
			t.cut[c] = p[:min(int64(len(p)), t.left)]
		}
	}
	n, err := t.d.decode(t.cut[:len(dst)])
	clear(t.cut)
	if t.left >= 0 {
		t.left -= int64(n)
	}
	if errors.Is(err, io.EOF) && t.left > 0 {
		err = errCutShort
	}
	return n, err
}
