package capture

import (
	"bufio"
	"encoding/binary"
	"io"
	"math"
	"time"
)

// OpenWAV opens a WAV file and reads its first channel.
func OpenWAV(path string) (*Recording, error) { return OpenWAVChannel(path, 1) }

// OpenWAVChannel opens a WAV file and reads the given channel, counted from
// 1 as on a mixing desk; 0 also means the first channel.
func OpenWAVChannel(path string, channel int) (*Recording, error) {
	return openWith(path, channel, func(f io.ReaderAt, size int64) (*Recording, error) {
		return newWAV(path, f, size, channel, time.Local)
	})
}

// openWith opens path and hands it to a format's reader, closing the file
// if that fails.
func openWith(path string, channel int, open func(io.ReaderAt, int64) (*Recording, error)) (*Recording, error) {
	f, size, err := openFile(path)
	if err != nil {
		return nil, err
	}
	r, err := open(f, size)
	if err != nil {
		f.Close()
		return nil, err
	}
	r.closer = f
	return r, nil
}

// wavLayout is where a WAV file keeps its samples and how they are encoded.
type wavLayout struct {
	wavFormat
	form       string // "RIFF", "RF64" or "BW64"
	dataOffset int64
	dataSize   int64 // bytes actually present, at most what the header says
	truncated  bool  // the data chunk claims more bytes than the file holds
	bext       []byte
}

// scanWAV walks the chunks of a file of the given size without reading
// sample data: the format chunk, the data chunk and a bext chunk.
func scanWAV(path string, r io.ReaderAt, size int64) (wavLayout, error) {
	var l wavLayout
	var fmtChunk []byte
	var problem error
	haveData := false
	form, err := walkRIFF(path, r, size, func(c riffChunk) bool {
		switch {
		case c.id == "fmt " && fmtChunk == nil:
			if fmtChunk, problem = readChunk(path, r, c, size, 16, maxFmtChunk, "format"); problem != nil {
				return false
			}
		case c.id == "bext" && l.bext == nil:
			// Only the fixed part is read: CodingHistory can be long.
			l.bext, _ = readChunk(path, r, riffChunk{c.id, c.body, min(c.size, bextFixed)}, size, 0, bextFixed, "bext")
		case c.id == "data" && !haveData:
			haveData = true
			l.dataOffset, l.dataSize = c.body, min(c.size, size-c.body)
			l.truncated = l.dataSize < c.size
		}
		return fmtChunk == nil || !haveData || l.bext == nil
	})
	switch {
	case err != nil:
		return l, err
	case problem != nil:
		return l, problem
	case fmtChunk == nil:
		return l, fileErr(path, ErrCorrupt, "no format chunk (truncated or corrupt header)")
	case !haveData:
		return l, fileErr(path, ErrCorrupt, "no data chunk (truncated or corrupt file)")
	}
	l.form = form
	l.wavFormat, err = parseFormat(path, fmtChunk)
	return l, err
}

// readChunk reads a metadata chunk's body, refusing one outside
// [least, most] bytes or cut off by the end of the file.
func readChunk(path string, r io.ReaderAt, c riffChunk, size, least, most int64, what string) ([]byte, error) {
	if c.size < least || c.size > most {
		return nil, fileErr(path, ErrCorrupt, "corrupt %s chunk (%d bytes)", what, c.size)
	}
	if c.body+c.size > size {
		return nil, fileErr(path, ErrCorrupt, "truncated %s chunk", what)
	}
	b := make([]byte, c.size)
	if _, err := r.ReadAt(b, c.body); err != nil {
		return nil, fileErr(path, ErrCorrupt, "cannot read %s chunk: %v", what, err)
	}
	return b, nil
}

// newWAV reads the header from r, which holds size bytes, and prepares to
// stream it, reading the bext origination time in loc. It is OpenWAV
// without the file system.
func newWAV(path string, r io.ReaderAt, size int64, channel int, loc *time.Location) (*Recording, error) {
	l, err := scanWAV(path, r, size)
	if err != nil {
		return nil, err
	}
	ba := int64(l.blockAlign)
	frames := l.dataSize / ba
	rec := &Recording{
		path: path, format: "WAV", encoding: l.encoding(),
		rate: l.rate, channels: l.channels, frames: frames, truncated: l.truncated,
		dec: newInterleaved(io.NewSectionReader(r, l.dataOffset, frames*ba), l.channels, l.bits/8, sampleDecoder(l.tag, l.bits)),
	}
	if l.form != "RIFF" {
		rec.format = l.form
	}
	if l.bext != nil {
		bc := parseBext(l.bext, loc)
		rec.bext = &bc
	}
	return rec, rec.choose(channel)
}

// interleaved decodes frames of interleaved fixed-size samples from a
// byte stream: WAV data, and the PCM that the MP3 decoder and ffmpeg give.
type interleaved struct {
	r        *bufio.Reader
	channels int
	width    int // bytes per sample
	sample   func([]byte) float32
	scratch  []byte
}

func newInterleaved(r io.Reader, channels, width int, sample func([]byte) float32) *interleaved {
	frame := channels * width
	return &interleaved{
		r: bufio.NewReaderSize(r, 64<<10), channels: channels, width: width, sample: sample,
		scratch: make([]byte, max(1, 32<<10/frame)*frame), // whole frames, about 32 KiB
	}
}

func (d *interleaved) decode(dst [][]float32) (int, error) {
	frame := d.channels * d.width
	want := 0
	for _, p := range dst {
		want = max(want, len(p))
	}
	got, err := io.ReadFull(d.r, d.scratch[:min(want, len(d.scratch)/frame)*frame])
	n := got / frame // a torn last frame is dropped
	if err == io.ErrUnexpectedEOF || (err == io.EOF && n == 0) {
		err = io.EOF
	}
	for c, p := range dst {
		if p == nil {
			continue
		}
		for i, at := 0, c*d.width; i < n; i, at = i+1, at+frame {
			p[i] = d.sample(d.scratch[at : at+d.width])
		}
	}
	if n > 0 && err == io.EOF {
		err = nil // the end is said on the next call
	}
	return n, err
}

// sampleDecoder maps one little-endian sample to [-1, 1]. Integer PCM is
// divided by 2^(bits-1) and 8-bit PCM is unsigned with 128 as silence
// (WAVE specification); A-law and µ-law expand by ITU-T G.711 to 16-bit
// values. sox scales all of them the same way.
func sampleDecoder(tag uint16, bits int) func([]byte) float32 {
	switch {
	case tag == tagFloat && bits == 64:
		return func(b []byte) float32 { return fullScale(math.Float64frombits(binary.LittleEndian.Uint64(b))) }
	case tag == tagFloat:
		return func(b []byte) float32 { return fullScale(float64(math.Float32frombits(binary.LittleEndian.Uint32(b)))) }
	case tag == tagALaw:
		return func(b []byte) float32 { return float32(aLaw[b[0]]) / (1 << 15) }
	case tag == tagMuLaw:
		return func(b []byte) float32 { return float32(muLaw[b[0]]) / (1 << 15) }
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

// aLaw and muLaw expand G.711 code words to 16-bit linear values (ITU-T
// Recommendation G.711, 1988: A-law's 13-bit and µ-law's 14-bit ranges,
// scaled to 16 bits as is usual).
var aLaw, muLaw = g711Tables()

func g711Tables() (a, u [256]int16) {
	for i := range 256 {
		x := byte(i) ^ 0x55 // A-law inverts the even bits
		t := int(x&0x0f)<<4 + 8
		if seg := int(x&0x70) >> 4; seg > 0 {
			t = (t + 0x100) << (seg - 1)
		}
		if x&0x80 == 0 {
			t = -t
		}
		a[i] = int16(t)

		y := ^byte(i) // µ-law inverts every bit
		m := (int(y&0x0f)<<3 + 0x84) << (int(y&0x70) >> 4)
		if y&0x80 != 0 {
			u[i] = int16(0x84 - m)
		} else {
			u[i] = int16(m - 0x84)
		}
	}
	return a, u
}
