package journal

import (
	"fifthline/session"
)

// Leading are the journal's own columns, before the held-note columns of
// session.Columns.
var Leading = []string{"time", "session", "source", "player", "key", "temperament", "a4", "transpose", "chord"}

// Trailing are the columns after the held-note ones: a note's voice (with
// --voices), on a chord membership row the chord heard, the member's role
// in it, its cents from just, a player's channel, and on a membership row
// the just ratio above the root it was judged against (see Extra), and the
// anchor in force ("a4" or "tonic": which note sits where the reference
// puts it, which the a4 column alone does not say in just intonation).
var Trailing = []string{"voice", "heard_chord", "member", "just_cents", "channel", "just_ratio", "anchor"}

// Header is the journal's full header: Leading, session.Columns, Trailing.
func Header() []string {
	return append(append(append([]string(nil), Leading...), session.Header(false)...), Trailing...)
}

// Later are the columns added after the first journals were written: older
// journals lack them, and are still read and appended to (under a fresh
// header line).
var Later = map[string]bool{"on_other_spelling": true, "voice": true, "heard_chord": true, "member": true, "just_cents": true, "channel": true, "just_ratio": true, "anchor": true}

// TimeLayout is how the time column is written: RFC 3339 (ISO 8601) with
// milliseconds and the zone offset, which spreadsheets read as a date-time.
const TimeLayout = "2006-01-02T15:04:05.000Z07:00"
