package mts

import (
	"bytes"
	"errors"
	"math"
	"testing"
)

// equal440 is every key at its own equal-tempered pitch at A4 = 440 Hz: the
// words kk 00 00 (MTS frequency data format).
func equal440() *Keys {
	var k Keys
	for i := range k {
		k[i] = Word(i) << 14
	}
	return &k
}

func dataBytesOnly(t *testing.T, m []byte) {
	t.Helper()
	for i, b := range m[1 : len(m)-1] {
		if b >= 0x80 {
			t.Fatalf("byte %d is 0x%02X, not a data byte", i+1, b)
		}
	}
}

// Real-time single-note tuning change: F0 7F <device> 08 02 <program>
// <count> [<key> xx yy zz]… F7 (MMA, MIDI Tuning Standard). The count is one
// data byte, so 128 keys take two messages.
func TestSingleNoteChangesFollowTheLayout(t *testing.T) {
	keys := equal440()
	keys[61] = FromHz(275) // a ¼-comma C♯4 at A4 = 440
	msgs := SingleNoteChanges(AllDevices, 5, keys)
	if len(msgs) != 2 {
		t.Fatalf("%d messages, want 2", len(msgs))
	}
	next := 0
	for _, m := range msgs {
		dataBytesOnly(t, m)
		if !bytes.Equal(m[:6], []byte{0xF0, 0x7F, 0x7F, 0x08, 0x02, 5}) || m[len(m)-1] != 0xF7 {
			t.Fatalf("header % X … % X", m[:6], m[len(m)-1])
		}
		count := int(m[6])
		if len(m) != 7+4*count+1 {
			t.Fatalf("count %d, but %d bytes", count, len(m))
		}
		for i := 0; i < count; i++ {
			e := m[7+4*i : 11+4*i]
			if int(e[0]) != next {
				t.Fatalf("key %d where %d comes next", e[0], next)
			}
			if w, _ := wordOf(e[1:]); w != keys[next] {
				t.Errorf("key %d: % X, want % X", next, e[1:], keys[next].Bytes())
			}
			next++
		}
	}
	if next != 128 {
		t.Errorf("%d keys, want 128", next)
	}
}

// Bulk tuning dump: F0 7E <device> 08 01 <program> <name, 16 ASCII>
// [xx yy zz]×128 <checksum> F7; the checksum is the exclusive-or of 7E, the
// device ID, 08, 01, the program, the name and the data, in seven bits (MMA,
// MIDI Tuning Standard).
func TestBulkDumpFollowsTheLayoutAndChecksum(t *testing.T) {
	// Worked by hand from the definition: with every key at kk 00 00 the data
	// XOR to 0 (0 … 127), sixteen spaces XOR to 0, and 7E ^ 7F ^ 08 ^ 01 ^ 00
	// is 08.
	m := BulkDump(AllDevices, 0, "", equal440())
	if len(m) != 408 {
		t.Fatalf("%d bytes, want 408", len(m))
	}
	if got := m[406]; got != 0x08 {
		t.Errorf("checksum 0x%02X, worked by hand 0x08", got)
	}
	keys := equal440()
	keys[66] = FromHz(367.8) // F♯4 a comma-ish lower
	m = BulkDump(0x10, 3, "G min ¼-comma", keys)
	dataBytesOnly(t, m)
	if !bytes.Equal(m[:6], []byte{0xF0, 0x7E, 0x10, 0x08, 0x01, 3}) || m[407] != 0xF7 {
		t.Fatalf("frame % X … % X", m[:6], m[407])
	}
	if name := string(m[6:22]); name != "G min ??-comma  " {
		t.Errorf("name %q: not ASCII becomes '?', padded with spaces to 16", name)
	}
	sum := byte(0x7E) ^ 0x10 ^ 0x08 ^ 0x01 ^ 3
	for _, b := range m[6:406] { // name and data
		sum ^= b
	}
	if m[406] != sum&0x7F {
		t.Errorf("checksum 0x%02X, the standard's definition gives 0x%02X", m[406], sum&0x7F)
	}
	if got := [3]byte(m[22+3*66 : 22+3*67]); got != keys[66].Bytes() {
		t.Errorf("key 66: % X", got)
	}
}

// Scale/octave tuning, 2-byte form: F0 7E <device> 08 09 ff gg hh [ss tt]×12
// F7; ff gg hh are channels 15–16, 8–14 and 1–7; each offset is 14 bits with
// 00 00 = −100 ¢, 40 00 = equal temperament, 7F 7F = +100 ¢ (MMA, MIDI
// Tuning Scale/Octave Extensions, CA-021).
func TestScaleOctaveTwoByteFollowsTheLayout(t *testing.T) {
	off := [12]float64{0, -100, 100, 50, -50, 100.0 / 8192, 10.265, 0, 0, 0, 0, -13.686}
	m, err := ScaleOctave2(AllDevices, AllChannels, off)
	if err != nil {
		t.Fatal(err)
	}
	dataBytesOnly(t, m)
	if !bytes.Equal(m[:8], []byte{0xF0, 0x7E, 0x7F, 0x08, 0x09, 0x03, 0x7F, 0x7F}) || len(m) != 33 || m[32] != 0xF7 {
		t.Fatalf("frame % X (%d bytes)", m[:8], len(m))
	}
	for i, want := range [][2]byte{{0x40, 0x00}, {0x00, 0x00}, {0x7F, 0x7F}, {0x60, 0x00}, {0x20, 0x00}, {0x40, 0x01}} {
		if got := [2]byte{m[8+2*i], m[9+2*i]}; got != want {
			t.Errorf("offset %g ¢ → % X, want % X", off[i], got, want)
		}
	}
	if m, _ := ScaleOctave2(0, 1|1<<7|1<<15, off); !bytes.Equal(m[5:8], []byte{0x02, 0x01, 0x01}) {
		t.Errorf("channels 1, 8, 16 → % X, want 02 01 01", m[5:8])
	}
	// A4 = 415 Hz is 101.3 ¢ below 440: beyond the form.
	off[9] = 1200 * math.Log2(415.0/440)
	off[2] = -100.5
	_, err = ScaleOctave2(AllDevices, AllChannels, off)
	var re *RangeError
	if !errors.As(err, &re) || re.PitchClass != 9 {
		t.Errorf("got %v, want a RangeError naming pitch class 9 (A), the farthest", err)
	}
}

// What the encoders write, Decode reads back.
func TestDecodeReadsWhatIsWritten(t *testing.T) {
	keys := equal440()
	keys[0], keys[127] = 0, MaxWord
	keys[70] = FromHz(470.79)
	var stream []byte
	for _, m := range SingleNoteChanges(AllDevices, 0, keys) {
		stream = append(stream, m...)
	}
	stream = append(stream, BulkDump(AllDevices, 9, "organ", keys)...)
	oct, _ := ScaleOctave2(AllDevices, AllChannels, [12]float64{0: 10.265, 11: -6.843})
	stream = append(stream, oct...)
	msgs, err := Split(stream)
	if err != nil || len(msgs) != 4 {
		t.Fatalf("Split: %d messages, %v", len(msgs), err)
	}
	seen := map[int]Word{}
	for _, raw := range msgs {
		m, err := Decode(raw)
		if err != nil {
			t.Fatal(err)
		}
		switch m.Kind {
		case KindSingleNote:
			for _, k := range m.Keys {
				seen[k.Key] = k.Word
			}
		case KindBulkDump:
			if m.Program != 9 || m.Name != "organ           " || len(m.Keys) != 128 || m.Keys[70].Word != keys[70] {
				t.Errorf("bulk dump read back as program %d, name %q, %d keys", m.Program, m.Name, len(m.Keys))
			}
		case KindScaleOctave:
			if m.Channels != AllChannels || math.Abs(m.Offsets[0]-10.265) > 100.0/8192/2 || math.Abs(m.Offsets[11]+6.843) > 100.0/8192/2 {
				t.Errorf("scale/octave read back as channels %016b, offsets %v", m.Channels, m.Offsets)
			}
		}
	}
	for k, w := range keys {
		if seen[k] != w {
			t.Errorf("key %d: single-note change read back % X, want % X", k, seen[k].Bytes(), w.Bytes())
		}
	}
	bad := BulkDump(AllDevices, 0, "", keys)
	bad[406] ^= 1
	if _, err := Decode(bad); err == nil {
		t.Error("a bulk dump with a wrong checksum was accepted")
	}
}
