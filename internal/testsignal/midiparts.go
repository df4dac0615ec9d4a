package testsignal

import (
	"cmp"
	"slices"

	"fifthline/mts"
)

// MIDIPart is one player of a multi-part MIDI file: a General MIDI program
// (0-based) on its own channel, detuned by a pitch bend held throughout,
// playing notes at given times.
type MIDIPart struct {
	Program int
	Cents   float64 // pitch bend, within the default ±200 ¢ range (General MIDI)
	Notes   []TimedNote
	// Tuning, when set, is the part's keyboard as MIDI Tuning Standard
	// real-time single-note changes of all 128 keys, sent at time 0 as
	// tuning program i (bank 0) of part i, which its channel selects: each
	// part its own tuning.
	Tuning *mts.Keys
}

// TimedNote is a MIDI key (60 = C4) sounding from Start for Seconds, bent
// Cents further than its part (a just third in one chord of a part
// otherwise tempered).
type TimedNote struct {
	Key            int
	Start, Seconds float64
	Cents          float64
	// Velocity is the note-on's (1–127); 0 plays the takes' usual 96, a
	// mezzo-forte to forte.
	Velocity int
}

// BendCents is the pitch a bend sets, for the 14-bit value BendValue gives
// cents: the default range is ±2 semitones over ±8192 (MIDI 1.0 and General
// MIDI; common practice). Rounding to the 14-bit value moves it by at most
// 0.0122 ¢.
func BendCents(cents float64) float64 { return float64(BendValue(cents)-8192) * 200 / 8192 }

// BendValue is the 14-bit pitch-bend value nearest the given cents.
func BendValue(cents float64) int { return min(max(8192+int(cents*8192/200+0.5), 0), 16383) }

// MIDIParts builds a Standard MIDI File (format 0, 960 ticks a second as
// MIDI builds) with each part on channel i: its tuning, program and bend at
// time 0, then its notes; the last release rings for half a second. A part
// with a note of its own bend sets the bend again at each of its notes'
// starts.
func MIDIParts(parts []MIDIPart) []byte {
	type event struct {
		tick int
		msg  []byte
	}
	ticks := func(s float64) int { return int(s*mts.TicksPerSecond + 0.5) }
	// The tunings come first, then the channels select them (as the
	// keyboard command's files do).
	var t mts.Track
	for ch, p := range parts {
		if p.Tuning != nil {
			for _, m := range mts.SingleNoteChanges(mts.AllDevices, byte(ch), p.Tuning) {
				t.SysEx(0, m)
			}
			t.SelectChannelTuning(0, ch, 0, ch)
		}
	}
	var evs []event
	for ch, p := range parts {
		b := BendValue(p.Cents)
		evs = append(evs, event{0, []byte{0xC0 | byte(ch), byte(p.Program)}},
			event{0, []byte{0xE0 | byte(ch), byte(b & 0x7f), byte(b >> 7)}})
		perNote := slices.ContainsFunc(p.Notes, func(n TimedNote) bool { return n.Cents != 0 })
		for _, n := range p.Notes {
			if perNote {
				b := BendValue(p.Cents + n.Cents)
				evs = append(evs, event{ticks(n.Start), []byte{0xE0 | byte(ch), byte(b & 0x7f), byte(b >> 7)}})
			}
			evs = append(evs, event{ticks(n.Start), []byte{0x90 | byte(ch), byte(n.Key), byte(cmp.Or(n.Velocity, 96))}},
				event{ticks(n.Start + n.Seconds), []byte{0x80 | byte(ch), byte(n.Key), 0}})
		}
	}
	slices.SortStableFunc(evs, func(a, b event) int { return a.tick - b.tick })
	at := 0
	for _, e := range evs {
		t.Channel(e.tick-at, e.msg...)
		at = e.tick
	}
	return t.File(mts.TicksPerSecond / 2)
}
