package capture

import (
	"bytes"
	"encoding/binary"
	"path/filepath"
	"testing"
	"time"
)

// bextChunk builds a bext chunk byte by byte from EBU Tech 3285 v2's
// layout (§2.3, BROADCAST_EXT): each field at its printed size, in order.
func bextChunk(date, clock string, timeRef uint64, history string) []byte {
	var b bytes.Buffer
	fixed := func(s string, size int) { // NUL-padded ASCII
		f := make([]byte, size)
		copy(f, s)
		b.Write(f)
	}
	fixed("Sarabande, run-through before the break", 256)  // Description
	fixed("viol consort field recorder", 32)               // Originator
	fixed("GM-2026-11-24-03", 32)                          // OriginatorReference
	fixed(date, 10)                                        // OriginationDate
	fixed(clock, 8)                                        // OriginationTime
	binary.Write(&b, binary.LittleEndian, uint32(timeRef)) // TimeReferenceLow
	binary.Write(&b, binary.LittleEndian, uint32(timeRef>>32))
	binary.Write(&b, binary.LittleEndian, uint16(2))                               // Version
	fixed("", 64)                                                                  // UMID
	binary.Write(&b, binary.LittleEndian, []int16{-2300, 850, -100, -1800, -2000}) // loudness ×100
	fixed("", 180)                                                                 // Reserved
	b.WriteString(history)                                                         // CodingHistory
	body := b.Bytes()
	chunk := append([]byte("bext"), binary.LittleEndian.AppendUint32(nil, uint32(len(body)))...)
	chunk = append(chunk, body...)
	if len(body)%2 == 1 {
		chunk = append(chunk, 0)
	}
	return chunk
}

// A Broadcast Wave take built from the specification's layout gives back
// every field, and the origination date in each separator the
// specification allows (it shows '-', recommends '-', '_', ':', ' ', '.';
// recorders write ':').
func TestBextFromEBUTech3285Layout(t *testing.T) {
	// 19:30:05 is 70205 s after midnight; at 48 kHz, 3 369 840 000 samples
	// (more than 32 bits: the high word matters).
	const timeRef = 70205 * 48000
	loc := time.FixedZone("rehearsal room", 3600)
	want := time.Date(2026, 11, 24, 19, 30, 5, 0, loc)
	for _, date := range []string{"2026-11-24", "2026:11:24", "2026_11_24", "2026 11 24", "2026.11.24", "2026/11/24"} {
		b := wavBytes(tagPCM, 1, 48000, 16, 0, bextChunk(date, "19:30:05", timeRef, "A=PCM,F=48000,W=16,M=mono,T=recorder\r\n"), make([]byte, 96))
		r, err := newWAV("take.wav", bytes.NewReader(b), int64(len(b)), 1, loc)
		if err != nil {
			t.Fatal(err)
		}
		bc := r.Broadcast()
		if bc == nil || !bc.Origination.Equal(want) || bc.TimeReference != timeRef || bc.Version != 2 ||
			bc.Description != "Sarabande, run-through before the break" || bc.Originator != "viol consort field recorder" || bc.OriginatorReference != "GM-2026-11-24-03" {
			t.Errorf("date %q: %+v", date, bc)
		}
		if r.Frames() != 48 {
			t.Errorf("the bext chunk disturbs the data: %d frames, want 48", r.Frames())
		}
	}
}

// What is not a date is no origination time (the journal then falls back
// to the file's modification time); a date without a readable time is
// taken at midnight.
func TestBextDatesThatAreNot(t *testing.T) {
	cases := []struct {
		date, clock string
		want        time.Time
	}{
		{"2026-11-24", "", time.Date(2026, 11, 24, 0, 0, 0, 0, time.UTC)},
		{"2026-11-24", "25:00:00", time.Date(2026, 11, 24, 0, 0, 0, 0, time.UTC)},
		{"2026-11-31", "19:30:05", time.Time{}},
		{"2026-13-01", "19:30:05", time.Time{}},
		{"26-11-2024", "19:30:05", time.Time{}},
		{"", "", time.Time{}},
		{"20261124", "193005", time.Time{}},
	}
	for _, c := range cases {
		b := bextChunk(c.date, c.clock, 0, "")
		if got := parseBext(b[8:], time.UTC).Origination; !got.Equal(c.want) {
			t.Errorf("%q %q: %v, want %v", c.date, c.clock, got, c.want)
		}
	}
	// A chunk cut after the dates keeps them.
	b := bextChunk("2026-11-24", "19:30:05", 0, "")[8 : 8+bextTimeReference]
	if got := parseBext(b, time.UTC); got.Origination.Hour() != 19 || got.Version != 0 {
		t.Errorf("cut chunk: %+v", got)
	}
}

// ffmpeg's Broadcast Wave writer (write_bext) is an outside writer of the
// chunk: its origination date and time read back as written.
func TestBextWrittenByFFmpeg(t *testing.T) {
	dir := t.TempDir()
	orig := soxFile(t, dir, "take.wav", []string{"-r", "48000", "-b", "24"}, "0.2", "sine", "440")
	bwf := filepath.Join(dir, "bwf.wav")
	ffmpeg(t, "-i", orig, "-c:a", "pcm_s24le", "-write_bext", "1",
		"-metadata", "origination_date=2026-11-24", "-metadata", "origination_time=19:30:05",
		"-metadata", "originator=viol consort", "-metadata", "time_reference=3369840000", bwf)
	r, err := OpenRecording(bwf, 1)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	bc := r.Broadcast()
	if bc == nil || !bc.Origination.Equal(time.Date(2026, 11, 24, 19, 30, 5, 0, time.Local)) || bc.Originator != "viol consort" || bc.TimeReference != 3369840000 {
		t.Fatalf("bext %+v", bc)
	}
	if got, want := readAll(t, r, 512), soxSamples(t, orig, 1); maxDiff(got, want) > 0 || len(got) != len(want) {
		t.Errorf("samples differ from the original's")
	}
	if plain, _ := OpenRecording(orig, 1); plain == nil || plain.Broadcast() != nil {
		t.Errorf("a plain WAV has no bext")
	} else {
		plain.Close()
	}
}
