package harmony

import (
	"fmt"
	"testing"

	"fifthline/target"
)

// Voices on one channel: a piece of a held chord shorter than
// FragmentSeconds, with one voice more (a partial surfacing in an attack)
// or one voice less (a voice released early or lost), is part of that
// chord and no chord of its own; a piece with a note the chord does not
// hold is a chord change, and a piece as long as FragmentSeconds a chord.
// Players each on their own channel keep every piece. Pitches in equal
// temperament at A4 = 440 Hz (ISO 16; tu.Target), chord names common
// practice; the scenes are our own.
func TestAPieceOfAVoicesChordIsNoChordOfItsOwn(t *testing.T) {
	tu := target.Default()
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	note := func(who, name string, from, to float64) Note {
		n := parse(name)
		return Note{Start: from, End: to, Who: who, Note: n, Hz: tu.Target(n)}
	}
	triad := func(end float64) []Note { // C3 E4 G4 from 0 to 3 s, C3 to end
		return []Note{note("1", "C3", 0, end), note("2", "E4", 0, 3), note("3", "G4", 0, 3)}
	}
	rows := func(cs []Chord) string {
		s := ""
		for _, c := range cs {
			s += fmt.Sprintf("%s %.2f–%.2f; ", c.Name(), c.Start, c.End)
		}
		return s
	}
	for _, tc := range []struct {
		name         string
		notes        []Note
		voices, each string // the chords found on one channel, and by players
	}{
		{"a voice more as the chord begins (B4 for 0.4 s)", append(triad(3), note("4", "B4", 0, 0.4)),
			"C major 0.40–3.00; ", "C major seventh 0.00–0.40; C major 0.40–3.00; "},
		{"a voice released 0.4 s early", triad(2.6),
			"C major 0.00–2.60; ", "C major 0.00–2.60; E minor 2.60–3.00; "},
		{"a voice entering 0.4 s late", append(triad(3)[1:], note("1", "C3", 0.4, 3)),
			"C major 0.40–3.00; ", "E minor 0.00–0.40; C major 0.40–3.00; "},
		{"a chord change for 0.4 s (E3 for C3)", append(triad(2.6), note("1", "E3", 2.6, 3)),
			"C major 0.00–2.60; E minor 2.60–3.00; ", "C major 0.00–2.60; E minor 2.60–3.00; "},
		{"a voice released 0.6 s early", triad(2.4),
			"C major 0.00–2.40; E minor 2.40–3.00; ", "C major 0.00–2.40; E minor 2.40–3.00; "},
	} {
		if got := rows(FindOneChannel(tc.notes, tu, target.DefaultSeventh)); got != tc.voices {
			t.Errorf("%s, voices: %s want %s", tc.name, got, tc.voices)
		}
		if got := rows(Find(tc.notes, tu, target.DefaultSeventh)); got != tc.each {
			t.Errorf("%s, players: %s want %s", tc.name, got, tc.each)
		}
	}
}
