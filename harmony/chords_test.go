package harmony

import (
	"math"
	"testing"

	"fifthline/target"
)

// frames is a track holding hz from..to every 10 ms (a detector's hop).
func frames(parts ...[3]float64) *Track {
	tr := &Track{}
	for _, p := range parts {
		for t := p[0]; t <= p[1]; t += 0.01 {
			tr.Add(t, p[2])
		}
	}
	return tr
}

// The rules of a chord, one finder for players and voices alike. Pitches in
// equal temperament at A4 = 440 Hz (ISO 16; 440·2^(n/12)) and just ratios
// 5/4 and 3/2 above the root (common practice).
func TestWhatIsAHeldChord(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	a2 := 110.0
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	// The E4 is held across C major → A open fifth, tuned as C's pure third
	// first, then as A's pure fifth; its whole-note pitch (Hz) is neither.
	e4 := frames([3]float64{0, 2, c3 * 5 / 2}, [3]float64{2, 4, a2 * 3})
	notes := []Note{
		{Start: 0, End: 2, Who: "vc", Note: parse("C3"), Frames: frames([3]float64{0, 2, c3})},
		{Start: 0, End: 4, Who: "vl", Note: parse("E4"), Frames: e4, Hz: 330},
		{Start: 2, End: 4, Who: "vc", Note: parse("A2"), Frames: frames([3]float64{2, 4, a2})},
		// A passing note shorter than MinSeconds makes no chord of its own.
		{Start: 4, End: 4.2, Who: "vc", Note: parse("C3"), Hz: c3},
		{Start: 4, End: 4.2, Who: "vl", Note: parse("G3"), Hz: c3 * 3 / 2},
	}
	got := Find(notes, tu, target.DefaultSeventh)
	if len(got) != 2 || got[0].Name() != "C major" || got[1].Name() != "A open fifth" {
		t.Fatalf("chords %+v, want C major then A open fifth", got)
	}
	for i, c := range got {
		for j, m := range c.Members {
			if math.Abs(m.JustCents) > 0.01 {
				t.Errorf("%s: %s (note %d) %+.3f ¢ from just, played just", c.Name(), m.Role, c.Notes[j], m.JustCents)
			}
		}
		if i == 1 && (c.Notes[1] != 1 || c.Members[1].Role != "fifth") {
			t.Errorf("A open fifth: members %v from notes %v: the held E4 should be its fifth", c.Members, c.Notes)
		}
	}
	// A note re-sounded inside a chord (the same players, the same notes)
	// does not split it.
	again := []Note{
		{Start: 0, End: 1, Who: "vc", Note: parse("C3"), Hz: c3},
		{Start: 1, End: 2, Who: "vc", Note: parse("C3"), Hz: c3},
		{Start: 0, End: 2, Who: "vl", Note: parse("G3"), Hz: c3 * 3 / 2},
	}
	if got := Find(again, tu, target.DefaultSeventh); len(got) != 1 || got[0].Start != 0 || got[0].End != 2 {
		t.Errorf("re-sounded note: %+v, want one chord 0–2 s", got)
	}
}

// A chord's first and last Edge seconds are not read: an attack's pitch is
// not the chord's tuning.
func TestChordEdgesAreLeftOut(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	scoop := frames([3]float64{0, Edge - 0.01, c3 * 1.4}, [3]float64{Edge, 1, c3 * 3 / 2})
	notes := []Note{
		{Start: 0, End: 1, Who: "vc", Note: parse("C3"), Frames: frames([3]float64{0, 1, c3})},
		{Start: 0, End: 1, Who: "vla", Note: parse("G3"), Frames: scoop},
	}
	got := Find(notes, tu, target.DefaultSeventh)
	if len(got) != 1 || math.Abs(got[0].Members[1].JustCents) > 0.01 {
		t.Errorf("%+v: the scooped attack should not count", got)
	}
}

// A member whose attack glides for longer than Edge is read from where its
// note settled (pitchdetect's Held.Settled), as the note alone is read: a
// voice entering on a chord sounding scoops down 40 ¢ over 0.12 s, and the
// chord reads the same however much of the scoop the detector voiced. C3 in
// equal temperament from A4 = 440 Hz (ISO 16); G3 a just fifth above (3/2,
// common practice). So is one entering with the chord but heard a
// little before the others (players entering together are heard up to
// some 0.15 s apart: a recorder's scoop, 42 ¢ sharp, is voiced before a
// bass's attack; FluidR3, measured).
func TestChordReadsAMemberFromWhereItSettled(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	g3 := c3 * 3 / 2
	for _, c := range []struct{ first, bass float64 }{
		{0.5, 0}, {0.52, 0}, // the scoop's first voiced frame, under the bass
		{0.4, 0.5}, {0.3, 0.55}, // heard before the bass
	} {
		scoop := frames([3]float64{c.first, 0.62, g3 * math.Exp2(40.0/1200)}, [3]float64{0.63, 1.5, g3})
		notes := []Note{
			{Start: c.bass, End: 1.5, Who: "b", Note: parse("C3"), Frames: frames([3]float64{c.bass, 1.5, c3})},
			{Start: c.first, End: 1.5, Who: "s", Note: parse("G3"), Frames: scoop, Settled: 0.63},
		}
		got := Find(notes, tu, target.DefaultSeventh)
		if len(got) != 1 || math.Abs(got[0].Members[1].JustCents) > 0.01 {
			t.Errorf("scoop voiced from %.2f s, the bass from %.2f s: %+v, want the fifth read just", c.first, c.bass, got)
		}
	}
}
