package mts

import (
	"errors"
	"fmt"
)

// Kind is which of the standard's messages a decoded message is.
type Kind int

// The forms this package writes.
const (
	KindSingleNote  Kind = iota // real-time single-note tuning change, 08 02
	KindBulkDump                // bulk tuning dump, 08 01
	KindScaleOctave             // scale/octave tuning, 2-byte form, 08 09
)

// KeyWord is one key's frequency in a decoded message; NoChange marks the
// reserved 7F 7F 7F.
type KeyWord struct {
	Key      int
	Word     Word
	NoChange bool
}

// Message is a decoded tuning message.
type Message struct {
	Kind            Kind
	RealTime        bool
	Device, Program byte
	Name            string      // bulk dump
	Keys            []KeyWord   // single-note changes and bulk dump
	Channels        uint16      // scale/octave: bit 0 = channel 1
	Offsets         [12]float64 // scale/octave: cents from equal temperament at A4 = 440 Hz
}

var errNotTuning = errors.New("not a MIDI Tuning Standard message this program writes")

// Decode reads one complete message, F0 to F7, by the standard's layout,
// checking its length, that every data byte is below 0x80 and the bulk
// dump's checksum.
func Decode(m []byte) (Message, error) {
	var msg Message
	if len(m) < 6 || m[0] != sysexStart || m[len(m)-1] != sysexEnd {
		return msg, errors.New("not a system exclusive message (F0 … F7)")
	}
	body := m[1 : len(m)-1]
	for i, b := range body {
		if b >= 0x80 {
			return msg, fmt.Errorf("byte %d is 0x%02X, not a data byte", i+1, b)
		}
	}
	if body[2] != subTuning {
		return msg, errNotTuning
	}
	msg.RealTime, msg.Device = body[0] == realTime, body[1]
	data := body[4:]
	switch {
	case body[0] == realTime && body[3] == subNotes:
		return decodeNotes(msg, data)
	case body[0] == nonRealTime && body[3] == subBulkDump:
		return decodeBulk(msg, body)
	case body[0] == nonRealTime && body[3] == subOctave2:
		return decodeOctave(msg, data)
	}
	return msg, errNotTuning
}

func decodeNotes(msg Message, data []byte) (Message, error) {
	msg.Kind = KindSingleNote
	if len(data) < 2 || len(data) != 2+4*int(data[1]) {
		return msg, errors.New("single-note tuning change: length does not match its key count")
	}
	msg.Program = data[0]
	for p := data[2:]; len(p) >= 4; p = p[4:] {
		w, ok := wordOf(p[1:4])
		msg.Keys = append(msg.Keys, KeyWord{Key: int(p[0]), Word: w, NoChange: !ok})
	}
	return msg, nil
}

func decodeBulk(msg Message, body []byte) (Message, error) {
	msg.Kind = KindBulkDump
	const size = 5 + nameLen + 3*128 + 1
	if len(body) != size {
		return msg, fmt.Errorf("bulk tuning dump: %d bytes between F0 and F7, want %d", len(body), size)
	}
	if sum := checksum(body[:size-1]); sum != body[size-1] {
		return msg, fmt.Errorf("bulk tuning dump: checksum 0x%02X, computed 0x%02X", body[size-1], sum)
	}
	msg.Program = body[4]
	msg.Name = string(body[5 : 5+nameLen])
	words := body[5+nameLen : size-1]
	for k := 0; k < 128; k++ {
		w, ok := wordOf(words[3*k : 3*k+3])
		msg.Keys = append(msg.Keys, KeyWord{Key: k, Word: w, NoChange: !ok})
	}
	return msg, nil
}

func decodeOctave(msg Message, data []byte) (Message, error) {
	msg.Kind = KindScaleOctave
	if len(data) != 3+2*12 {
		return msg, fmt.Errorf("scale/octave tuning (2-byte): %d data bytes, want 27", len(data))
	}
	if data[0] > 0x03 {
		return msg, fmt.Errorf("scale/octave tuning: channel byte 0x%02X sets bits beyond channels 15 and 16", data[0])
	}
	msg.Channels = uint16(data[0])<<14 | uint16(data[1])<<7 | uint16(data[2])
	for pc := range msg.Offsets {
		msg.Offsets[pc] = offsetCents(int(data[3+2*pc])<<7 | int(data[4+2*pc]))
	}
	return msg, nil
}

// Split cuts a stream of system exclusive messages (a .syx file) into
// messages, each from F0 to F7.
func Split(stream []byte) ([][]byte, error) {
	var out [][]byte
	for len(stream) > 0 {
		if stream[0] != sysexStart {
			return nil, fmt.Errorf("byte 0x%02X where a message should start with F0", stream[0])
		}
		end := 1
		for end < len(stream) && stream[end] < 0x80 {
			end++
		}
		if end == len(stream) || stream[end] != sysexEnd {
			return nil, errors.New("a message does not end with F7")
		}
		out = append(out, stream[:end+1])
		stream = stream[end+1:]
	}
	return out, nil
}
