package main

import (
	"bufio"
	"encoding/binary"
	"math"
	"os"
)

// writeWAV writes mono 32-bit IEEE float samples as a WAVE file (format tag
// 3 with a "fact" chunk, as the RIFF WAVE spec asks of non-PCM data), so
// aubio reads exactly the samples fifthline is fed.
func writeWAV(path string, rate int, x []float32) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	le := binary.LittleEndian
	data := uint32(4 * len(x))
	put := func(v any) { binary.Write(w, le, v) }
	w.WriteString("RIFF")
	put(uint32(4 + 8 + 18 + 8 + 4 + 8 + data))
	w.WriteString("WAVEfmt ")
	put(uint32(18))
	put(uint16(3)) // IEEE float
	put(uint16(1))
	put(uint32(rate))
	put(uint32(4 * rate))
	put(uint16(4))
	put(uint16(32))
	put(uint16(0))
	w.WriteString("fact")
	put(uint32(4))
	put(uint32(len(x)))
	w.WriteString("data")
	put(data)
	buf := make([]byte, 4)
	for _, v := range x {
		le.PutUint32(buf, math.Float32bits(v))
		w.Write(buf)
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
