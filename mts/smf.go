package mts

import (
	"encoding/binary"
	"errors"
	"fmt"
)

// TicksPerSecond is the time base of the files Track writes: 480 ticks a
// quarter note at the Standard MIDI File's default tempo of 120 beats a
// minute.
const TicksPerSecond = 960

// Track builds the one track of a format-0 Standard MIDI File (MIDI
// Manufacturers Association, Standard MIDI Files 1.0). Each event is placed
// delta ticks after the one before it.
type Track struct{ data []byte }

// Channel adds a channel message (status byte first) without running status.
func (t *Track) Channel(delta int, msg ...byte) {
	t.data = appendVarLen(t.data, delta)
	t.data = append(t.data, msg...)
}

// SysEx adds a complete system exclusive message, F0 to F7; the file stores
// F0, the length of the rest, then the rest.
func (t *Track) SysEx(delta int, msg []byte) {
	t.data = appendVarLen(t.data, delta)
	t.data = append(t.data, sysexStart)
	t.data = appendVarLen(t.data, len(msg)-1)
	t.data = append(t.data, msg[1:]...)
}

// Registered parameter numbers of the tuning program and bank (MIDI 1.0,
// registered parameters 3 and 4), selected through controllers 101 and 100
// and set with data entry, controller 6.
const (
	rpnTuningProgram = 3
	rpnTuningBank    = 4
	ccDataEntry      = 6
	ccRPNLow         = 100
	ccRPNHigh        = 101
)

// SelectTuning makes every channel play tuning program of bank, then sets the
// parameter number to "none" (127, 127) so a stray data entry changes nothing.
func (t *Track) SelectTuning(delta, bank, program int) {
	for ch := 0; ch < 16; ch++ {
		t.SelectChannelTuning(delta, ch, bank, program)
		delta = 0
	}
}

// SelectChannelTuning makes one channel (0–15) play tuning program of bank,
// as SelectTuning does for all: parts of one file can each have their own.
func (t *Track) SelectChannelTuning(delta, channel, bank, program int) {
	ch := byte(channel) & 0x0F
	for _, p := range [][2]int{{rpnTuningBank, bank}, {rpnTuningProgram, program}} {
		t.Channel(delta, 0xB0|ch, ccRPNHigh, 0)
		delta = 0
		t.Channel(0, 0xB0|ch, ccRPNLow, byte(p[0]))
		t.Channel(0, 0xB0|ch, ccDataEntry, byte(p[1])&0x7F)
	}
	t.Channel(0, 0xB0|ch, ccRPNHigh, 127)
	t.Channel(0, 0xB0|ch, ccRPNLow, 127)
}

// File ends the track ringOut ticks after its last event (time for a
// release to sound) and returns the whole file.
func (t *Track) File(ringOut int) []byte {
	trk := append(appendVarLen(append([]byte(nil), t.data...), ringOut), 0xFF, 0x2F, 0x00)
	out := []byte("MThd\x00\x00\x00\x06\x00\x00\x00\x01")
	out = binary.BigEndian.AppendUint16(out, TicksPerSecond/2)
	out = append(out, "MTrk"...)
	out = binary.BigEndian.AppendUint32(out, uint32(len(trk)))
	return append(out, trk...)
}

// appendVarLen writes a variable-length quantity: seven bits a byte, most
// significant first, the top bit set on all but the last.
func appendVarLen(b []byte, v int) []byte {
	var tmp [5]byte
	i := len(tmp) - 1
	tmp[i] = byte(v & 0x7F)
	for v >>= 7; v > 0; v >>= 7 {
		i--
		tmp[i] = byte(v&0x7F) | 0x80
	}
	return append(b, tmp[i:]...)
}

// Event is one event read back from a file: its time in ticks from the start
// and its bytes (a system exclusive message from F0 to F7, or a channel
// message with its status byte).
type Event struct {
	Tick int
	Msg  []byte
}

// ReadFile reads the events of every track of a Standard MIDI File, skipping
// meta events, in file order.
func ReadFile(data []byte) ([]Event, error) {
	if len(data) < 14 || string(data[:4]) != "MThd" {
		return nil, errors.New("not a Standard MIDI File (no MThd)")
	}
	hlen := int(binary.BigEndian.Uint32(data[4:8]))
	if hlen < 6 || hlen > len(data)-8 {
		return nil, errors.New("header chunk length out of range")
	}
	var events []Event
	for rest := data[8+hlen:]; len(rest) >= 8; {
		n := binary.BigEndian.Uint32(rest[4:8])
		if uint64(n) > uint64(len(rest)-8) {
			return nil, fmt.Errorf("%q chunk runs past the end of the file", rest[:4])
		}
		if string(rest[:4]) == "MTrk" {
			evs, err := readTrack(rest[8 : 8+n])
			if err != nil {
				return nil, err
			}
			events = append(events, evs...)
		}
		rest = rest[8+n:]
	}
	return events, nil
}

var errShort = errors.New("track ends inside an event")

func readTrack(p []byte) ([]Event, error) {
	var events []Event
	tick, status := 0, byte(0)
	for len(p) > 0 {
		delta, n := varLen(p)
		if n == 0 {
			return nil, errShort
		}
		tick += delta
		p = p[n:]
		if len(p) == 0 {
			return nil, errShort
		}
		switch b := p[0]; {
		case b == 0xFF: // meta event: type, length, data
			if len(p) < 2 {
				return nil, errShort
			}
			l, n := varLen(p[2:])
			if n == 0 || l > len(p)-2-n {
				return nil, errShort
			}
			p = p[2+n+l:]
		case b == sysexStart || b == sysexEnd:
			l, n := varLen(p[1:])
			if n == 0 || l > len(p)-1-n {
				return nil, errShort
			}
			msg := append([]byte{sysexStart}, p[1+n:1+n+l]...)
			if b == sysexStart {
				events = append(events, Event{tick, msg})
			}
			p = p[1+n+l:]
		case b > sysexStart:
			return nil, fmt.Errorf("status 0x%02X has no place in a file's track", b)
		default:
			if b >= 0x80 {
				status, p = b, p[1:]
			} else if status == 0 {
				return nil, errors.New("data byte without a status byte")
			}
			size := 2
			if status>>4 == 0xC || status>>4 == 0xD {
				size = 1
			}
			if len(p) < size {
				return nil, errShort
			}
			events = append(events, Event{tick, append([]byte{status}, p[:size]...)})
			p = p[size:]
		}
	}
	return events, nil
}

// varLen reads a variable-length quantity of at most four bytes; n is 0 when
// it is cut off or too long.
func varLen(p []byte) (v, n int) {
	for n < len(p) && n < 4 {
		c := p[n]
		n++
		v = v<<7 | int(c&0x7F)
		if c < 0x80 {
			return v, n
		}
	}
	return 0, 0
}
