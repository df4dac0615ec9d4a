package capture

import (
	"bytes"
	"encoding/binary"
	"strings"
	"time"
)

// Broadcast is what a Broadcast Wave file's bext chunk says about the take
// (EBU Tech 3285, "Specification of the Broadcast Wave Format"). Field
// recorders write it; fifthline uses the origination date and time to place
// an analysed take's notes in the rehearsal journal.
type Broadcast struct {
	Description         string
	Originator          string
	OriginatorReference string
	// Origination is OriginationDate and OriginationTime read in the zone
	// the caller gives (the chunk names none; recorders write local time).
	// Zero when the date is missing or not a date.
	Origination time.Time
	// TimeReference is the first sample's count since midnight.
	TimeReference uint64
	Version       uint16
}

// The bext chunk's fixed part, field by field with its size in bytes (EBU
// Tech 3285 v2, 2011): Description 256, Originator 32, OriginatorReference
// 32, OriginationDate 10, OriginationTime 8, TimeReference 8 (low then high
// 32 bits), Version 2, UMID 64, five loudness values of 2 (version 2),
// Reserved 180; CodingHistory follows. The offsets are the running sums.
const (
	bextOriginator    = 256
	bextOriginatorRef = bextOriginator + 32
	bextDate          = bextOriginatorRef + 32
	bextTime          = bextDate + 10
	bextTimeReference = bextTime + 8
	bextVersion       = bextTimeReference + 8
	bextUMID          = bextVersion + 2
	bextLoudness      = bextUMID + 64
	bextReserved      = bextLoudness + 5*2
	bextFixed         = bextReserved + 180 // 602: where CodingHistory starts
)

// parseBext reads a bext chunk's body. A chunk cut short keeps the fields
// it holds whole; the rest stay empty.
func parseBext(b []byte, loc *time.Location) Broadcast {
	field := func(from, to int) string {
		if len(b) < to {
			return ""
		}
		s, _, _ := bytes.Cut(b[from:to], []byte{0}) // NUL-padded ASCII
		return strings.TrimSpace(string(s))
	}
	var bc Broadcast
	bc.Description = field(0, bextOriginator)
	bc.Originator = field(bextOriginator, bextOriginatorRef)
	bc.OriginatorReference = field(bextOriginatorRef, bextDate)
	bc.Origination = originationTime(field(bextDate, bextTime), field(bextTime, bextTimeReference), loc)
	if len(b) >= bextVersion {
		bc.TimeReference = binary.LittleEndian.Uint64(b[bextTimeReference:bextVersion])
	}
	if len(b) >= bextUMID {
		bc.Version = binary.LittleEndian.Uint16(b[bextVersion:bextUMID])
	}
	return bc
}

// originationTime reads "yyyy-mm-dd" and "hh-mm-ss". The specification
// shows '-' and recommends one of '-', '_', ':', ' ', '.' between the items
// (field recorders write "yyyy:mm:dd" too), so any one non-digit separator
// is accepted. A date without a readable time is taken at midnight.
func originationTime(date, clock string, loc *time.Location) time.Time {
	d, ok := threeNumbers(date, 4)
	if !ok || d[1] < 1 || d[1] > 12 || d[2] < 1 || d[2] > 31 {
		return time.Time{}
	}
	t := time.Date(d[0], time.Month(d[1]), d[2], 0, 0, 0, 0, loc)
	if t.Day() != d[2] { // 31 November and the like
		return time.Time{}
	}
	if c, ok := threeNumbers(clock, 2); ok && c[0] < 24 && c[1] < 60 && c[2] < 60 {
		t = time.Date(d[0], time.Month(d[1]), d[2], c[0], c[1], c[2], 0, loc)
	}
	return t
}

// threeNumbers reads "NNNN?NN?NN" (first wide digits, then two and two)
// with any non-digit separators.
func threeNumbers(s string, first int) ([3]int, bool) {
	var v [3]int
	widths := [3]int{first, 2, 2}
	if len(s) != first+6 {
		return v, false
	}
	at := 0
	for i, w := range widths {
		if i > 0 {
			if isDigit(s[at]) {
				return v, false
			}
			at++
		}
		for _, c := range []byte(s[at : at+w]) {
			if !isDigit(c) {
				return v, false
			}
			v[i] = v[i]*10 + int(c-'0')
		}
		at += w
	}
	return v, true
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }
