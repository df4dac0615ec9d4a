package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"strings"
	"testing"
	"time"
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
		wavBytes(tagALaw, 2, 8000, 8, 0, nil, pcm),
		wavBytes(tagExtensible, 1, 8000, 8, tagMuLaw, nil, pcm),
		wavBytes(tagPCM, 1, 48000, 16, 0, bextChunk("2026:11:24", "19:30:05", 1, "A=PCM\r\n"), pcm),
		rf64Bytes(wavBytes(tagPCM, 2, 96000, 24, 0, nil, pcm[:6])),
		rf64Bytes(wavBytes(tagExtensible, 1, 48000, 32, tagFloat, bextChunk("2026-11-24", "", 0, ""), pcm)),
		[]byte("RIFF\x00\x00\x00\x00WAVE"),
	} {
		f.Add(seed, 1)
	}
	f.Fuzz(func(t *testing.T, b []byte, channel int) {
		w, err := newWAV("fuzz.wav", bytes.NewReader(b), int64(len(b)), channel, time.UTC)
		if err != nil {
			if msg := err.Error(); !strings.HasPrefix(msg, "fuzz.wav: ") || strings.Contains(msg, "\n") {
				t.Fatalf("error is not one line naming the file: %q", msg)
			}
			return
		}
		if w.Frames()*int64(w.Channels()) > int64(len(b)) {
			t.Fatalf("%d frames of %d channels from a %d-byte file", w.Frames(), w.Channels(), len(b))
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

// rf64Bytes rewrites a WAV built by wavBytes as RF64 (EBU Tech 3306): the
// form named RF64 with size 0xFFFFFFFF, a ds64 chunk first holding the
// 64-bit sizes, and the data chunk's 32-bit size 0xFFFFFFFF.
func rf64Bytes(wav []byte) []byte {
	le := binary.LittleEndian
	at := bytes.Index(wav, []byte("data"))
	dataSize := uint64(le.Uint32(wav[at+4:]))
	var b bytes.Buffer
	b.WriteString("RF64\xff\xff\xff\xffWAVEds64")
	binary.Write(&b, le, uint32(28))
	binary.Write(&b, le, []uint64{uint64(len(wav)) + 36 - 8, dataSize, 0})
	binary.Write(&b, le, uint32(0)) // no table
	b.Write(wav[12:at])
	b.WriteString("data\xff\xff\xff\xff")
	b.Write(wav[at+8:])
	return b.Bytes()
}

// FuzzBext: any bext body parses to fields without a panic, and an
// origination time, when there is one, is a real calendar time.
// Run: go test -run '^$' -fuzz FuzzBext -fuzztime 20s ./capture/
func FuzzBext(f *testing.F) {
	f.Add(bextChunk("2026-11-24", "19:30:05", 3369840000, "A=PCM\r\n")[8:])
	f.Add(bextChunk("2026:02:29", "24:00:00", 0, "")[8:])
	f.Add([]byte("short"))
	f.Fuzz(func(t *testing.T, b []byte) {
		bc := parseBext(b, time.UTC)
		if o := bc.Origination; !o.IsZero() && (o.Year() > 9999 || o.Format("2006-01-02") != string(b[bextDate:bextDate+4])+o.Format("-01-02")) {
			t.Fatalf("origination %v from %q", o, b[bextDate:bextTime])
		}
	})
}

// FuzzOpenRecording: FLAC and MP3 decoders (third-party) and the sniffing
// before them end in samples in [-1, 1] or a one-line error, never a panic.
// Run: go test -run '^$' -fuzz FuzzOpenRecording -fuzztime 30s ./capture/
func FuzzOpenRecording(f *testing.F) {
	for _, seed := range [][]byte{
		[]byte("fLaC\x00\x00\x00\x22\x10\x00\x10\x00\x00\x00\x00\x00\x00\x00\x0b\xb8\x02\xf0\x00\x00\x00\x00"),
		[]byte("ID3\x04\x00\x00\x00\x00\x00\x00\xff\xfb\x90\xc4\x00\x00\x00\x00"),
		{0xff, 0xfb, 0x90, 0x64, 0, 0, 0, 0, 0, 0, 0, 0},
		rf64Bytes(wavBytes(tagPCM, 1, 48000, 16, 0, nil, []byte{1, 2, 3, 4})),
	} {
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		r := bytes.NewReader(b)
		kind, at := sniff(r)
		var rec *Recording
		var err error
		switch kind {
		case "FLAC":
			rec, err = newFLAC("fuzz", r, 1)
		case "MP3":
			rec, err = newMP3("fuzz", io.NewSectionReader(r, 0, int64(len(b))), b[min(int64(len(b)), at):], 1)
		case "WAV":
			rec, err = newWAV("fuzz", r, int64(len(b)), 1, time.UTC)
		default:
			return
		}
		if err != nil {
			if msg := err.Error(); !strings.HasPrefix(msg, "fuzz: ") || strings.Contains(msg, "\n") {
				t.Fatalf("error is not one line naming the file: %q", msg)
			}
			return
		}
		buf := make([]float32, 1000)
		for range 1000 { // a damaged stream may be long; enough to exercise it
			n, err := rec.Read(buf)
			for _, v := range buf[:n] {
				if !(v >= -1 && v <= 1) {
					t.Fatalf("sample %v outside [-1, 1]", v)
				}
			}
			if err != nil {
				if msg := err.Error(); strings.Contains(msg, "\n") {
					t.Fatalf("read error is not one line: %q", msg)
				}
				return
			}
		}
	})
}

// FuzzMP3Header: any first frame gives a header without a panic, with a
// skip and a length no hostile tag can make negative.
// Run: go test -run '^$' -fuzz FuzzMP3Header -fuzztime 20s ./capture/
func FuzzMP3Header(f *testing.F) {
	info := append([]byte{0xff, 0xfb, 0x90, 0xc0}, make([]byte, 17)...)
	info = append(info, "Info\x00\x00\x00\x0f\x00\x00\x00\x28"...)
	info = append(info, make([]byte, 108)...)
	info = append(info, "Lavc59.37\x00\x00\x00\x00\x00\x00\x00\x00\x00\x00\x00\x00\x24\x05\x7c"...)
	f.Add(info)
	f.Add([]byte{0xff, 0xf3, 0x90, 0x00})
	f.Fuzz(func(t *testing.T, b []byte) {
		h := readMP3Header(b)
		if h.skip < 0 || h.frames < -1 {
			t.Fatalf("header %+v", h)
		}
	})
}

// FuzzProbeFields: whatever ffprobe prints, its key=value lines parse
// without a panic and the first value of a key wins.
func FuzzProbeFields(f *testing.F) {
	f.Add([]byte("codec_name=aac\nsample_rate=48000\nchannels=2\nduration=1.000000\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		for k, v := range probeFields(b) {
			if strings.Contains(k, "\n") || strings.Contains(v, "\n") {
				t.Fatalf("%q=%q spans lines", k, v)
			}
		}
	})
}
