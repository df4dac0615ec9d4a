package main

import (
	"slices"
	"time"

	"fifthline/session"
	"fifthline/target"
)

// Live note rows spelled as the file analysis spells them (chordspell.go):
// a note sounding in a heard chord takes the spelling of the chord it
// sounds in longest, from the chord's root (G♯ as the third of E major in
// F major, where the key says A♭). The chords a note sounds in are mostly
// known by the time it ends; where one is still open, the row waits until
// the chord finder has given every chord that may hold it
// (harmony.Stream.Settled), at the latest until listening stops, when
// every row still held is written.

// heldRows holds note rows of type N until their chords are known.
type heldRows[N any] struct {
	rows  []heldRow[N]
	event func(*N) *session.Event // the note's event, spelled in place
	who   func(*N) string         // its player's name or voice's number
	write func(N) error           // writes a row once spelled
	// heard is when the note's end was heard, set as it is added: its
	// row may be written much later (the journal's time must not move).
	heard func(*N) *time.Time
	now   float64 // the stream's time, its latest frame's
	// pieces: a member is the note that begins where the chord finder's
	// note does, not every note of its voice over the chord. The finder
	// joins a voice's note lost for a moment to the same note found again
	// (bridgeLost), and the file analysis spells its first piece.
	pieces bool
	early  []earlyMember
	// told, if set, hears how many notes are not yet written: those held
	// here and those still sounding (the meter says so beside the
	// journal's count, which otherwise reads 0 through a held chord).
	told func(n int)
}

// earlyMember is a membership of a note not yet ended (a pedal under the
// chord: harmony.Stream.Sound), kept until the note comes.
type earlyMember struct {
	who  string
	from float64
	m    membership
}

type heldRow[N any] struct {
	n  N
	ms []membership // the chords given so far that it sounds in
}

// heldMember is a chord's member as the chord finder gives it: whose, the
// start of the note it plays, and its spelling from the chord's root.
type heldMember struct {
	who     string
	from    float64
	spelled target.Note
}

// add holds a note that has ended, with the memberships it had while it
// sounded.
func (h *heldRows[N]) add(n N) {
	r := heldRow[N]{n: n}
	ev := h.event(&r.n)
	start := ev.Start
	if h.heard != nil {
		*h.heard(&r.n) = time.Now().Add(-time.Duration(max(0, h.now-ev.End) * float64(time.Second)))
	}
	h.early = slices.DeleteFunc(h.early, func(e earlyMember) bool {
		if e.who == h.who(&n) && e.from == start {
			r.ms = append(r.ms, e.m)
			return true
		}
		return false
	})
	h.rows = append(h.rows, r)
}

// chord notes the memberships of a chord given from start to end.
func (h *heldRows[N]) chord(start, end float64, members []heldMember) {
	for _, m := range members {
		ms := membership{0, start, end, m.spelled}
		found := false
		for k := range h.rows {
			r := &h.rows[k]
			held := h.event(&r.n).Held
			if h.who(&r.n) == m.who && held.Start < end && held.End > start && (!h.pieces || held.Start == m.from) {
				r.ms, found = append(r.ms, ms), true
			}
		}
		if !found { // still sounding
			h.early = append(h.early, earlyMember{m.who, m.from, ms})
		}
	}
}

// release writes, in the order they ended, the rows of the notes that
// ended by settled, each spelled from the chord it sounds in longest; the
// first error stops it.
func (h *heldRows[N]) release(settled float64) error {
	done := 0
	for done < len(h.rows) && h.event(&h.rows[done].n).End <= settled {
		r := &h.rows[done]
		spellFromChords(func(int) *session.Event { return h.event(&r.n) }, r.ms)
		done++
		if err := h.write(r.n); err != nil {
			h.rows = h.rows[done:]
			return err
		}
	}
	h.rows = h.rows[done:]
	return nil
}

// tell hands told the notes not yet written, sounding of them still
// sounding.
func (h *heldRows[N]) tell(sounding int) {
	if h.told != nil {
		h.told(len(h.rows) + sounding)
	}
}
