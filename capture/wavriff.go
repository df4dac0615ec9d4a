package capture

import (
	"encoding/binary"
	"io"
)

// A WAV file is a RIFF form: "RIFF", a 32-bit size, "WAVE", then chunks of
// a four-byte id, a 32-bit little-endian size and the body, padded to an
// even length (Microsoft/IBM Multimedia Programming Interface and Data
// Specifications 1.0, 1991). RF64 (EBU Tech 3306) and its successor BW64
// (ITU-R BS.2088) lift the 4 GiB limit of long multitrack sessions: the
// form is named "RF64" or "BW64", and a "ds64" chunk, first of all, holds
// 64-bit sizes for the form, the data chunk and any other chunk whose
// 32-bit size reads 0xFFFFFFFF:
//
//	ds64: riffSize u64, dataSize u64, sampleCount u64, tableLength u32,
//	      tableLength × (chunkId [4], chunkSize u64)

// deferredSize is the 32-bit size that says "look in ds64" (EBU Tech 3306).
const deferredSize = 0xFFFFFFFF

// Bounds on what a hostile header can make us do: chunk headers visited,
// ds64 table entries kept, and the largest metadata chunk read.
const (
	maxChunks    = 10_000
	maxDS64Table = 64
	maxFmtChunk  = 1024
)

// riffChunk is one chunk: its id, where its body starts and its length.
type riffChunk struct {
	id         string
	body, size int64
}

// ds64 holds the 64-bit sizes of an RF64/BW64 file.
type ds64 struct {
	dataSize int64
	table    map[string]int64
}

// walkRIFF checks the form header of a file of the given size and calls
// visit with each chunk in order until visit returns false, the chunks run
// out, or maxChunks have been seen. form is "RIFF", "RF64" or "BW64". A
// chunk that claims more than the file holds is passed with its claimed
// size; visit decides what that means. Every step advances at least 8
// bytes, so the walk ends.
func walkRIFF(path string, r io.ReaderAt, size int64, visit func(riffChunk) bool) (form string, err error) {
	if size == 0 {
		return "", fileErr(path, ErrNotAudio, "empty file")
	}
	var hdr [12]byte
	if n, _ := r.ReadAt(hdr[:], 0); n < len(hdr) {
		if n >= 4 && isRIFFForm(string(hdr[:4])) {
			return "", fileErr(path, ErrCorrupt, "truncated WAV header (%d bytes)", size)
		}
		return "", fileErr(path, ErrNotAudio, "not a WAV file (too short: %d bytes)", size)
	}
	form = string(hdr[:4])
	switch {
	case form == "RIFX":
		return "", fileErr(path, ErrUnsupported, "unsupported big-endian WAV variant \"RIFX\"")
	case !isRIFFForm(form) || string(hdr[8:12]) != "WAVE":
		return "", fileErr(path, ErrNotAudio, "not a WAV file (no RIFF/WAVE header)")
	}
	var big ds64
	for pos, seen := int64(12), 0; pos+8 <= size && seen < maxChunks; seen++ {
		var ch [8]byte
		if _, err := r.ReadAt(ch[:], pos); err != nil {
			return form, fileErr(path, ErrCorrupt, "cannot read chunk header at byte %d: %v", pos, err)
		}
		c := riffChunk{id: string(ch[:4]), body: pos + 8, size: int64(binary.LittleEndian.Uint32(ch[4:]))}
		if form != "RIFF" {
			if seen == 0 {
				if c.id != "ds64" {
					return form, fileErr(path, ErrCorrupt, "%s file without its ds64 chunk first", form)
				}
				if big, err = readDS64(path, r, c, size); err != nil {
					return form, err
				}
			} else if c.size == deferredSize {
				c.size = big.sizeOf(c.id)
			}
		}
		if !visit(c) || c.size > size-c.body {
			break
		}
		pos = c.body + c.size + c.size&1 // chunks are word aligned
	}
	return form, nil
}

func isRIFFForm(id string) bool { return id == "RIFF" || id == "RF64" || id == "BW64" }

// readDS64 reads the ds64 chunk c; a chunk too short for its three sizes
// and table length is corrupt, and table entries past maxDS64Table are
// ignored (the data chunk's size has its own field).
func readDS64(path string, r io.ReaderAt, c riffChunk, size int64) (ds64, error) {
	d := ds64{table: map[string]int64{}}
	if c.size < 28 || c.body+28 > size {
		return d, fileErr(path, ErrCorrupt, "corrupt ds64 chunk (%d bytes)", c.size)
	}
	b := make([]byte, 28+12*maxDS64Table)
	n, _ := r.ReadAt(b[:min(int64(len(b)), c.size, size-c.body)], c.body)
	le := binary.LittleEndian
	d.dataSize = clampSize(le.Uint64(b[8:16]))
	entries := min(int(le.Uint32(b[24:28])), (n-28)/12)
	for i := range entries {
		e := b[28+12*i:]
		d.table[string(e[:4])] = clampSize(le.Uint64(e[4:12]))
	}
	return d, nil
}

// sizeOf is the 64-bit size of the chunk with a deferred 32-bit size; one
// the table does not list keeps the 32-bit value.
func (d ds64) sizeOf(id string) int64 {
	if id == "data" {
		return d.dataSize
	}
	if s, ok := d.table[id]; ok {
		return s
	}
	return deferredSize
}

// clampSize keeps a hostile 64-bit size from overflowing int64 arithmetic.
func clampSize(v uint64) int64 { return int64(min(v, 1<<62)) }
