package ensemble

import (
	"slices"

	"fifthline/harmony"
	"fifthline/target"
)

// Chord is a stretch in which two or more players held notes together,
// and what those notes made.
type Chord struct {
	Start, End float64
	target.HeardChord
	Players []Player // Players[i] plays Members[i]
}

// Chords finds the chords the players' notes make (harmony.Find: its
// minimum length, joining and edges), each member read from its player's
// frames (tracks, indexed like players) within the chord; seventh is the
// minor seventh's just ratio. Notes of a player not in players are left
// out.
func Chords(notes []Note, tracks []harmony.Track, players []Player, tu target.Tuning, seventh float64) []Chord {
	var hs []harmony.Note
	var who []Player
	for _, n := range notes {
		p := slices.Index(players, n.Player)
		if p < 0 {
			continue
		}
		hs = append(hs, harmony.Note{Start: n.Held.Start, End: n.Held.End, Who: n.Player.Name, Note: n.Reading.Note,
			Frames: &tracks[p], Hz: n.Held.Hz, Settled: n.Held.Settled})
		who = append(who, n.Player)
	}
	var out []Chord
	for _, c := range harmony.Find(hs, tu, seventh) {
		ps := make([]Player, len(c.Notes))
		for i, k := range c.Notes {
			ps[i] = who[k]
		}
		out = append(out, Chord{Start: c.Start, End: c.End, HeardChord: c.HeardChord, Players: ps})
	}
	return out
}
