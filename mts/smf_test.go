package mts

import (
	"bytes"
	"testing"
)

// A format-0 file: header chunk MThd of length 6 (format 0, one track, 480
// ticks a quarter), then MTrk; a system exclusive event is F0, the length of
// what follows as a variable-length quantity, then the bytes through F7; the
// track ends with the meta event FF 2F 00 (MMA, Standard MIDI Files 1.0).
func TestTrackWritesAStandardMIDIFile(t *testing.T) {
	var tr Track
	msg := BulkDump(AllDevices, 0, "x", equal440())
	tr.SysEx(0, msg)
	tr.SelectTuning(0, 0, 2)
	f := tr.File(0)
	if want := []byte("MThd\x00\x00\x00\x06\x00\x00\x00\x01\x01\xe0MTrk"); !bytes.Equal(f[:18], want) {
		t.Fatalf("header % X, want % X", f[:18], want)
	}
	// delta 0, F0, length 407 = 83 17 as a variable-length quantity
	if got := f[22:26]; !bytes.Equal(got, []byte{0x00, 0xF0, 0x83, 0x17}) {
		t.Errorf("sysex event starts % X, want 00 F0 83 17", got)
	}
	if !bytes.HasSuffix(f, []byte{0x00, 0xFF, 0x2F, 0x00}) {
		t.Errorf("no end of track: % X", f[len(f)-4:])
	}
	events, err := ReadFile(f)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(events[0].Msg, msg) {
		t.Errorf("the dump did not come back whole")
	}
	// Every channel: registered parameter 4 (tuning bank) = 0, 3 (tuning
	// program) = 2, then the null parameter 127/127 (MIDI 1.0 registered
	// parameter numbers: controller 101 MSB, 100 LSB, 6 data entry).
	rest := events[1:]
	if len(rest) != 16*8 {
		t.Fatalf("%d channel events, want 128", len(rest))
	}
	for ch := byte(0); ch < 16; ch++ {
		want := [][3]byte{{101, 0}, {100, 4}, {6, 0}, {101, 0}, {100, 3}, {6, 2}, {101, 127}, {100, 127}}
		for i, w := range want {
			e := rest[int(ch)*8+i]
			if e.Tick != 0 || !bytes.Equal(e.Msg, []byte{0xB0 | ch, w[0], w[1]}) {
				t.Errorf("channel %d event %d: tick %d % X, want B%X %02X %02X", ch+1, i, e.Tick, e.Msg, ch, w[0], w[1])
			}
		}
	}
}

// One channel alone: the same eight events on that channel only (MIDI 1.0
// registered parameters 4 and 3, then the null parameter).
func TestSelectChannelTuningTouchesOneChannel(t *testing.T) {
	var tr Track
	tr.SelectChannelTuning(5, 9, 1, 7)
	events, err := ReadFile(tr.File(0))
	if err != nil {
		t.Fatal(err)
	}
	want := [][3]byte{{101, 0}, {100, 4}, {6, 1}, {101, 0}, {100, 3}, {6, 7}, {101, 127}, {100, 127}}
	if len(events) != len(want) {
		t.Fatalf("%d events, want %d", len(events), len(want))
	}
	for i, w := range want {
		if e := events[i]; e.Tick != 5 || !bytes.Equal(e.Msg, []byte{0xB9, w[0], w[1]}) {
			t.Errorf("event %d: tick %d % X, want tick 5 B9 %02X %02X", i, e.Tick, e.Msg, w[0], w[1])
		}
	}
}

// Variable-length quantities (Standard MIDI Files 1.0's own examples).
func TestVariableLengthQuantities(t *testing.T) {
	for _, c := range []struct {
		v    int
		want []byte
	}{
		{0, []byte{0x00}}, {0x40, []byte{0x40}}, {0x7F, []byte{0x7F}}, {0x80, []byte{0x81, 0x00}},
		{0x2000, []byte{0xC0, 0x00}}, {0x3FFF, []byte{0xFF, 0x7F}}, {0x4000, []byte{0x81, 0x80, 0x00}},
		{0x100000, []byte{0xC0, 0x80, 0x00}}, {0x0FFFFFFF, []byte{0xFF, 0xFF, 0xFF, 0x7F}},
	} {
		got := appendVarLen(nil, c.v)
		if !bytes.Equal(got, c.want) {
			t.Errorf("%#x → % X, want % X", c.v, got, c.want)
		}
		if v, n := varLen(got); v != c.v || n != len(got) {
			t.Errorf("% X read back as %#x (%d bytes)", got, v, n)
		}
	}
}

func TestReadFileRefusesBrokenFiles(t *testing.T) {
	good := func() []byte { var tr Track; tr.Channel(0, 0x90, 60, 100); return tr.File(0) }
	for name, f := range map[string][]byte{
		"empty":          nil,
		"not MIDI":       []byte("RIFF....WAVEfmt "),
		"track too long": append(good()[:18], 0x7F, 0, 0, 0),
		"cut event":      append(append(good()[:18], 0, 0, 0, 2), 0x00, 0x90),
		"running status": append(append(good()[:18], 0, 0, 0, 3), 0x00, 0x3C, 0x40),
	} {
		if _, err := ReadFile(f); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
}
