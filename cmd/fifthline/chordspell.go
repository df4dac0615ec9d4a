package main

import (
	"fifthline/ensemble"
	"fifthline/harmony"
	"fifthline/session"
	"fifthline/target"
)

// membership is one note sounding as a member of one heard chord.
type membership struct {
	note       int // index of the note
	start, end float64
	spelled    target.Note // the member as the chord spells it, from its root
}

// spellFromChords reads again each note that sounds in a heard chord, spelled
// as the chord spells it (interface contract, "Spelling window": where a
// chord is heard with --players or --voices, its members are spelled from its
// root, G♯ as the third of E major in F major), so a note row, its journal
// row and the chord row agree. A note held across a chord change takes the
// spelling of the chord it sounds in longest; a note in no chord keeps the
// window's.
func spellFromChords(event func(k int) *session.Event, members []membership) {
	longest := map[int]membership{}
	for _, m := range members {
		ev := event(m.note)
		m.start, m.end = max(m.start, ev.Held.Start), min(m.end, ev.Held.End)
		if was, ok := longest[m.note]; m.end > m.start && (!ok || m.end-m.start > was.end-was.start) {
			longest[m.note] = m
		}
	}
	for k, m := range longest {
		ev := event(k)
		ev.Reading = ev.Tuning.ReadAs(m.spelled, ev.Held.Hz)
	}
}

// spellPlayersFromChords is spellFromChords for the players' notes.
func spellPlayersFromChords(notes []ensemble.Note, chords []ensemble.Chord) {
	var ms []membership
	for _, c := range chords {
		for i, p := range c.Players {
			for k, n := range notes {
				if n.Player.Name == p.Name && n.Held.Start < c.End && n.Held.End > c.Start {
					ms = append(ms, membership{k, c.Start, c.End, c.Members[i].Note})
				}
			}
		}
	}
	spellFromChords(func(k int) *session.Event { return &notes[k].Event }, ms)
}

// spellVoicesFromChords is spellFromChords for the voices' notes.
func spellVoicesFromChords(notes []voiceNote, chords []harmony.Chord) {
	var ms []membership
	for _, c := range chords {
		for i, k := range c.Notes {
			ms = append(ms, membership{k, c.Start, c.End, c.Members[i].Note})
		}
	}
	spellFromChords(func(k int) *session.Event { return &notes[k].Event }, ms)
}
