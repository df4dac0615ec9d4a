package testsignal

import "fifthline/mts"

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
	ticks := func(s float64) int { return int(s*mts.TicksPerSecond + 0.5) }
	var t mts.Track
	t.Channel(0, 0xC0, byte(program))
	wait := 0
	for _, n := range phrase {
		t.Channel(wait, 0x90, byte(n.Key), 96)
		t.Channel(ticks(n.Seconds), 0x80, byte(n.Key), 0)
		wait = ticks(n.Rest)
	}
	return t.File(wait + mts.TicksPerSecond/2)
}
