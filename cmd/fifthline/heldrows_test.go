package main

import (
	"testing"
	"time"

	"fifthline/pitchdetect"
	"fifthline/session"
)

// A note row held back until its chords are known keeps when its note was
// heard ending: the stream's time since its end, taken from the wall clock
// as it is added, not when the row is written (the journal places it by
// that: journal.Writer.WriteHeard). Our own scenario: a note 1–2 s added
// when the stream is at 2.5 s, written when it is at 30 s.
func TestAHeldRowKeepsWhenItsNoteWasHeard(t *testing.T) {
	var written []playerNote
	h := heldRows[playerNote]{event: func(n *playerNote) *session.Event { return &n.Event },
		who:   func(n *playerNote) string { return n.Player.Name },
		write: func(n playerNote) error { written = append(written, n); return nil },
		heard: func(n *playerNote) *time.Time { return &n.heard }}
	var n playerNote
	n.Held = pitchdetect.Held{Start: 1, End: 2, Hz: 220}
	n.Player.Name = "b"
	h.now = 2.5
	before := time.Now()
	h.add(n)
	after := time.Now()
	h.now = 30
	if err := h.release(30); err != nil {
		t.Fatal(err)
	}
	if len(written) != 1 {
		t.Fatalf("%d rows written, want 1", len(written))
	}
	// Heard 0.5 s of the stream before it was added.
	lag := 500 * time.Millisecond
	if got := written[0].heard; got.Before(before.Add(-lag)) || got.After(after.Add(-lag)) {
		t.Errorf("heard at %v, want between %v and %v", got, before.Add(-lag), after.Add(-lag))
	}
}
