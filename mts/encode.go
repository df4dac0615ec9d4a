package mts

import (
	"fmt"
	"math"
)

// Keys is a tuning of all 128 MIDI keys, one word each.
type Keys [128]Word

// AllDevices is the device ID every receiver answers to (the "all call").
const AllDevices = 0x7F

// AllChannels is the scale/octave form's channel mask for channels 1 to 16
// (bit 0 is channel 1).
const AllChannels = 0xFFFF

// Universal System Exclusive framing and the standard's sub-IDs.
const (
	sysexStart  = 0xF0
	sysexEnd    = 0xF7
	nonRealTime = 0x7E
	realTime    = 0x7F
	subTuning   = 0x08 // sub-ID #1: MIDI Tuning Standard
	subBulkDump = 0x01 // sub-ID #2: bulk tuning dump (non-real-time)
	subNotes    = 0x02 // single-note tuning change (real-time)
	subOctave2  = 0x09 // scale/octave tuning, 2-byte form
	nameLen     = 16
)

// maxChanges is how many keys one single-note message may change: the count
// travels in one data byte.
const maxChanges = 127

// SingleNoteChanges is the real-time single-note tuning change
// (F0 7F dev 08 02 program count [key word]... F7) for every key, split into
// as few messages of as equal a size as the one-byte count allows.
func SingleNoteChanges(device, program byte, keys *Keys) [][]byte {
	parts := (len(keys) + maxChanges - 1) / maxChanges
	per := (len(keys) + parts - 1) / parts
	var out [][]byte
	for first := 0; first < len(keys); first += per {
		last := min(first+per, len(keys))
		m := []byte{sysexStart, realTime, device & 0x7F, subTuning, subNotes, program & 0x7F, byte(last - first)}
		for k := first; k < last; k++ {
			b := keys[k].Bytes()
			m = append(m, byte(k), b[0], b[1], b[2])
		}
		out = append(out, append(m, sysexEnd))
	}
	return out
}

// BulkDump is the bulk tuning dump (F0 7E dev 08 01 program name[16]
// word×128 checksum F7). The name is cut or padded with spaces to 16
// characters; what is not printable ASCII becomes '?'.
func BulkDump(device, program byte, name string, keys *Keys) []byte {
	m := []byte{sysexStart, nonRealTime, device & 0x7F, subTuning, subBulkDump, program & 0x7F}
	for i := 0; i < nameLen; i++ {
		c := byte(' ')
		if i < len(name) {
			c = name[i]
		}
		if c < 0x20 || c > 0x7E {
			c = '?'
		}
		m = append(m, c)
	}
	for _, w := range keys {
		b := w.Bytes()
		m = append(m, b[:]...)
	}
	return append(m, checksum(m[1:]), sysexEnd)
}

// checksum is the bulk dump's: the exclusive-or of every byte after F0 up to
// the checksum, kept to seven bits.
func checksum(b []byte) byte {
	var x byte
	for _, c := range b {
		x ^= c
	}
	return x & 0x7F
}

// OffsetRange is how far the 2-byte scale/octave form reaches either side of
// equal temperament, in cents.
const OffsetRange = 100.0

// RangeError says which pitch class's offset the scale/octave form cannot
// carry.
type RangeError struct {
	PitchClass int // 0 = C … 11 = B
	Cents      float64
}

func (e *RangeError) Error() string {
	return fmt.Sprintf("pitch class %d lies %+.1f ¢ from equal temperament at A4 = 440 Hz, beyond the scale/octave form's ±100 ¢", e.PitchClass, e.Cents)
}

// ScaleOctave2 is the non-real-time scale/octave tuning in its 2-byte form
// (F0 7E dev 08 09 ff gg hh [ss tt]×12 F7): each pitch class's offset in
// cents from equal temperament at A4 = 440 Hz, C first, applied to the
// channels in the mask (bit 0 = channel 1). An offset beyond ±100 ¢ is a
// *RangeError naming the farthest.
func ScaleOctave2(device byte, channels uint16, offsets [12]float64) ([]byte, error) {
	var worst *RangeError
	for pc, c := range offsets {
		if !(math.Abs(c) <= OffsetRange) && (worst == nil || !(math.Abs(c) <= math.Abs(worst.Cents))) {
			worst = &RangeError{PitchClass: pc, Cents: c}
		}
	}
	if worst != nil {
		return nil, worst
	}
	m := []byte{sysexStart, nonRealTime, device & 0x7F, subTuning, subOctave2,
		byte(channels>>14) & 0x03, byte(channels>>7) & 0x7F, byte(channels) & 0x7F}
	for _, c := range offsets {
		v := offsetValue(c)
		m = append(m, byte(v>>7), byte(v)&0x7F)
	}
	return append(m, sysexEnd), nil
}

// offsetValue is the 14-bit value of an offset: 0 is −100 ¢, 0x2000 equal
// temperament, 0x3FFF +100 ¢ (which the linear steps of 100/8192 ¢ reach
// only to within one step).
func offsetValue(cents float64) int {
	return min(0x2000+int(math.Round(cents*0x2000/OffsetRange)), 0x3FFF)
}

// offsetCents is offsetValue's inverse.
func offsetCents(v int) float64 { return float64(v-0x2000) * OffsetRange / 0x2000 }
