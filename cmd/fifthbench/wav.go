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

// smf builds a one-track Standard MIDI File (format 0, 480 ticks per
// quarter at the default 120 bpm: 960 ticks a second) that selects program
// (0-based General MIDI number) and holds one note for seconds.
func smf(program, key int, seconds float64) []byte {
	vlq := func(v int) []byte {
		b := []byte{byte(v & 0x7f)}
		for v >>= 7; v > 0; v >>= 7 {
			b = append([]byte{byte(v&0x7f | 0x80)}, b...)
		}
		return b
	}
	var trk []byte
	trk = append(trk, 0, 0xC0, byte(program))
	trk = append(trk, 0, 0x90, byte(key), 96)
	trk = append(trk, vlq(int(seconds*960))...)
	trk = append(trk, 0x80, byte(key), 0)
	trk = append(trk, vlq(480)...) // let the release ring out
	trk = append(trk, 0xFF, 0x2F, 0)
	out := []byte("MThd\x00\x00\x00\x06\x00\x00\x00\x01\x01\xe0MTrk")
	out = binary.BigEndian.AppendUint32(out, uint32(len(trk)))
	return append(out, trk...)
}
