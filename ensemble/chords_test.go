package ensemble

import (
	"context"
	"math"
	"testing"

	"fifthline/harmony"
	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// C major, then A minor over the same held C5 and E4: the common tones are
// one note each but a member of two chords, judged in each. The players
// tune just (ratios 3/2, 5/4, 6/5 and octaves above the sounding root:
// common practice) against a bass in equal temperament (ISO 16, A4 =
// 440 Hz): the E4 is a pure third above C3 in the first chord and moves up
// 15.6 ¢ to a pure fifth above A2 in the second; the C5 holds its equal-
// tempered pitch and so sits 15.6 ¢ below a pure minor third above A.
func TestCommonTonesAreJudgedInEachChord(t *testing.T) {
	c3, a2 := 440*math.Exp2(-21.0/12), 110.0
	e4c, e4a := c3*5/2, a2*3 // the E4 as C major's third, then as A minor's fifth
	parts := []part{
		{"vc", testsignal.Saw, []tone{{c3, 0.2, 1.6, 0, 0}, {a2, 1.7, 3.2, 0, 0}}},
		{"vla", testsignal.Saw, []tone{{c3 * 3 / 2, 0.2, 1.6, 0, 0}, {a2 * 2, 1.7, 3.2, 0, 0}}},
		{"vl2", testsignal.Saw, []tone{{e4c, 0.2, 3.2, e4a, 1.7}}},
		{"vl1", testsignal.Saw, []tone{{c3 * 4, 0.2, 3.2, 0, 0}}},
	}
	players := []Player{{"vc", 0}, {"vla", 1}, {"vl2", 2}, {"vl1", 3}}
	tu := target.Default()
	var notes []Note
	tracks := make([]harmony.Track, len(players))
	var learned Bleed
	for range 2 { // learn the bleed, then read with it
		notes, tracks = notes[:0], make([]harmony.Track, len(players))
		err := Run(context.Background(), record(parts, 3.4, -20, 2.5), Options{Players: players, Bleed: &learned,
			Tunings: session.NewTunings(tu),
			OnNote:  func(n Note) error { notes = append(notes, n); return nil },
			OnFrame: func(i int, e pitchdetect.Estimate) { tracks[i].Add(e.Time, e.Hz) }})
		if err != nil {
			t.Fatal(err)
		}
	}
	chords := Chords(notes, tracks, players, tu, target.DefaultSeventh)
	type member struct {
		role, note string
		just       float64
	}
	want := []struct {
		name    string
		members map[string]member
	}{
		{"C major", map[string]member{"vc": {"root", "C3", 0}, "vla": {"fifth", "G3", 0}, "vl2": {"third", "E4", 0}, "vl1": {"root", "C5", 0}}},
		{"A minor", map[string]member{"vc": {"root", "A2", 0}, "vla": {"root", "A3", 0}, "vl2": {"fifth", "E4", 0},
			"vl1": {"third", "C5", 1200 * math.Log2(c3*4/(a2*6/5*4))}}},
	}
	if len(chords) != len(want) {
		t.Fatalf("%d chords, want %d: %+v", len(chords), len(want), chords)
	}
	for i, c := range chords {
		if c.Name() != want[i].name {
			t.Errorf("chord %d: %s, want %s", i+1, c.Name(), want[i].name)
		}
		for j, m := range c.Members {
			w := want[i].members[c.Players[j].Name]
			if m.Role != w.role || m.Note.String() != w.note || math.Abs(m.JustCents-w.just) > 1 {
				t.Errorf("%s: %s is %s %s at %+.2f ¢ from just; want %s %s at %+.2f", c.Name(), c.Players[j].Name,
					m.Role, m.Note, m.JustCents, w.role, w.note, w.just)
			}
		}
	}
	// The E4 is one note, a member of both chords, read at its pitch in each.
	e4 := 0
	for _, n := range notes {
		if n.Player.Name == "vl2" {
			e4++
		}
	}
	if e4 != 1 {
		t.Errorf("the held E4 read as %d notes", e4)
	}
	if len(chords) == 2 {
		got := chords[1].Members[2].Hz / chords[0].Members[2].Hz
		if moved := 1200 * math.Log2(got); math.Abs(moved-1200*math.Log2(e4a/e4c)) > 1 {
			t.Errorf("the common tone moved %+.2f ¢ between the chords; it was played %+.2f ¢", moved, 1200*math.Log2(e4a/e4c))
		}
	}
}

// A player entering on a chord already sounding is read from where the
// note settled (its Held.Settled), not from its attack: with bleed a
// detector may voice a frame or two fewer of a quiet attack, and the chord
// must read the same either way. The soprano's G4 scoops 40 ¢ down for
// 0.12 s over a bass's C3 a just twelfth below (3/1, common practice; C3
// in equal temperament from A4 = 440 Hz, ISO 16).
func TestChordsReadAnEntryFromWhereItSettled(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	g4 := 3 * c3
	players := []Player{{Name: "b", Channel: 0}, {Name: "s", Channel: 1}}
	for _, first := range []float64{0.5, 0.52} { // the attack's first voiced frame
		tracks := make([]harmony.Track, 2)
		for t := 0.0; t <= 1; t += 0.01 {
			tracks[0].Add(t, c3)
			switch {
			case t >= 0.63:
				tracks[1].Add(t, g4)
			case t >= first:
				tracks[1].Add(t, g4*math.Exp2(40.0/1200))
			}
		}
		note := func(p Player, h pitchdetect.Held) Note {
			return Note{Player: p, Event: session.Event{Player: p.Name, Held: h, Reading: tu.Classify(h.Hz)}}
		}
		notes := []Note{
			note(players[0], pitchdetect.Held{Start: 0, End: 1, Hz: c3, Settled: 0.1}),
			note(players[1], pitchdetect.Held{Start: first, End: 1, Hz: g4, Settled: 0.63}),
		}
		chords := Chords(notes, tracks, players, tu, target.DefaultSeventh)
		if len(chords) != 1 || len(chords[0].Members) != 2 || math.Abs(chords[0].Members[1].JustCents) > 0.01 {
			t.Errorf("attack voiced from %.2f s: %+v, want the twelfth read just", first, chords)
		}
	}
}
