package harmony

import (
	"testing"

	"fifthline/target"
)

// With Join, a sounding note is joined with the others, and one that may
// be a note heard again holds back the chords it could change. A voice's
// E4 sounds over a held C3 0.2–1.0 s and is heard again from 1.5 s: while
// that note sounds, its name still unknown, its pitch so far within 50 ¢
// of E4's, the chord of the first E4 waits, for the two may be one note
// (the join below: the same voice's same note again within Reach); once it
// ends as E4, the chord is one, 0.2–2.5 s, as Find gives it from the
// joined notes. A semitone higher (F4) it is another note, and the first
// chord is given at once. (The held C3's attack has settled by then, as
// pitchdetect's Settles says of a note 1.5 s long.) Equal temperament at A4 = 440 Hz (ISO 16:
// 440·2^(n/12)); our own scenario.
func TestStreamHoldsTheChordsASoundingNoteMayJoin(t *testing.T) {
	tu := target.Default()
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	const reach = 1.0
	join := func(ns []Note) []Note { // the same voice's same note again within reach
		var out []Note
		for _, n := range ns {
			if k := len(out) - 1; k >= 0 && out[k].Who == n.Who && out[k].Note == n.Note && n.Start > out[k].End && n.Start-out[k].End < reach {
				out[k].End = n.End
				continue
			}
			out = append(out, n)
		}
		return out
	}
	e4, f4 := 329.6276, 349.2282
	for _, again := range []struct {
		name string
		hz   float64
		held bool
	}{{"E4", e4, true}, {"F4", f4, false}} {
		s := Stream{Seventh: target.DefaultSeventh, Join: join, Reach: reach}
		at := func(float64) target.Tuning { return tu }
		s.Add(Note{Start: 0.2, End: 1.0, Who: "2", Note: parse("E4"), Hz: e4})
		s.Sound([]Note{{Start: 0, Who: "1", Hz: 130.8128, Settles: true}, {Start: 1.5, Who: "2", Hz: again.hz}})
		early, _ := s.Ready(3, at)
		if again.held != (len(early) == 0) {
			t.Errorf("%s heard again from 1.5 s: %d chords given at 3 s, want the first held back: %v", again.name, len(early), again.held)
		}
		s.Add(Note{Start: 1.5, End: 2.5, Who: "2", Note: parse(again.name), Hz: again.hz})
		s.Sound([]Note{{Start: 0, Who: "1", Hz: 130.8128, Settles: true}})
		late, _ := s.Ready(4, at)
		got := append(early, late...)
		all := join([]Note{{Start: 0.2, End: 1.0, Who: "2", Note: parse("E4"), Hz: e4}, {Start: 1.5, End: 2.5, Who: "2", Note: parse(again.name), Hz: again.hz}})
		want := Find(append(all, Note{Start: 0, End: 5, Who: "1", Note: parse("C3"), Hz: 130.8128}), tu, target.DefaultSeventh)
		if len(got) != len(want) {
			t.Fatalf("%s: %d chords, want %d", again.name, len(got), len(want))
		}
		for i, w := range want {
			if g := got[i]; g.Start != w.Start || g.End != w.End || g.Name() != w.Name() {
				t.Errorf("%s: chord %d %s %.1f–%.1f s, want %s %.1f–%.1f s", again.name, i, g.Name(), g.Start, g.End, w.Name(), w.Start, w.End)
			}
		}
	}
}
