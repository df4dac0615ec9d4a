package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"fifthline/source"
)

// Every format OpenWAV reads, made by sox, must decode to the samples sox
// itself decodes, with the rate, channel count and length `sox --i` reports.
func TestOpenWAVAgreesWithSox(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name     string
		format   []string // sox output options
		synth    []string
		channel  int
		encoding string
	}{
		{"pcm16-44k1.wav", []string{"-r", "44100", "-b", "16"}, []string{"0.3", "sine", "440"}, 1, "16-bit PCM"},
		{"pcm24-48k-extensible.wav", []string{"-r", "48000", "-b", "24"}, []string{"0.3", "sine", "440"}, 1, "24-bit PCM"},
		{"pcm24-48k-plain.wav", []string{"-r", "48000", "-b", "24", "-t", "wavpcm"}, []string{"0.3", "sine", "440"}, 1, "24-bit PCM"},
		{"pcm32-96k.wav", []string{"-r", "96000", "-b", "32"}, []string{"0.2", "sine", "440"}, 1, "32-bit PCM"},
		{"pcm8-8k.wav", []string{"-r", "8000", "-b", "8"}, []string{"0.3", "sine", "440"}, 1, "8-bit PCM"},
		{"float32-22k05.wav", []string{"-r", "22050", "-e", "floating-point", "-b", "32"}, []string{"0.3", "sine", "440"}, 1, "32-bit float"},
		{"float64-48k.wav", []string{"-r", "48000", "-e", "floating-point", "-b", "64"}, []string{"0.3", "sine", "440"}, 1, "64-bit float"},
		{"stereo16-left.wav", []string{"-r", "48000", "-b", "16", "-c", "2"}, []string{"0.3", "sine", "440", "sine", "660"}, 1, "16-bit PCM"},
		{"stereo16-right.wav", []string{"-r", "48000", "-b", "16", "-c", "2"}, []string{"0.3", "sine", "440", "sine", "660"}, 2, "16-bit PCM"},
		{"three-ch24-third.wav", []string{"-r", "32000", "-b", "24", "-c", "3"}, []string{"0.3", "sine", "220", "sine", "440", "square", "880"}, 3, "24-bit PCM"},
		{"alaw-8k.wav", []string{"-r", "8000", "-e", "a-law"}, []string{"0.3", "sine", "440"}, 1, "A-law"},
		{"mulaw-8k.wav", []string{"-r", "8000", "-e", "u-law"}, []string{"0.3", "sine", "440"}, 1, "µ-law"},
		{"odd-rate16.wav", []string{"-r", "11025", "-b", "16"}, []string{"0.3", "sine", "440", "gain", "-3"}, 1, "16-bit PCM"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path := soxFile(t, dir, c.name, c.format, c.synth...)
			w, err := OpenWAVChannel(path, c.channel)
			if err != nil {
				t.Fatal(err)
			}
			defer w.Close()
			if got, want := int64(w.SampleRate()), soxInfo(t, "-r", path); got != want {
				t.Errorf("SampleRate = %d, sox --i -r says %d", got, want)
			}
			if got, want := int64(w.Channels()), soxInfo(t, "-c", path); got != want {
				t.Errorf("Channels = %d, sox --i -c says %d", got, want)
			}
			if got, want := w.Frames(), soxInfo(t, "-s", path); got != want {
				t.Errorf("Frames = %d, sox --i -s says %d", got, want)
			}
			if got := w.Encoding(); got != c.encoding {
				t.Errorf("Encoding = %q, want %q", got, c.encoding)
			}
			got := readAll(t, w, 1000)
			want := soxSamples(t, path, c.channel)
			if len(got) != len(want) {
				t.Fatalf("read %d samples, sox decodes %d", len(got), len(want))
			}
			// Both sides convert exactly; 1e-7 only absorbs float32 rounding.
			if d := maxDiff(got, want); d > 1e-7 {
				t.Errorf("samples differ from sox by up to %g", d)
			}
		})
	}
}

// Reading one sample at a time and in huge blocks gives the same stream.
func TestWAVReadBlockSizes(t *testing.T) {
	path := soxFile(t, t.TempDir(), "tone.wav", []string{"-r", "48000", "-b", "24"}, "0.2", "sine", "440")
	var streams [][]float32
	for _, block := range []int{1, 7, 4096, 1 << 20} {
		w, err := OpenWAV(path)
		if err != nil {
			t.Fatal(err)
		}
		streams = append(streams, readAll(t, w, block))
		w.Close()
	}
	for i, s := range streams[1:] {
		if len(s) != len(streams[0]) || maxDiff(s, streams[0]) != 0 {
			t.Errorf("block size #%d gives a different stream", i+1)
		}
	}
	if w, _ := OpenWAV(path); w != nil {
		if d := w.Duration(); d != 0.2 {
			t.Errorf("Duration = %v s, want 0.2 (sox synth 0.2)", d)
		}
		w.Close()
		w.Close() // a second Close is harmless
		if _, err := w.Read(make([]float32, 8)); !errors.Is(err, os.ErrClosed) {
			t.Errorf("Read after Close: %v, want os.ErrClosed", err)
		}
	}
}

// A file cut inside its sample data still yields the whole frames it holds.
func TestWAVTruncatedData(t *testing.T) {
	dir := t.TempDir()
	full := soxFile(t, dir, "full.wav", []string{"-r", "8000", "-b", "16", "-t", "wavpcm"}, "0.1", "sine", "440")
	b, err := os.ReadFile(full)
	if err != nil {
		t.Fatal(err)
	}
	cut := filepath.Join(dir, "cut.wav")
	// The plain 16-bit header sox writes is 44 bytes; keep 100 frames and a half.
	if err := os.WriteFile(cut, b[:44+201], 0o644); err != nil {
		t.Fatal(err)
	}
	w, err := OpenWAV(cut)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	if !w.Truncated() || w.Frames() != 100 {
		t.Errorf("Truncated = %v, Frames = %d; want true, 100", w.Truncated(), w.Frames())
	}
	if got := readAll(t, w, 64); maxDiff(got, soxSamples(t, full, 1)[:100]) > 0 || len(got) != 100 {
		t.Errorf("truncated file does not yield its first 100 samples")
	}
}

// sox writing to a pipe cannot go back to fill in the sizes, so it leaves
// a placeholder (0x7ffff000 bytes); the file is read to its end.
func TestWAVWithPlaceholderSizeFromPipe(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "piped.wav")
	if err := os.WriteFile(path, sox(t, "-n", "-r", "8000", "-b", "16", "-t", "wav", "-", "synth", "0.1", "sine", "440"), 0o644); err != nil {
		t.Fatal(err)
	}
	w, err := OpenWAV(path)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	got, want := readAll(t, w, 256), soxSamples(t, path, 1)
	if len(got) != 800 || len(want) != 800 || maxDiff(got, want) > 0 {
		t.Errorf("read %d samples, sox %d, want 800 equal ones (0.1 s at 8 kHz)", len(got), len(want))
	}
}

// Bad input is one line naming the file and the problem, never a panic.
func TestOpenWAVErrors(t *testing.T) {
	dir := t.TempDir()
	good, err := os.ReadFile(soxFile(t, dir, "good.wav", []string{"-r", "8000", "-b", "16", "-t", "wavpcm"}, "0.01", "sine", "440"))
	if err != nil {
		t.Fatal(err)
	}
	// patched copies a byte range of the good plain 44-byte-header file.
	patched := func(at int, v ...byte) []byte {
		b := append([]byte(nil), good...)
		copy(b[at:], v)
		return b
	}
	u16 := func(v uint16) []byte { return binary.LittleEndian.AppendUint16(nil, v) }
	files := map[string][]byte{
		"empty.wav":          {},
		"text.wav":           []byte("these are rehearsal notes, not sound\n"),
		"short.wav":          []byte("RIFF\x10\x00"),
		"cut-header.wav":     good[:30],
		"no-data.wav":        good[:36],
		"zero-channels.wav":  patched(22, u16(0)...),
		"zero-rate.wav":      patched(24, 0, 0, 0, 0),
		"rate-4GHz.wav":      patched(24, 0xff, 0xff, 0xff, 0xff),
		"bad-align.wav":      patched(32, u16(3)...),
		"fmt-too-short.wav":  patched(16, 4, 0, 0, 0),
		"huge-fmt.wav":       patched(16, 0xff, 0xff, 0xff, 0x7f),
		"rf64.wav":           patched(0, 'R', 'F', '6', '4'),
		"mp3-tag.wav":        patched(20, u16(0x55)...),
		"unknown-tag.wav":    patched(20, u16(0x1234)...),
		"pcm-64-bit.wav":     patched(34, u16(64)...),
		"float-16-bit.wav":   patched(20, u16(tagFloat)...),
		"extensible-cut.wav": patched(20, u16(tagExtensible)...),
	}
	for name, b := range files {
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	cases := []struct {
		path    string
		channel int
		kind    error
		says    string
	}{
		{filepath.Join(dir, "missing.wav"), 1, fs.ErrNotExist, "no such file"},
		{dir, 1, ErrNotAudio, "is a folder"},
		{filepath.Join(dir, "empty.wav"), 1, ErrNotAudio, "empty file"},
		{filepath.Join(dir, "text.wav"), 1, ErrNotAudio, "not a WAV file"},
		{filepath.Join(dir, "short.wav"), 1, ErrCorrupt, "truncated WAV header"},
		{filepath.Join(dir, "cut-header.wav"), 1, ErrCorrupt, "truncated format chunk"},
		{filepath.Join(dir, "no-data.wav"), 1, ErrCorrupt, "no data chunk"},
		{filepath.Join(dir, "zero-channels.wav"), 1, ErrCorrupt, "zero channels"},
		{filepath.Join(dir, "zero-rate.wav"), 1, ErrCorrupt, "zero sample rate"},
		{filepath.Join(dir, "rate-4GHz.wav"), 1, ErrUnsupported, "sample rate 4294967295 Hz is outside"},
		{filepath.Join(dir, "bad-align.wav"), 1, ErrCorrupt, "block align 3"},
		{filepath.Join(dir, "fmt-too-short.wav"), 1, ErrCorrupt, "corrupt format chunk (4 bytes)"},
		{filepath.Join(dir, "huge-fmt.wav"), 1, ErrCorrupt, "corrupt format chunk"},
		{filepath.Join(dir, "rf64.wav"), 1, ErrCorrupt, "RF64 file without its ds64 chunk first"},
		{filepath.Join(dir, "mp3-tag.wav"), 1, ErrUnsupported, "MP3"},
		{filepath.Join(dir, "unknown-tag.wav"), 1, ErrUnsupported, "0x1234"},
		{filepath.Join(dir, "pcm-64-bit.wav"), 1, ErrUnsupported, "64 bits"},
		{filepath.Join(dir, "float-16-bit.wav"), 1, ErrUnsupported, "float sample size 16"},
		{filepath.Join(dir, "extensible-cut.wav"), 1, ErrCorrupt, "extensible format chunk too short"},
		{filepath.Join(dir, "good.wav"), 2, ErrUnsupported, "channel 2 requested but the file has one channel"},
		{filepath.Join(dir, "good.wav"), -1, ErrUnsupported, "channel -1"},
	}
	for _, c := range cases {
		t.Run(filepath.Base(c.path), func(t *testing.T) {
			w, err := OpenWAVChannel(c.path, c.channel)
			if err == nil {
				w.Close()
				t.Fatalf("opened; want an error saying %q", c.says)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, c.path+": ") || !strings.Contains(msg, c.says) || strings.Contains(msg, "\n") {
				t.Errorf("error %q: want one line starting %q and saying %q", msg, c.path+": ", c.says)
			}
			if !errors.Is(err, c.kind) {
				t.Errorf("error %q is not %v", msg, c.kind)
			}
		})
	}
}

// WAVFile is a Source; a finite one ends with io.EOF and stays ended.
func TestWAVEndsWithEOF(t *testing.T) {
	path := soxFile(t, t.TempDir(), "short.wav", []string{"-r", "8000", "-b", "16"}, "0.001", "sine", "440")
	w, err := OpenWAV(path)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	var s source.Source = w
	buf := make([]float32, 100)
	if n, err := s.Read(buf); n != 8 || err != nil {
		t.Fatalf("first Read = %d, %v; want 8 samples (1 ms at 8 kHz)", n, err)
	}
	for range 2 {
		if n, err := s.Read(buf); n != 0 || err != io.EOF {
			t.Fatalf("Read at end = %d, %v; want 0, io.EOF", n, err)
		}
	}
}

// sox writes float as plain WAVE_FORMAT_IEEE_FLOAT; the same samples behind
// an extensible header (sub-format IEEE float) must read the same, and sox
// reads the rebuilt file to the same samples too.
func TestWAVExtensibleFloat(t *testing.T) {
	dir := t.TempDir()
	plain, err := os.ReadFile(soxFile(t, dir, "plain.wav", []string{"-r", "44100", "-e", "floating-point", "-b", "32", "-c", "2"}, "0.1", "sine", "440", "sine", "550"))
	if err != nil {
		t.Fatal(err)
	}
	at := bytes.Index(plain, []byte("data"))
	ext := filepath.Join(dir, "extensible.wav")
	if err := os.WriteFile(ext, wavBytes(tagExtensible, 2, 44100, 32, tagFloat, nil, plain[at+8:]), 0o644); err != nil {
		t.Fatal(err)
	}
	for ch := 1; ch <= 2; ch++ {
		w, err := OpenWAVChannel(ext, ch)
		if err != nil {
			t.Fatal(err)
		}
		got := readAll(t, w, 1000)
		w.Close()
		want := soxSamples(t, filepath.Join(dir, "plain.wav"), ch)
		if w.Encoding() != "32-bit float" || len(got) != 4410 || maxDiff(got, want) != 0 || maxDiff(soxSamples(t, ext, ch), want) != 0 {
			t.Errorf("channel %d: %s, %d samples; want 32-bit float, 4410 samples equal to sox's", ch, w.Encoding(), len(got))
		}
	}
}

// An RF64 file built from EBU Tech 3306's layout, its data size only in
// ds64, reads its samples; so does the same under ITU-R BS.2088's "BW64".
func TestRF64SizesFromDS64(t *testing.T) {
	pcm := []byte{0, 0, 0xff, 0x7f, 0, 0x80, 1, 0} // 0, 32767, -32768, 1
	want := []float32{0, 32767.0 / 32768, -1, 1.0 / 32768}
	for _, form := range []string{"RF64", "BW64"} {
		b := rf64Bytes(wavBytes(tagPCM, 1, 48000, 16, 0, nil, pcm))
		copy(b, form)
		r, err := newWAV("long.wav", bytes.NewReader(b), int64(len(b)), 1, time.UTC)
		if err != nil {
			t.Fatal(err)
		}
		if got := readAll(t, r, 3); r.Format() != form || r.Frames() != 4 || maxDiff(got, want) != 0 || len(got) != 4 {
			t.Errorf("%s: format %s, %d frames, samples %v; want %v", form, r.Format(), r.Frames(), got, want)
		}
	}
}
