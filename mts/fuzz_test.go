package mts

import (
	"bytes"
	"testing"
)

// The readers must never panic, and what they accept must be well formed.

func FuzzDecode(f *testing.F) {
	keys := equal440()
	f.Add(BulkDump(AllDevices, 0, "seed", keys))
	f.Add(SingleNoteChanges(AllDevices, 0, keys)[0])
	oct, _ := ScaleOctave2(AllDevices, AllChannels, [12]float64{1: 10, 5: -40})
	f.Add(oct)
	f.Add([]byte{0xF0, 0x7F, 0x7F, 0x08, 0x02, 0x00, 0x01, 0x3C, 0x7F, 0x7F, 0x7F, 0xF7})
	f.Fuzz(func(t *testing.T, data []byte) {
		msgs, err := Split(data)
		if err != nil {
			return
		}
		for _, raw := range msgs {
			m, err := Decode(raw)
			if err != nil {
				continue
			}
			switch m.Kind {
			case KindScaleOctave:
				back, err := ScaleOctave2(m.Device, m.Channels, m.Offsets)
				if err != nil || !bytes.Equal(back, raw) {
					t.Fatalf("% X read as %v, written back as % X (%v)", raw, m.Offsets, back, err)
				}
			case KindBulkDump:
				if len(m.Keys) != 128 {
					t.Fatalf("bulk dump with %d keys", len(m.Keys))
				}
			}
		}
	})
}

func FuzzReadFile(f *testing.F) {
	var tr Track
	tr.SysEx(0, BulkDump(AllDevices, 0, "seed", equal440()))
	tr.SelectTuning(0, 0, 0)
	tr.Channel(480, 0x90, 60, 96)
	tr.Channel(480, 0x80, 60, 0)
	f.Add(tr.File(0))
	f.Add([]byte("MThd\x00\x00\x00\x06\x00\x00\x00\x01\x01\xe0MTrk\x00\x00\x00\x04\x00\xff\x2f\x00"))
	f.Fuzz(func(t *testing.T, data []byte) {
		events, err := ReadFile(data)
		if err != nil {
			return
		}
		for _, e := range events {
			if len(e.Msg) == 0 || e.Msg[0] < 0x80 || e.Tick < 0 {
				t.Fatalf("event %+v", e)
			}
		}
	})
}
