package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"strings"
	"testing"
)

// wavBytes builds a small WAV in memory: a format chunk with the given
// fields (an extensible one when sub is non-zero), optional extra chunks
// before the data, then the data.
func wavBytes(tag, channels uint16, rate uint32, bits uint16, sub uint16, extra []byte, data []byte) []byte {
	var b bytes.Buffer
	le := func(v any) { _ = binary.Write(&b, binary.LittleEndian, v) }
	fmtSize := uint32(16)
	if sub != 0 {
		fmtSize = 40
	}
	b.WriteString("RIFF")
	le(uint32(4 + 8 + fmtSize + uint32(len(extra)) + 8 + uint32(len(data))))
	b.WriteString("WAVEfmt ")
	le(fmtSize)
	align := channels * ((bits + 7) / 8)
	le(tag)
	le(channels)
	le(rate)
	le(rate * uint32(align))
	le(align)
	le(bits)
	if sub != 0 {
		le(uint16(22))
		le(bits)
		le(uint32(0))
		le(sub)
		b.Write(extensibleGUIDTail)
	}
	b.Write(extra)
	b.WriteString("data")
	le(uint32(len(data)))
	b.Write(data)
	return b.Bytes()
}

// FuzzOpenWAV: whatever the bytes, opening and reading ends with samples in
// [-1, 1] or a one-line error naming the file, never a panic or a hang.
// Run: go test -run '^$' -fuzz FuzzOpenWAV -fuzztime 30s ./capture/
func FuzzOpenWAV(f *testing.F) {
	pcm := []byte{0, 0, 0xff, 0x7f, 0, 0x80, 1, 0}
	// A LIST/INFO entry claiming 4 GiB: go-audio/wav would allocate it.
	hostileList := []byte("LIST\x10\x00\x00\x00INFOINAM\xff\xff\xff\xff")
	for _, seed := range [][]byte{
		wavBytes(tagPCM, 1, 48000, 16, 0, nil, pcm),
		wavBytes(tagPCM, 2, 44100, 24, 0, nil, pcm[:6]),
		wavBytes(tagPCM, 1, 8000, 8, 0, nil, pcm),
		wavBytes(tagFloat, 1, 48000, 32, 0, nil, pcm),
		wavBytes(tagFloat, 1, 48000, 64, 0, nil, pcm),
		wavBytes(tagExtensible, 3, 96000, 32, tagPCM, nil, pcm[:4]),
		wavBytes(tagExtensible, 1, 48000, 32, tagFloat, hostileList, pcm),
		wavBytes(tagPCM, 1, 48000, 12, 0, []byte("JUNK\xff\xff\xff\xff"), pcm),
		[]byte("RIFF\x00\x00\x00\x00WAVE"),
	} {
		f.Add(seed, 1)
	}
	f.Fuzz(func(t *testing.T, b []byte, channel int) {
		w, err := newWAV("fuzz.wav", bytes.NewReader(b), int64(len(b)), channel)
		if err != nil {
			if msg := err.Error(); !strings.HasPrefix(msg, "fuzz.wav: ") || strings.Contains(msg, "\n") {
				t.Fatalf("error is not one line naming the file: %q", msg)
			}
			return
		}
		if w.Frames()*int64(w.layout.blockAlign) > int64(len(b)) {
			t.Fatalf("%d frames of %d bytes from a %d-byte file", w.Frames(), w.layout.blockAlign, len(b))
		}
		buf := make([]float32, 333)
		total := int64(0)
		for {
			n, err := w.Read(buf)
			for _, v := range buf[:n] {
				if !(v >= -1 && v <= 1) {
					t.Fatalf("sample %v outside [-1, 1]", v)
				}
			}
			total += int64(n)
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil || n == 0 {
				t.Fatalf("Read = %d, %v before the end", n, err)
			}
		}
		if total != w.Frames() {
			t.Fatalf("read %d samples, Frames says %d", total, w.Frames())
		}
	})
}
