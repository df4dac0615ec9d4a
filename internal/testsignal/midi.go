package testsignal

import "encoding/binary"

// MIDINote is one note of a phrase for MIDI: a key number (60 = C4) held
// for Seconds, then Rest seconds before the next note.
type MIDINote struct {
	Key           int
	Seconds, Rest float64
}

// MIDI builds a one-track Standard MIDI File (format 0, 480 ticks per
// quarter at the default 120 bpm: 960 ticks a second) that selects program
// (0-based General MIDI number) and plays the phrase, then lets the last
// release ring out for half a second. fluidsynth renders it against the
// FluidR3 soundfont for real instrument timbres.
func MIDI(program int, phrase []MIDINote) []byte {
	vlq := func(v int) []byte {
		b := []byte{byte(v & 0x7f)}
		for v >>= 7; v > 0; v >>= 7 {
			b = append([]byte{byte(v&0x7f | 0x80)}, b...)
		}
		return b
	}
	ticks := func(s float64) int { return int(s*960 + 0.5) }
	trk := []byte{0, 0xC0, byte(program)}
	wait := 0
	for _, n := range phrase {
		trk = append(trk, vlq(wait)...)
		trk = append(trk, 0x90, byte(n.Key), 96)
		trk = append(trk, vlq(ticks(n.Seconds))...)
		trk = append(trk, 0x80, byte(n.Key), 0)
		wait = ticks(n.Rest)
	}
	trk = append(trk, vlq(wait+480)...)
	trk = append(trk, 0xFF, 0x2F, 0)
	out := []byte("MThd\x00\x00\x00\x06\x00\x00\x00\x01\x01\xe0MTrk")
	out = binary.BigEndian.AppendUint32(out, uint32(len(trk)))
	return append(out, trk...)
}
